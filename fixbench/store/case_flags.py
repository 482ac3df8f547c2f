"""The comeback and failed-verification flags each case carries, and the warranty-return link they
rest on, kept as the record is written.

- ``comeback_of_id``: set when a case is opened, on the newest earlier job closed as repaired
  within the shop's comeback window (90 days unless the owner sets another) on the same unit, or,
  where a serial cannot tell the units apart, for the same customer and the same make and model
  (:func:`original_job`). The link is decided once, at intake, as the counter would: changing the
  window later does not rewrite the past.
- ``came_back``: the case was closed as repaired and a later case is linked to it as its return;
- ``failed_verification``: at least one verification of the case failed.

Whenever a case is opened, closed, amended in its outcome or deleted, the flags of the jobs it is
linked to are recomputed (:func:`refresh_came_back`; a handful of rows). :func:`recompute_all_flags`
sets both flags on the whole table from the record in two statements, for bulk loads, and
:func:`link_unit_returns` makes the links of a bulk load by the same unit rule. The owner's figures
read the flags; the rules live here only (migrations carry frozen copies for their backfills).
"""

from __future__ import annotations

from collections.abc import Iterable
from datetime import datetime, timedelta

from sqlalchemy import Connection, and_, bindparam, func, or_, select, update
from sqlalchemy.orm import Session

from fixbench.store.models import Case, Device, Verification

COMEBACK_DAYS = 90  # the comeback window when the shop has not set one


def original_job(session: Session, *, device_id: int | None, customer_id: int | None,
                 opened_at: datetime, window_days: int = COMEBACK_DAYS,
                 unit: tuple[str, str, str | None] | None = None) -> Case | None:
    """The job a unit coming in at ``opened_at`` is a warranty return of, if any: the newest job
    closed as repaired within ``window_days`` before, on the same unit (``device_id``), or for the
    same customer on the same make and model when either unit has no serial to tell them apart.
    ``unit`` (make, model, serial) describes a unit not kept yet; else the device's own are read."""
    if unit is None and device_id is not None:
        device = session.get(Device, device_id)
        unit = None if device is None else (device.make, device.model, device.serial)
    conditions = [] if device_id is None else [Case.device_id == device_id]
    if customer_id is not None and unit is not None:
        make, model, serial = unit
        same_model = [func.lower(Device.make) == make.strip().lower(),
                      func.lower(Device.model) == model.strip().lower()]
        if serial:  # a unit with a serial matches by customer only an unnumbered one
            same_model.append(Device.serial.is_(None))
        earlier_device = select(Device.id).where(*same_model)
        conditions.append(and_(Case.customer_id == customer_id,
                               Case.device_id.in_(earlier_device)))
    if not conditions:
        return None
    query = (select(Case).where(or_(*conditions), Case.outcome == "repaired",
                                Case.closed_at.is_not(None), Case.closed_at <= opened_at,
                                Case.closed_at >= opened_at - timedelta(days=window_days))
             .order_by(Case.closed_at.desc(), Case.id.desc()).limit(1))
    return session.scalar(query)


def refresh_came_back(session: Session, case_ids: Iterable[int | None]) -> None:
    """Recompute ``came_back`` for these jobs (call inside the writing session, after a flush)."""
    wanted = sorted({case_id for case_id in case_ids if case_id is not None})
    if not wanted:
        return
    returned = set(session.scalars(select(Case.comeback_of_id)
                                   .where(Case.comeback_of_id.in_(wanted))))
    for case in session.scalars(select(Case).where(Case.id.in_(wanted))):
        flag = case.outcome == "repaired" and case.id in returned
        if case.came_back != flag:
            case.came_back = flag


def _days(dialect: str, column):
    # Date arithmetic is where SQLite and PostgreSQL differ: fractional days since an epoch.
    if dialect == "sqlite":
        return func.julianday(column)
    return func.extract("epoch", column) / 86400.0


def link_unit_returns(connection: Connection, window_days: int = COMEBACK_DAYS) -> None:
    """Link every case opened within the window after its unit's previous job closed as repaired
    (cases written in bulk skip intake, where the link is otherwise made)."""
    dialect = connection.dialect.name
    window = {"partition_by": Case.device_id, "order_by": (Case.opened_at, Case.id)}
    flow = select(Case.id, Case.opened_at, func.lag(Case.id).over(**window).label("before_id"),
                  func.lag(Case.outcome).over(**window).label("before_outcome"),
                  func.lag(Case.closed_at).over(**window).label("before_closed")).subquery()
    gap = _days(dialect, flow.c.opened_at) - _days(dialect, flow.c.before_closed)
    links = connection.execute(select(flow.c.id, flow.c.before_id).where(
        flow.c.before_outcome == "repaired", flow.c.before_closed.is_not(None),
        gap >= 0, gap <= window_days)).all()
    if links:
        connection.execute(update(Case).where(Case.id == bindparam("case"))
                           .values(comeback_of_id=bindparam("original")),
                           [{"case": case, "original": original} for case, original in links])


def recompute_all_flags(connection: Connection) -> None:
    """Set both flags on every case from the record (a bulk load writes cases without them)."""
    returned = select(Case.comeback_of_id).where(Case.comeback_of_id.is_not(None))
    failed = select(Verification.case_id).where(Verification.passed.is_(False))
    connection.execute(update(Case).values(
        came_back=and_(Case.outcome == "repaired", Case.id.in_(returned)),
        failed_verification=Case.id.in_(failed)))
