"""The owner's money figures, each one SQL aggregate over closed jobs (amounts in cents).

Definitions (over closed cases opened in the period, like every owner figure):
- revenue: the final prices charged (a job closed without a price counts as nothing charged, and
  is counted in ``unpriced``);
- parts: what the parts fitted cost the shop (``cases.parts_cents``, the sum of the job's repair
  lines);
- labour: bench minutes times the labour rate per hour the job was closed at, or the shop's rate
  now (``labour_rate_cents``, given by the caller) for jobs kept before rates were recorded;
- margin: revenue less parts less labour;
- the cost of comebacks: the jobs taken in as warranty returns, with the time and parts spent on
  them again and what that labour cost.

Labour is summed exactly, as minutes times cents per hour (whole numbers), then divided by 60 and
rounded half up once per row, the same way on SQLite and PostgreSQL.
"""

from __future__ import annotations

from sqlalchemy import BigInteger, case, cast, func, select

from fixbench.store.database import Store
from fixbench.store.models import Case, Device, Technician
from fixbench.store.owner_figures import Figure, Period, _month, _run

MONEY_COLUMNS = ("jobs", "unpriced", "revenue_cents", "parts_cents", "labour_cents",
                 "margin_cents")


def cent_minutes(rate_now_cents: int):
    """One job's labour as bench minutes times cents per hour (a whole number)."""
    return (func.coalesce(Case.bench_minutes, 0)
            * func.coalesce(Case.labour_rate_cents, rate_now_cents))


def summed_labour(rate_now_cents: int):
    """The grouped jobs' labour in cents: their cent-minutes summed, over 60, rounded half up."""
    total = cast(func.coalesce(func.sum(cent_minutes(rate_now_cents)), 0), BigInteger)
    return (total + 30) // 60  # whole cents, rounded half up (amounts are not negative)


def money_sums(rate_now_cents: int) -> list:
    """The money columns of :data:`MONEY_COLUMNS` as aggregates over the grouped jobs."""
    revenue = cast(func.coalesce(func.sum(Case.price_cents), 0), BigInteger)
    parts = cast(func.coalesce(func.sum(Case.parts_cents), 0), BigInteger)
    labour = summed_labour(rate_now_cents)
    return [func.count().label("jobs"),
            func.sum(case((Case.price_cents.is_(None), 1), else_=0)).label("unpriced"),
            revenue.label("revenue_cents"), parts.label("parts_cents"),
            labour.label("labour_cents"), (revenue - parts - labour).label("margin_cents")]


def money_by_month(store: Store, period: Period, rate_now_cents: int) -> Figure:
    month = _month(store.dialect, Case.opened_at).label("month")
    query = (select(month, *money_sums(rate_now_cents)).where(period.where())
             .group_by(month).order_by(month))
    return _run(store, "Money by month taken in", query)


def money_by_model(store: Store, period: Period, rate_now_cents: int) -> Figure:
    query = (select(Device.make, Device.model, *money_sums(rate_now_cents))
             .join(Device, Device.id == Case.device_id).where(period.where())
             .group_by(Device.make, Device.model).order_by(Device.make, Device.model))
    return _run(store, "Money by device model", query)


def money_by_fault(store: Store, period: Period, rate_now_cents: int) -> Figure:
    query = (select(Case.family_id.label("family"), Case.confirmed_fault.label("fault"),
                    *money_sums(rate_now_cents))
             .where(period.where(), Case.confirmed_fault.is_not(None))
             .group_by(Case.family_id, Case.confirmed_fault)
             .order_by(Case.family_id, Case.confirmed_fault))
    return _run(store, "Money by confirmed fault", query)


def money_by_technician(store: Store, period: Period, rate_now_cents: int) -> Figure:
    query = (select(Technician.name, *money_sums(rate_now_cents))
             .join(Technician, Technician.id == Case.technician_id).where(period.where())
             .group_by(Technician.id, Technician.name).order_by(Technician.name))
    return _run(store, "Money by technician", query)


def comeback_cost(store: Store, period: Period, rate_now_cents: int) -> Figure:
    """The warranty returns taken in during the period: how many, the bench minutes and parts
    spent on them again, that labour's cost, the total, and what was charged for them."""
    labour = summed_labour(rate_now_cents)
    parts = cast(func.coalesce(func.sum(Case.parts_cents), 0), BigInteger)
    query = (select(func.count().label("returns"),
                    func.coalesce(func.sum(Case.bench_minutes), 0).label("minutes"),
                    parts.label("parts_cents"), labour.label("labour_cents"),
                    (parts + labour).label("cost_cents"),
                    cast(func.coalesce(func.sum(Case.price_cents), 0), BigInteger)
                    .label("charged_cents"))
             .where(period.where(), Case.comeback_of_id.is_not(None)))
    return _run(store, "The cost of comebacks", query)
