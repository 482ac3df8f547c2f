"""What intake looks up in the shop's record: the makes and models seen before (to complete the
form from), a unit that has come back, and whether a ticket reference is already used.

All are queries through :meth:`Store.reading`, so typing at intake never waits for another
bench's write.
"""

from __future__ import annotations

from dataclasses import dataclass

from sqlalchemy import func, select

from fixbench.store.database import Store
from fixbench.store.models import Case, Device


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
