"""How long jobs take from the counter's side: days from intake to handed back, and the jobs still
open at a moment by how long they have waited. Each is one SQL aggregate.

- turnaround: from a job's opening (intake) to its closing (handed back to the customer), counted
  in whole hours and shown in days; median and nearest-rank quartiles as for bench minutes
  (:func:`fixbench.store.owner_figures._quantiles`);
- backlog: the jobs taken in before a moment and not yet closed at it, by age in whole days, in
  bands (:data:`AGE_BANDS`).
"""

from __future__ import annotations

from datetime import datetime

from sqlalchemy import DateTime, Integer, and_, case, cast, func, literal, or_, select
from sqlalchemy.sql.elements import ColumnElement

from fixbench.store.database import Store
from fixbench.store.models import Case
from fixbench.store.owner_figures import Figure, Period, _month, _quantiles, _run

# Lowest age in whole days of each band of open jobs, with its name.
AGE_BANDS = ((0, "0-2 days"), (3, "3-7 days"), (8, "8-14 days"), (15, "15-30 days"),
             (31, "over 30 days"))


def _hours_between(dialect: str, start, end) -> ColumnElement[int]:
    """Whole hours from ``start`` to ``end`` (not negative), counted down from whole minutes:
    rounding to the minute first keeps 4 h from reading as 3.999... h in floating point."""
    # Date arithmetic is where SQLite and PostgreSQL differ.
    if dialect == "sqlite":
        days = func.julianday(end) - func.julianday(start)
        minutes = cast(func.round(days * 1440), Integer)
    else:
        minutes = cast(func.round(func.extract("epoch", end - start) / 60), Integer)
    return minutes // 60


def turnaround_hours(dialect: str) -> ColumnElement[int]:
    return _hours_between(dialect, Case.opened_at, Case.closed_at)


def turnaround(store: Store, period: Period = Period()) -> Figure:
    """Median and quartiles of hours from intake to handed back, over closed jobs."""
    hours = turnaround_hours(store.dialect)
    query = _quantiles([], hours, and_(period.where(), Case.closed_at.is_not(None)), "hours")
    return _run(store, "Turnaround (hours)", query)


def turnaround_by_month(store: Store, period: Period = Period()) -> Figure:
    """Per month taken in: jobs and the median hours to handed back."""
    month = _month(store.dialect, Case.opened_at).label("month")
    query = _quantiles([month], turnaround_hours(store.dialect),
                       and_(period.where(), Case.closed_at.is_not(None)), "hours")
    return _run(store, "Turnaround by month (hours)", query.order_by("month"))


def _age_band(days) -> ColumnElement[int]:
    return case(*((days >= low, low) for low, _name in reversed(AGE_BANDS[1:])), else_=0)


def backlog_by_age(store: Store, as_of: datetime, scope: ColumnElement[bool]) -> Figure:
    """Jobs matching ``scope`` (a WHERE over cases, without dates) taken in before ``as_of`` and
    still open then, by whole days waited: (band's lowest day, jobs), youngest band first."""
    days = _hours_between(store.dialect, Case.opened_at, literal(as_of, DateTime())) // 24
    band = _age_band(days).label("from_days")
    open_then = or_(Case.closed_at.is_(None), Case.closed_at >= as_of)
    query = (select(band, func.count().label("jobs"))
             .where(scope, Case.opened_at < as_of, open_then)
             .group_by(band).order_by(band))
    return _run(store, "Open jobs by age", query)
