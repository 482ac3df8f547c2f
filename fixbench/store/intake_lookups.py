"""What intake looks up in the shop's record: the makes and models seen before (to complete the
form from), a unit that has come back (and the job it is a warranty return of), a customer seen
before, and whether a ticket reference is already used.

All are queries through :meth:`Store.reading`, so typing at intake never waits for another
bench's write.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime

from sqlalchemy import func, select

from fixbench.store.case_flags import COMEBACK_DAYS, original_job
from fixbench.store.database import Store
from fixbench.store.models import Case, Customer, Device


@dataclass(frozen=True)
class KnownModel:
    """A make and model the shop has seen, with the family and ratings of its newest case."""

    make: str
    model: str
    kind: str
    family_id: str
    ratings: dict[str, str]

    @property
    def label(self) -> str:
        return f"{self.make} {self.model}"


def known_models(store: Store, newest_cases: int = 2000) -> list[KnownModel]:
    """Makes and models from the newest cases (for completing the intake form), by label."""
    query = (select(Device.make, Device.model, Device.kind, Case.family_id, Case.ratings)
             .join(Case, Case.device_id == Device.id)
             .order_by(Case.opened_at.desc(), Case.id.desc()).limit(newest_cases))
    seen: dict[tuple[str, str], KnownModel] = {}
    with store.read_connection() as connection:
        for make, model, kind, family_id, ratings in connection.execute(query):
            seen.setdefault((make.lower(), model.lower()),
                            KnownModel(make, model, kind, family_id, dict(ratings or {})))
    return sorted(seen.values(), key=lambda m: m.label.lower())


def find_device(store: Store, make: str, model: str, serial: str) -> int | None:
    """The unit with this make, model and serial if it came in before (a comeback), else None."""
    if not serial.strip():
        return None
    query = (select(Device.id).where(func.lower(Device.make) == make.strip().lower(),
                                     func.lower(Device.model) == model.strip().lower(),
                                     Device.serial == serial.strip())
             .order_by(Device.id.desc()).limit(1))
    with store.reading() as session:
        return session.scalar(query)


def ticket_taken(store: Store, ticket: str) -> bool:
    with store.reading() as session:
        return session.scalar(select(func.count()).select_from(Case)
                              .where(Case.ticket_ref == ticket.strip())) > 0


def known_customer(store: Store, name: str, contact: str | None) -> int | None:
    """The customer kept with this name and contact (letter case aside), if any."""
    if not name.strip():
        return None
    query = (select(Customer.id).where(
        func.lower(Customer.name) == name.strip().lower(),
        func.lower(func.coalesce(Customer.contact, "")) == (contact or "").strip().lower())
        .order_by(Customer.id).limit(1))
    with store.reading() as session:
        return session.scalar(query)


@dataclass(frozen=True)
class EarlierJob:
    """The repaired job a unit at intake would be a warranty return of."""

    case_id: int
    ticket: str
    device_id: int
    closed_at: datetime
    days_since: int
    same_unit: bool  # found by the unit itself (else by customer, make and model)


def earlier_job_under_warranty(store: Store, *, make: str, model: str, serial: str,
                               customer_id: int | None, at: datetime,
                               window_days: int = COMEBACK_DAYS) -> EarlierJob | None:
    """What opening this unit now would link it to, by the rule the store links it with."""
    device_id = find_device(store, make, model, serial)
    with store.reading() as session:
        job = original_job(session, device_id=device_id, customer_id=customer_id, opened_at=at,
                           window_days=window_days,
                           unit=(make, model, serial.strip() or None))
        if job is None:
            return None
        return EarlierJob(job.id, job.ticket_ref, job.device_id, job.closed_at,
                          (at - job.closed_at).days, job.device_id == device_id)
