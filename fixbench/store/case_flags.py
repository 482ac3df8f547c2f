"""The comeback and failed-verification flags each case carries, kept as the record is written.

- ``came_back``: the case was closed as repaired and the device's next case (the same physical
  unit, next by opening time) was opened within 90 days of that closing;
- ``failed_verification``: at least one verification of the case failed.

A comeback depends on a later case, so the device's flags are recomputed whenever one of its cases
is opened, closed, amended in its outcome or deleted (:func:`refresh_comebacks`; a device has a
handful of cases, so this is a few rows). :func:`recompute_all_flags` does the same for the whole
table in two statements, for bulk loads. The owner's figures read the flags; the rule lives here
only (migration 0003 carries a frozen copy of it for its backfill).
"""

from __future__ import annotations

from datetime import timedelta

from sqlalchemy import Connection, func, select, update
from sqlalchemy.orm import Session

from fixbench.store.models import Case, Verification

COMEBACK_DAYS = 90


def refresh_comebacks(session: Session, device_id: int) -> None:
    """Recompute ``came_back`` for every case of one device (call inside the writing session)."""
    cases = list(session.scalars(select(Case).where(Case.device_id == device_id)
                                 .order_by(Case.opened_at, Case.id)))
    for this, after in zip(cases, cases[1:] + [None]):
        flag = (this.outcome == "repaired" and this.closed_at is not None and after is not None
                and after.opened_at - this.closed_at <= timedelta(days=COMEBACK_DAYS))
        if this.came_back != flag:
            this.came_back = flag


def _days(dialect: str, column):
    # Date arithmetic is where SQLite and PostgreSQL differ: fractional days since an epoch.
    if dialect == "sqlite":
        return func.julianday(column)
    return func.extract("epoch", column) / 86400.0


def recompute_all_flags(connection: Connection) -> None:
    """Set both flags on every case from the record (a bulk load writes cases without them)."""
    dialect = connection.dialect.name
    next_opened = func.lead(Case.opened_at).over(partition_by=Case.device_id,
                                                 order_by=(Case.opened_at, Case.id))
    flow = select(Case.id, Case.outcome, Case.closed_at,
                  next_opened.label("next_opened")).subquery()
    gap = _days(dialect, flow.c.next_opened) - _days(dialect, flow.c.closed_at)
    came_back = select(flow.c.id).where(flow.c.outcome == "repaired",
                                        flow.c.next_opened.is_not(None),
                                        flow.c.closed_at.is_not(None), gap <= COMEBACK_DAYS)
    failed = select(Verification.case_id).where(Verification.passed.is_(False))
    connection.execute(update(Case).values(came_back=Case.id.in_(came_back),
                                           failed_verification=Case.id.in_(failed)))
