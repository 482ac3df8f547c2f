"""The shop's customers: a name and a contact, optional on a case, and personal data.

A person's details are kept in ``customers`` only and reach a job by its ``customer_id``; they stay
in the shop's own database (the CSV export leaves them out unless the owner asks for them with the
passphrase, :mod:`fixbench.store.export`). On request the owner removes a person
(:func:`forget_customer`): the row goes, every job keeps its figures and loses the link, and old
amendments that kept the person's reference text are blanked.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime

from sqlalchemy import func, select, update

from fixbench.store.cases import utc_now
from fixbench.store.database import Store
from fixbench.store.errors import StoreInputError, checked_text
from fixbench.store.models import Amendment, Case, Customer, Device
from fixbench.store.owner import require_owner

NAME_MAX = 200
LOOKUP_LIMIT = 20
# The field amendments kept a customer's reference under before revision 0007.
OLD_REFERENCE_FIELD = "customer_ref"


@dataclass(frozen=True)
class CustomerRow:
    id: int
    name: str
    contact: str | None

    @property
    def label(self) -> str:
        return f"{self.name} ({self.contact})" if self.contact else self.name


@dataclass(frozen=True)
class CustomerJob:
    case_id: int
    ticket: str
    opened_at: datetime
    make: str
    model: str
    status: str
    outcome: str | None


def _clean(name: str, contact: str | None) -> tuple[str, str | None]:
    name = checked_text(name, "customer's name").strip()
    if not name or len(name) > NAME_MAX:
        raise StoreInputError(f"a customer's name is 1 to {NAME_MAX} characters")
    contact = None if contact is None else checked_text(contact, "contact").strip() or None
    return name, contact


def find_or_add_customer(store: Store, name: str, contact: str | None = None,
                         at: datetime | None = None) -> int:
    """The customer with this name and contact (letter case aside), added if there is none."""
    name, contact = _clean(name, contact)
    with store.session() as session:
        existing = session.scalar(
            select(Customer.id).where(func.lower(Customer.name) == name.lower(),
                                      func.lower(func.coalesce(Customer.contact, ""))
                                      == (contact or "").lower())
            .order_by(Customer.id).limit(1))
        if existing is not None:
            return existing
        customer = Customer(name=name, contact=contact, added_at=at or utc_now())
        session.add(customer)
        session.flush()
        return customer.id


def customers_like(store: Store, text: str, limit: int = LOOKUP_LIMIT) -> list[CustomerRow]:
    """Customers whose name or contact holds ``text`` (for completing the intake form)."""
    pattern = "%" + text.strip().lower().replace("\\", "\\\\").replace("%", "\\%") \
        .replace("_", "\\_") + "%"
    query = (select(Customer.id, Customer.name, Customer.contact)
             .where(func.lower(Customer.name).like(pattern, escape="\\")
                    | func.lower(func.coalesce(Customer.contact, "")).like(pattern, escape="\\"))
             .order_by(Customer.name, Customer.id).limit(limit))
    with store.read_connection() as connection:
        return [CustomerRow(*row) for row in connection.execute(query)]


def customer(store: Store, customer_id: int) -> CustomerRow | None:
    with store.reading() as session:
        row = session.get(Customer, customer_id)
        return None if row is None else CustomerRow(row.id, row.name, row.contact)


def customer_jobs(store: Store, customer_id: int) -> list[CustomerJob]:
    """Every job of one customer, newest first."""
    query = (select(Case.id, Case.ticket_ref, Case.opened_at, Device.make, Device.model,
                    Case.status, Case.outcome)
             .join(Device, Device.id == Case.device_id)
             .where(Case.customer_id == customer_id)
             .order_by(Case.opened_at.desc(), Case.id.desc()))
    with store.read_connection() as connection:
        return [CustomerJob(*row) for row in connection.execute(query)]


def forget_customer(store: Store, customer_id: int, *, passphrase: str | None) -> int:
    """Remove a person's details on their request (owner only); returns the number of jobs kept
    without them. Prices, parts, times, faults and outcomes stay as they were."""
    require_owner(store, passphrase)
    with store.session() as session:
        person = session.get(Customer, customer_id)
        if person is None:
            raise StoreInputError(f"there is no customer {customer_id}")
        jobs = list(session.scalars(select(Case.id).where(Case.customer_id == customer_id)))
        session.execute(update(Case).where(Case.customer_id == customer_id)
                        .values(customer_id=None))
        if jobs:
            session.execute(update(Amendment)
                            .where(Amendment.case_id.in_(jobs),
                                   Amendment.field == OLD_REFERENCE_FIELD)
                            .values(old_value="null", new_value="null"))
        session.delete(person)
        return len(jobs)
