"""The owner's case filter, and the case table and figures counted over it, all done in SQL.

A :class:`CaseFilter` narrows the history by opening date, technician, supply family, device make
and model, confirmed fault or part, outcome, customer, comebacks and free text. A fault or part is
given as (family, id) pairs: an engine id names a part of its family ("Q1" is a MOSFET in one
family and a transistor in another), so a fault the owner picks by name may stand for several. The table is paged and sorted by the
database (ORDER BY ... LIMIT/OFFSET, ties broken on case id so pages never overlap) and its count
is the same WHERE clause counted, so the number shown always matches the rows that can be scrolled.

``CaseFilter.closed()`` gives an object with the ``where()`` that :mod:`fixbench.store.owner_figures`
takes as its period, so every owner figure can be drawn for exactly the cases of a filter.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, fields, replace
from datetime import date, datetime, time, timedelta
from typing import TextIO

from sqlalchemy import and_, false, func, or_, select, true
from sqlalchemy.sql.elements import ColumnElement

from fixbench.store.case_list import CaseRow, rows_of_page
from fixbench.store.database import Store
from fixbench.store.errors import StoreInputError
from fixbench.store.export import write_cases_csv
from fixbench.store.models import Case, Customer, Device, Technician
from fixbench.store.owner import require_owner

PAGE_SIZE = 200
# What the "came back" filter may ask for: jobs that came back, and jobs that are the returns.
RETURNS = ("came_back", "is_return")

# column key -> what it sorts by (named columns of the joined page query).
SORT_KEYS = {
    "ticket": (Case.ticket_ref,),
    "opened": (Case.opened_at,),
    "closed": (Case.closed_at,),
    "outcome": (Case.outcome, Case.status),
    "family": (Case.family_id,),
    "technician": (Technician.name,),
    "device": (Device.make, Device.model),
    "minutes": (Case.bench_minutes,),
    "fault": (Case.family_id, Case.confirmed_fault),
    "customer": (Customer.name,),
    "came_back": (Case.came_back, Case.comeback_of_id.is_not(None)),
}

Pairs = tuple[tuple[str, str], ...]


def _pairs(value) -> Pairs | None:
    """(family, id) pairs as a sorted tuple, from any sequence of pairs (None for "any")."""
    if value is None:
        return None
    if isinstance(value, str):
        raise StoreInputError("give a fault or part as (family, id) pairs")
    return tuple(sorted((str(family), str(ident)) for family, ident in value))


@dataclass(frozen=True)
class CaseFilter:
    """Which cases to show. ``None`` (or empty text) means "any"; dates are whole days, inclusive."""

    since: date | None = None
    until: date | None = None
    technician_id: int | None = None
    family: str | None = None
    make: str | None = None
    model: str | None = None
    fault: Pairs | None = None  # (family, fault id) pairs
    part: Pairs | None = None  # (family, part id) pairs
    outcome: str | None = None
    customer_id: int | None = None
    returns: str | None = None  # one of RETURNS
    text: str = ""

    def __post_init__(self) -> None:
        object.__setattr__(self, "fault", _pairs(self.fault))
        object.__setattr__(self, "part", _pairs(self.part))
        if self.returns is not None and self.returns not in RETURNS:
            raise StoreInputError(f"the came-back filter is one of {', '.join(RETURNS)}")

    @classmethod
    def from_dict(cls, values: dict) -> CaseFilter:
        known = {f.name for f in fields(cls)}
        unknown = set(values) - known
        if unknown:
            raise StoreInputError(f"cannot filter by {', '.join(sorted(unknown))}; "
                                  f"choose from {', '.join(sorted(known))}")
        return cls(**values)

    def as_dict(self) -> dict:
        return {k: v for k, v in asdict(self).items() if v not in (None, "")}

    def updated(self, **changes) -> CaseFilter:
        return replace(self, **changes)

    def where(self) -> ColumnElement[bool]:
        """The WHERE clause over ``cases`` alone (device conditions as an id subquery)."""
        conditions: list[ColumnElement[bool]] = []
        if self.since is not None:
            conditions.append(Case.opened_at >= datetime.combine(self.since, time()))
        if self.until is not None:
            conditions.append(Case.opened_at < datetime.combine(self.until + timedelta(days=1),
                                                                time()))
        for column, value in ((Case.technician_id, self.technician_id),
                              (Case.family_id, self.family), (Case.outcome, self.outcome),
                              (Case.customer_id, self.customer_id)):
            if value is not None:
                conditions.append(column == value)
        for column, pairs in ((Case.confirmed_fault, self.fault), (Case.confirmed_part, self.part)):
            if pairs is not None:
                conditions.append(or_(false(), *(and_(Case.family_id == family, column == ident)
                                                 for family, ident in pairs)))
        if self.returns == "came_back":
            conditions.append(Case.came_back)
        elif self.returns == "is_return":
            conditions.append(Case.comeback_of_id.is_not(None))
        device = [c for c, v in ((Device.make, self.make), (Device.model, self.model))
                  if v is not None]
        if device:
            values = [v for v in (self.make, self.model) if v is not None]
            conditions.append(Case.device_id.in_(
                select(Device.id).where(*(c == v for c, v in zip(device, values)))))
        words = self.text.strip()
        if words:
            conditions.append(_text_matches(words))
        return and_(true(), *conditions)

    def closed(self) -> ClosedCases:
        return ClosedCases(self)


@dataclass(frozen=True)
class ClosedCases:
    """The closed cases of a filter, in the shape :mod:`fixbench.store.owner_figures` takes as a period."""

    case_filter: CaseFilter

    def where(self) -> ColumnElement[bool]:
        return and_(Case.status == "closed", self.case_filter.where())


def _text_matches(words: str) -> ColumnElement[bool]:
    # Every word must appear somewhere in the case's text fields or its device's names.
    clauses = []
    for word in words.split():
        if "\x00" in word:
            # No kept text holds U+0000 (checked_text refuses it), so the word matches nothing;
            # PostgreSQL would refuse the pattern itself.
            clauses.append(false())
            continue
        pattern = "%" + _escaped(word.lower()) + "%"

        def like(column, pattern=pattern):
            return func.lower(column).like(pattern, escape="\\")

        clauses.append(or_(like(Case.ticket_ref), like(Case.notes),
                           like(func.coalesce(Case.confirmed_fault, "")),
                           Case.device_id.in_(select(Device.id).where(
                               or_(like(Device.make), like(Device.model)))),
                           Case.customer_id.in_(select(Customer.id).where(
                               or_(like(Customer.name),
                                   like(func.coalesce(Customer.contact, "")))))))
    return and_(*clauses)


def _escaped(word: str) -> str:
    """A word for LIKE with its wildcard characters taken literally."""
    return word.replace("\\", "\\\\").replace("%", "\\%").replace("_", "\\_")


def filtered_count(store: Store, case_filter: CaseFilter) -> int:
    query = select(func.count()).select_from(Case).where(case_filter.where())
    with store.read_connection() as connection:
        return connection.scalar(query)


def filtered_page(store: Store, case_filter: CaseFilter, sort: str = "opened",
                  descending: bool = True, offset: int = 0,
                  limit: int = PAGE_SIZE) -> list[CaseRow]:
    """One page of the filtered cases, sorted and cut by the database."""
    if sort not in SORT_KEYS:
        raise StoreInputError(f"cannot sort by {sort}; choose from {', '.join(SORT_KEYS)}")
    keys = [*SORT_KEYS[sort], Case.id]
    order = [k.desc() for k in keys] if descending else [k.asc() for k in keys]
    ids = select(Case.id).where(case_filter.where())
    if sort == "technician":
        ids = ids.join(Technician, Technician.id == Case.technician_id)
    if sort == "device":
        ids = ids.join(Device, Device.id == Case.device_id)
    if sort == "customer":
        ids = ids.outerjoin(Customer, Customer.id == Case.customer_id)
    # Page the ids alone first, then join the names for that one page of rows.
    return rows_of_page(store, ids.order_by(*order).offset(offset).limit(limit), order)


@dataclass(frozen=True)
class FilterChoices:
    """What the filter lists offer: only values the shop's record actually holds."""

    technicians: tuple[tuple[int, str], ...]
    families: tuple[str, ...]
    devices: tuple[tuple[str, str], ...]  # (make, model)
    faults: tuple[tuple[str, str], ...]  # (family, fault)
    parts: tuple[tuple[str, str], ...]  # (family, part)
    outcomes: tuple[str, ...]
    first_opened: datetime | None
    last_opened: datetime | None


