"""The case lists as the ui shows them, one page at a time: every case sorted in the database by
any column, and the cases still open at the bench, newest first."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime

from sqlalchemy import func, select
from sqlalchemy.orm import aliased

from fixbench.store.database import Store
from fixbench.store.errors import StoreInputError
from fixbench.store.models import Case, Customer, Device, ReadingRow, Technician

PAGE_SIZE = 200
OPEN_STATUSES = ("intake", "diagnosing", "repairing", "verifying")

# column name shown -> what it sorts by. Ties break on case id so pages never overlap.
SORTABLE = {
    "ticket": Case.ticket_ref,
    "opened": Case.opened_at,
    "closed": Case.closed_at,
    "status": Case.status,
    "outcome": Case.outcome,
    "family": Case.family_id,
    "technician": Case.technician_id,
    "device": Case.device_id,
    "minutes": Case.bench_minutes,
    "fault": Case.confirmed_fault,
    "came_back": Case.came_back,
}


@dataclass(frozen=True)
class CaseRow:
    id: int
    ticket: str
    opened: datetime
    closed: datetime | None
    status: str
    outcome: str | None
    family: str
    technician: str
    make: str
    model: str
    minutes: int | None
    fault: str | None
    customer: str | None = None  # the customer's name (None when not given, or removed)
    came_back: bool = False  # repaired, and taken in again under warranty
    return_ticket: str | None = None  # the ticket of that warranty return
    return_of: str | None = None  # this job is a warranty return of that ticket


def case_count(store: Store) -> int:
    with store.reading() as session:
        return session.scalar(select(func.count()).select_from(Case))


def case_page(store: Store, sort: str = "opened", descending: bool = True, offset: int = 0,
              limit: int = PAGE_SIZE) -> list[CaseRow]:
    """One page of the case list; the sort and the page are done by an index in the database."""
    if sort not in SORTABLE:
        raise StoreInputError(f"cannot sort by {sort}; choose from {', '.join(SORTABLE)}")
    key = SORTABLE[sort]
    order = [key.desc(), Case.id.desc()] if descending else [key.asc(), Case.id.asc()]
    # Page the ids alone first (an index walk), then join names for those 200 rows only.
    return rows_of_page(store, select(Case.id).order_by(*order).offset(offset).limit(limit), order)


def rows_of_page(store: Store, page_ids, order) -> list[CaseRow]:
    """The rows of one page, given the query that picks the page's case ids: the ids are paged
    alone (an index walk), and names are joined for those rows only."""
    page = page_ids.subquery()
    original, later = aliased(Case), aliased(Case)
    return_ticket = (select(func.min(later.ticket_ref)).where(later.comeback_of_id == Case.id)
                     .scalar_subquery())
    query = (select(Case.id, Case.ticket_ref, Case.opened_at, Case.closed_at, Case.status,
                    Case.outcome, Case.family_id, Technician.name, Device.make, Device.model,
                    Case.bench_minutes, Case.confirmed_fault, Customer.name, Case.came_back,
                    return_ticket, original.ticket_ref)
             .join(page, page.c.id == Case.id)
             .join(Technician, Technician.id == Case.technician_id)
             .join(Device, Device.id == Case.device_id)
             .outerjoin(Customer, Customer.id == Case.customer_id)
             .outerjoin(original, original.id == Case.comeback_of_id)
             .order_by(*order))
    with store.read_connection() as connection:
        return [CaseRow(*row[:13], bool(row[13]), *row[14:])
                for row in connection.execute(query)]


@dataclass(frozen=True)
class OpenCaseRow:
    id: int
    ticket: str
    make: str
    model: str
    family_id: str
    status: str
    technician: str
    opened_at: datetime
    readings: int


def open_case_count(store: Store) -> int:
    with store.reading() as session:
        return session.scalar(select(func.count()).select_from(Case)
                              .where(Case.status.in_(OPEN_STATUSES)))


def open_cases(store: Store, offset: int = 0, limit: int = 200) -> list[OpenCaseRow]:
    """Cases not yet closed, newest first (an index walk on status, then the page's names)."""
    counts = (select(ReadingRow.case_id, func.count().label("n")).group_by(ReadingRow.case_id)
              .subquery())
    query = (select(Case.id, Case.ticket_ref, Device.make, Device.model, Case.family_id,
                    Case.status, Technician.name, Case.opened_at, func.coalesce(counts.c.n, 0))
             .join(Device, Device.id == Case.device_id)
             .join(Technician, Technician.id == Case.technician_id)
             .outerjoin(counts, counts.c.case_id == Case.id)
             .where(Case.status.in_(OPEN_STATUSES))
             .order_by(Case.opened_at.desc(), Case.id.desc()).offset(offset).limit(limit))
    with store.read_connection() as connection:
        return [OpenCaseRow(*row) for row in connection.execute(query)]


def tickets_like(store: Store, ticket: str, limit: int = 2000) -> list[str]:
    """Tickets that share the first half of ``ticket`` (case-blind), for "did you mean" when a
    ticket is not found; the database narrows them by prefix, so a large shop sends few."""
    prefix = ticket[: max(1, len(ticket) // 2)].lower()
    pattern = prefix.replace("\\", "\\\\").replace("%", "\\%").replace("_", "\\_") + "%"
    query = (select(Case.ticket_ref).where(func.lower(Case.ticket_ref).like(pattern, escape="\\"))
             .order_by(Case.ticket_ref).limit(limit))
    with store.read_connection() as connection:
        return list(connection.scalars(query))


def open_case_with_ticket(store: Store, ticket: str) -> int | None:
    """The open case with this ticket reference (as typed or scanned), if there is one."""
    query = select(Case.id).where(Case.ticket_ref == ticket.strip(),
                                  Case.status.in_(OPEN_STATUSES))
    with store.reading() as session:
        return session.scalar(query)
