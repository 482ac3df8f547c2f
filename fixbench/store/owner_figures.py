"""The owner's figures, each one SQL aggregate run in the database (never a Python loop).

Definitions used throughout (counted over closed cases opened in the optional period):
- comeback: a case closed as repaired that a later case was taken in as the warranty return of
  (the same unit, or the same customer's unit of that model, back within the shop's comeback
  window; ``cases.came_back``, kept by :mod:`fixbench.store.case_flags` as cases are written);
- first-time fix: a case closed as repaired with no failed verification
  (``cases.failed_verification``) and no comeback;
- first-suspect hit: the engine's first suspect after the last reading (``top_suspect_fault``)
  equals the confirmed root fault;
- bench minutes: median by the usual midpoint rule, spread as the interquartile range with
  nearest-rank quartiles (rank = ceil(p * n); Hyndman & Fan 1996, definition 2 family).

Month names are the only thing that differs between SQLite and PostgreSQL; that is kept in
:func:`_month`.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from datetime import datetime
from decimal import Decimal

from sqlalchemy import Integer, Select, and_, case, cast, func, select
from sqlalchemy.sql.elements import ColumnElement

from fixbench.store.database import Store
from fixbench.store.models import Case, Device, Technician


@dataclass(frozen=True)
class Figure:
    """A small table: a title, column names, and rows of plain values."""

    title: str
    columns: tuple[str, ...]
    rows: tuple[tuple, ...]


@dataclass(frozen=True)
class Period:
    since: datetime | None = None
    until: datetime | None = None

    def where(self) -> ColumnElement[bool]:
        conditions = [Case.status == "closed"]
        if self.since is not None:
            conditions.append(Case.opened_at >= self.since)
        if self.until is not None:
            conditions.append(Case.opened_at < self.until)
        return and_(*conditions)


def _month(dialect: str, column) -> ColumnElement[str]:
    if dialect == "sqlite":
        return func.strftime("%Y-%m", column)
    return func.to_char(column, "YYYY-MM")


def _run(store: Store, title: str, query: Select) -> Figure:
    with store.read_connection() as connection:
        result = connection.execute(query)
        if store.dialect == "sqlite":  # no Decimal to turn into float: take the rows as they are
            return Figure(title, tuple(result.keys()), tuple(map(tuple, result)))
        return Figure(title, tuple(result.keys()),
                      tuple(tuple(_plain(v) for v in row) for row in result))


def _plain(value):
    # PostgreSQL returns numeric aggregates as Decimal; the figures are plain floats everywhere.
    return float(value) if isinstance(value, Decimal) else value


def _repaired() -> ColumnElement[int]:
    return func.sum(case((Case.outcome == "repaired", 1), else_=0))


def cases_by_month(store: Store, period: Period = Period()) -> Figure:
    month = _month(store.dialect, Case.opened_at).label("month")
    query = (select(month, func.count().label("cases"), _repaired().label("repaired"))
             .where(period.where()).group_by(month).order_by(month))
    return _run(store, "Cases by month", query)


def _count_by(store: Store, title: str, column, period: Period) -> Figure:
    query = (select(column, func.count().label("cases"), _repaired().label("repaired"))
             .where(period.where(), column.is_not(None))
             .group_by(column).order_by(func.count().desc(), column))
    return _run(store, title, query)


def cases_by_family(store: Store, period: Period = Period()) -> Figure:
    return _count_by(store, "Cases by supply family", Case.family_id.label("family"), period)


def _count_by_family(store: Store, title: str, column, period: Period) -> Figure:
    """Cases and repaired per family and value: an engine id names a part of its family ("Q1" is
    a MOSFET in one family and a transistor in another), so it is counted within its family."""
    family = Case.family_id.label("family")
    query = (select(family, column, func.count().label("cases"), _repaired().label("repaired"))
             .where(period.where(), column.is_not(None))
             .group_by(Case.family_id, column).order_by(func.count().desc(), family, column))
    return _run(store, title, query)


def cases_by_fault(store: Store, period: Period = Period()) -> Figure:
    return _count_by_family(store, "Cases by confirmed fault",
                            Case.confirmed_fault.label("fault"), period)


def cases_by_part(store: Store, period: Period = Period()) -> Figure:
    return _count_by_family(store, "Cases by confirmed part", Case.confirmed_part.label("part"),
                            period)


def cases_by_stage(store: Store, period: Period = Period()) -> Figure:
    return _count_by(store, "Cases by confirmed stage", Case.confirmed_stage.label("stage"), period)


def cases_by_model(store: Store, period: Period = Period()) -> Figure:
    per_device = (select(Case.device_id, func.count().label("cases"),
                         _repaired().label("repaired"))
                  .where(period.where()).group_by(Case.device_id).subquery())
    query = (select(Device.make, Device.model, func.sum(per_device.c.cases).label("cases"),
                    func.sum(per_device.c.repaired).label("repaired"))
             .join(per_device, per_device.c.device_id == Device.id)
             .group_by(Device.make, Device.model)
             .order_by(func.sum(per_device.c.cases).desc(), Device.make, Device.model))
    return _run(store, "Cases by device model", query)


def _flow_sums() -> list:
    """Closed, repaired, first-time fixes and comebacks, summed from the flags each case carries."""
    repaired = Case.outcome == "repaired"
    first_time = and_(repaired, ~Case.came_back, ~Case.failed_verification)
    return [func.count().label("closed"), _repaired().label("repaired"),
            func.sum(case((first_time, 1), else_=0)).label("ftf"),
            func.sum(case((and_(repaired, Case.came_back), 1), else_=0)).label("comebacks")]


def repair_rates(store: Store, period: Period = Period()) -> Figure:
    """First-time-fix and comeback rates over all closed cases (rates of repaired cases)."""
    flow = select(*_flow_sums()).where(period.where()).subquery()
    repaired = func.nullif(flow.c.repaired, 0)
    query = select(flow.c.closed, func.coalesce(flow.c.repaired, 0).label("repaired"),
                   (flow.c.ftf * 1.0 / repaired).label("first_time_fix_rate"),
                   (flow.c.comebacks * 1.0 / repaired).label("comeback_rate"))
    return _run(store, "First-time fix and comebacks", query)


def _quantiles(grouping: list, minutes, where, unit: str = "minutes") -> Select:
    """Median and nearest-rank quartiles of ``minutes`` per group, exact, from a count per value
    (columns ``median_<unit>``, ``p25_<unit>``, ``p75_<unit>``; any whole-number measure will do).

    Bench minutes are whole numbers with a few hundred distinct values, so the cases are first
    counted per value (one GROUP BY along an index); the value at rank r is then the smallest
    value whose running count reaches r, found on that small table instead of numbering every case.
    """
    counted = (select(*grouping, minutes.label("minutes"), func.count().label("k"))
               .where(where, minutes.is_not(None)).group_by(*grouping, minutes).subquery())
    keys = [counted.c[col.key] for col in grouping]
    window = {"partition_by": keys} if keys else {}
    running = select(
        *keys, counted.c.minutes,
        cast(func.sum(counted.c.k).over(order_by=counted.c.minutes, rows=(None, 0), **window),
             Integer).label("upto"),
        cast(func.sum(counted.c.k).over(**window), Integer).label("n")).subquery()
    upto, n, m = running.c.upto, running.c.n, running.c.minutes

    def at_rank(rank) -> ColumnElement:
        return func.min(case((upto >= rank, m)))

    keys = [running.c[col.key] for col in grouping]
    return select(
        *keys,
        func.max(n).label("cases"),
        ((at_rank((n + 1) // 2) + at_rank((n + 2) // 2)) / 2.0).label(f"median_{unit}"),
        at_rank((n + 3) // 4).label(f"p25_{unit}"),
        at_rank((3 * n + 3) // 4).label(f"p75_{unit}"),
    ).group_by(*keys)


def bench_minutes(store: Store, period: Period = Period()) -> Figure:
    """Median and interquartile spread of bench minutes over closed cases."""
    return _run(store, "Bench minutes", _quantiles([], Case.bench_minutes, period.where()))


def per_technician(store: Store, period: Period = Period()) -> Figure:
    """Per technician: cases, repaired, first-time-fix and comeback rates, bench minutes."""
    rates = (select(Case.technician_id, *_flow_sums())
             .where(period.where()).group_by(Case.technician_id).subquery())
    spread = _quantiles([Case.technician_id], Case.bench_minutes, period.where()).subquery()
    repaired = func.nullif(rates.c.repaired, 0)
    query = (select(Technician.name, rates.c.closed, rates.c.repaired,
                    (rates.c.ftf * 1.0 / repaired).label("first_time_fix_rate"),
                    (rates.c.comebacks * 1.0 / repaired).label("comeback_rate"),
                    spread.c.median_minutes, spread.c.p25_minutes, spread.c.p75_minutes)
             .join(rates, rates.c.technician_id == Technician.id)
             .outerjoin(spread, spread.c.technician_id == Technician.id)
             .order_by(Technician.name))
    return _run(store, "Per technician", query)


def first_suspect_hits(store: Store, period: Period = Period()) -> Figure:
    """How often the engine's first suspect was the confirmed root fault."""
    hit = case((Case.top_suspect_fault == Case.confirmed_fault, 1), else_=0)
    query = select(func.count().label("confirmed"), func.sum(hit).label("hits"),
                   (func.sum(hit) * 1.0 / func.nullif(func.count(), 0)).label("hit_rate")
                   ).where(period.where(), Case.confirmed_fault.is_not(None))
    return _run(store, "Engine's first suspect was the confirmed fault", query)


OWNER_FIGURES: dict[str, Callable[..., Figure]] = {
    "cases_by_month": cases_by_month,
    "cases_by_family": cases_by_family,
    "cases_by_model": cases_by_model,
    "cases_by_fault": cases_by_fault,
    "cases_by_part": cases_by_part,
    "cases_by_stage": cases_by_stage,
    "repair_rates": repair_rates,
    "bench_minutes": bench_minutes,
    "per_technician": per_technician,
    "first_suspect_hits": first_suspect_hits,
}