def filter_choices(store: Store) -> FilterChoices:
    with store.read_connection() as connection:
        people = connection.execute(select(Technician.id, Technician.name)
                                    .order_by(Technician.name)).all()
        families = connection.scalars(select(Case.family_id).distinct()
                                      .order_by(Case.family_id)).all()
        devices = connection.execute(select(Device.make, Device.model).distinct()
                                     .order_by(Device.make, Device.model)).all()
        faults = connection.execute(select(Case.family_id, Case.confirmed_fault).distinct()
                                    .where(Case.confirmed_fault.is_not(None))
                                    .order_by(Case.family_id, Case.confirmed_fault)).all()
        parts = connection.execute(select(Case.family_id, Case.confirmed_part).distinct()
                                   .where(Case.confirmed_part.is_not(None))
                                   .order_by(Case.family_id, Case.confirmed_part)).all()
        outcomes = connection.scalars(select(Case.outcome).distinct()
                                      .where(Case.outcome.is_not(None))
                                      .order_by(Case.outcome)).all()
    first, last = opened_span(store)
    return FilterChoices(tuple(map(tuple, people)), tuple(families), tuple(map(tuple, devices)),
                         tuple(map(tuple, faults)), tuple(map(tuple, parts)), tuple(outcomes),
                         first, last)


def export_filtered_csv(store: Store, case_filter: CaseFilter, out: TextIO, *,
                        passphrase: str | None, sort: str = "opened", descending: bool = False,
                        with_customers: bool = False) -> int:
    """The filtered cases as CSV in the columns of :mod:`fixbench.store.export` (owner only);
    customers' names and contacts only when the owner asks for them."""
    require_owner(store, passphrase)
    if sort not in SORT_KEYS:
        raise StoreInputError(f"cannot sort by {sort}; choose from {', '.join(SORT_KEYS)}")
    keys = [*SORT_KEYS[sort], Case.id]
    return write_cases_csv(store, out, where=case_filter.where(),
                           order=[k.desc() if descending else k.asc() for k in keys],
                           with_customers=with_customers)


def opened_span(store: Store) -> tuple[datetime | None, datetime | None]:
    """When the first and the newest case were opened."""
    with store.read_connection() as connection:
        # Alone in its query, min() and max() are one step down the index each.
        return (connection.scalar(select(func.min(Case.opened_at))),
                connection.scalar(select(func.max(Case.opened_at))))
