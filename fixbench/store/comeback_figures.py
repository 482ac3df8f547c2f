"""Comebacks (warranty returns) in the owner's figures, each one SQL aggregate over closed jobs.

A comeback is a job closed as repaired that a later job was taken in as the warranty return of
(``cases.came_back``, kept by :mod:`fixbench.store.case_flags`); its rate is comebacks over
repaired jobs. Counted by the technician who did the repair, by device model and by confirmed
fault (a fault is its family's: "Q1.short" is a MOSFET in one family and a transistor in another).
"""

from __future__ import annotations

from sqlalchemy import and_, case, func, select

from fixbench.store.database import Store
from fixbench.store.models import Case, Device, Technician
from fixbench.store.owner_figures import Figure, Period, _repaired, _run


def comeback_sums() -> list:
    """Repaired, came back and their rate, as aggregates over the grouped jobs."""
    came_back = func.sum(case((and_(Case.outcome == "repaired", Case.came_back), 1), else_=0))
    return [_repaired().label("repaired"), came_back.label("came_back"),
            (came_back * 1.0 / func.nullif(_repaired(), 0)).label("comeback_rate")]


def comebacks_by_technician(store: Store, period: Period = Period()) -> Figure:
    query = (select(Technician.name, *comeback_sums())
             .join(Technician, Technician.id == Case.technician_id).where(period.where())
             .group_by(Technician.id, Technician.name).order_by(Technician.name))
    return _run(store, "Comebacks by technician", query)


def comebacks_by_model(store: Store, period: Period = Period()) -> Figure:
    query = (select(Device.make, Device.model, *comeback_sums())
             .join(Device, Device.id == Case.device_id).where(period.where())
             .group_by(Device.make, Device.model).order_by(Device.make, Device.model))
    return _run(store, "Comebacks by device model", query)


def comebacks_by_fault(store: Store, period: Period = Period()) -> Figure:
    query = (select(Case.family_id.label("family"), Case.confirmed_fault.label("fault"),
                    *comeback_sums())
             .where(period.where(), Case.confirmed_fault.is_not(None))
             .group_by(Case.family_id, Case.confirmed_fault)
             .order_by(Case.family_id, Case.confirmed_fault))
    return _run(store, "Comebacks by confirmed fault", query)
