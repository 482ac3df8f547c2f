"""The counts behind the owner's review charts and tables, as few SQL aggregates as will do.

Each takes the same kind of period as the owner figures module (anything with a ``where()`` over
``cases``, such as :class:`fixbench.store.owner_figures.Period` or
:meth:`fixbench.store.case_filters.CaseFilter.closed`), and keeps the definitions of
:mod:`fixbench.store.owner_figures` (first-time fix, comeback), :mod:`fixbench.store.money_figures`
(revenue, parts, labour, margin) and :mod:`fixbench.store.comeback_figures`, so that what the
Figures screen sums from these rows equals, row for row, what those modules' own functions count.

- :func:`rates_by_month`: per month, the flow of jobs, their money and the warranty returns;
- :func:`model_fault_counts`: per device model and confirmed fault and part (within its family),
  the jobs, first-suspect hits, comebacks and money; cases by fault, by part, by model, the
  comeback and money figures by model and fault, and the model x fault tables are sums of it;
- :func:`technician_counts`: per technician, the rates and money;
- :func:`minutes_counts` and :func:`turnaround_counts`: how many jobs took each whole number of
  bench minutes (per technician) and of hours from intake to handed back (per month), from which
  the bands, medians and quartiles are read exactly
  (:func:`fixbench.workflows.figure_tables.quantiles`, the rule of
  :func:`fixbench.store.owner_figures._quantiles`).

Labour is carried as cent-minutes (minutes times cents per hour, whole numbers), so sums over any
rows are exact and round to cents once (:func:`cents_of`).
"""

from __future__ import annotations

from datetime import datetime

from sqlalchemy import BigInteger, and_, case, cast, func, select

from fixbench.store.database import Store
from fixbench.store.models import Case, Device, PracticeAttempt, Technician
from fixbench.store.money_figures import cent_minutes
from fixbench.store.owner_figures import Figure, _month, _repaired, _run
from fixbench.store.turnaround_figures import turnaround_hours

MINUTES_BIN = 10


def _sum(value) -> object:
    return cast(func.coalesce(func.sum(value), 0), BigInteger)


def _money(rate_now_cents: int) -> list:
    """Unpriced jobs, revenue, parts and labour cent-minutes of the grouped jobs."""
    return [func.sum(case((Case.price_cents.is_(None), 1), else_=0)).label("unpriced"),
            _sum(Case.price_cents).label("revenue_cents"),
            _sum(Case.parts_cents).label("parts_cents"),
            _sum(cent_minutes(rate_now_cents)).label("labour_cent_minutes")]


def _returns(rate_now_cents: int) -> list:
    """The grouped jobs that are warranty returns: how many, their minutes, parts and labour."""
    is_return = Case.comeback_of_id.is_not(None)

    def on_returns(value):
        return _sum(case((is_return, value), else_=0))

    return [func.sum(case((is_return, 1), else_=0)).label("returns"),
            on_returns(func.coalesce(Case.bench_minutes, 0)).label("return_minutes"),
            on_returns(Case.parts_cents).label("return_parts_cents"),
            on_returns(cent_minutes(rate_now_cents)).label("return_cent_minutes"),
            on_returns(func.coalesce(Case.price_cents, 0)).label("return_charged_cents")]


def _flow() -> list:
    repaired = Case.outcome == "repaired"
    first_time = and_(repaired, ~Case.came_back, ~Case.failed_verification)
    return [func.count().label("closed"), _repaired().label("repaired"),
            func.sum(case((first_time, 1), else_=0)).label("ftf"),
            func.sum(case((and_(repaired, Case.came_back), 1), else_=0)).label("comebacks")]


def rates_by_month(store: Store, period, rate_now_cents: int = 0) -> Figure:
    """Per month of opening: closed, repaired, both rates, first-time fixes and comebacks; then the
    money (unpriced jobs, revenue, parts, labour cent-minutes) and the warranty returns."""
    month = _month(store.dialect, Case.opened_at).label("month")
    flow = (select(month, *_flow(), *_money(rate_now_cents), *_returns(rate_now_cents))
            .where(period.where()).group_by(month).subquery())
    per_repaired = func.nullif(flow.c.repaired, 0)
    extra = [c for c in flow.c if c.key not in ("month", "closed", "repaired", "ftf",
                                                 "comebacks")]
    query = (select(flow.c.month, flow.c.closed, flow.c.repaired,
                    (flow.c.ftf * 1.0 / per_repaired).label("first_time_fix_rate"),
                    (flow.c.comebacks * 1.0 / per_repaired).label("comeback_rate"),
                    flow.c.ftf.label("first_time_fixes"), flow.c.comebacks, *extra)
             .order_by(flow.c.month))
    return _run(store, "Jobs, money and returns by month", query)


def model_fault_counts(store: Store, period, rate_now_cents: int = 0) -> Figure:
    """Per make, model, family, confirmed fault and part (null where none was confirmed): cases,
    repaired, first-suspect hits, comebacks, the money of those jobs, then how many of them were
    warranty returns and their bench minutes."""
    hit = case((Case.top_suspect_fault == Case.confirmed_fault, 1), else_=0)
    came_back = case((and_(Case.outcome == "repaired", Case.came_back), 1), else_=0)
    keys = [Device.make, Device.model, Case.family_id.label("family"),
            Case.confirmed_fault.label("fault"), Case.confirmed_part.label("part")]
    query = (select(*keys, func.count().label("cases"), _repaired().label("repaired"),
                    func.sum(hit).label("hits"), func.sum(came_back).label("came_back"),
                    *_money(rate_now_cents), *_returns(rate_now_cents)[:2])
             .join(Device, Device.id == Case.device_id)
             .where(period.where())
             .group_by(Device.make, Device.model, Case.family_id, Case.confirmed_fault,
                       Case.confirmed_part))
    return _run(store, "Jobs by model, fault and part", query)


def technician_counts(store: Store, period, rate_now_cents: int = 0) -> Figure:
    """Per technician (by name, with their id): closed, repaired, both rates, comebacks, money."""
    rates = (select(Case.technician_id, *_flow(), *_money(rate_now_cents))
             .where(period.where()).group_by(Case.technician_id).subquery())
    repaired = func.nullif(rates.c.repaired, 0)
    query = (select(Technician.name, rates.c.closed, rates.c.repaired,
                    (rates.c.ftf * 1.0 / repaired).label("first_time_fix_rate"),
                    (rates.c.comebacks * 1.0 / repaired).label("comeback_rate"),
                    rates.c.comebacks, rates.c.unpriced, rates.c.revenue_cents,
                    rates.c.parts_cents, rates.c.labour_cent_minutes,
                    Technician.id.label("technician_id"))
             .join(rates, rates.c.technician_id == Technician.id)
             .order_by(Technician.name, Technician.id))
    return _run(store, "Per technician", query)


def minutes_counts(store: Store, period) -> Figure:
    """Per technician and whole number of bench minutes: how many closed jobs took that long."""
    query = (select(Case.technician_id, Case.bench_minutes.label("minutes"),
                    func.count().label("cases"))
             .where(period.where(), Case.bench_minutes.is_not(None))
             .group_by(Case.technician_id, Case.bench_minutes))
    return _run(store, "Jobs by bench minutes", query)


def turnaround_counts(store: Store, period) -> Figure:
    """Per month taken in and whole hours from intake to handed back: how many closed jobs."""
    month = _month(store.dialect, Case.opened_at).label("month")
    hours = turnaround_hours(store.dialect).label("hours")
    query = (select(month, hours, func.count().label("cases"))
             .where(period.where(), Case.closed_at.is_not(None))
             .group_by(month, hours))
    return _run(store, "Jobs by turnaround hours", query)


def minutes_distribution(store: Store, period, bin_minutes: int = MINUTES_BIN) -> Figure:
    """How many closed cases took each band of bench minutes: [0, 10), [10, 20), ..."""
    band = ((Case.bench_minutes // bin_minutes) * bin_minutes).label("from_minutes")
    query = (select(band, func.count().label("cases"))
             .where(period.where(), Case.bench_minutes.is_not(None))
             .group_by(band).order_by(band))
    return _run(store, "Bench minutes", query)


def practice_by_month(store: Store, since: datetime | None = None,
                      until: datetime | None = None) -> Figure:
    """Trainees' practice rounds per month: rounds, mean score (out of 100, as practice scores),
    mean checks, safety slips."""
    month = _month(store.dialect, PracticeAttempt.attempted_at).label("month")
    conditions = [PracticeAttempt.attempted_at >= since] if since is not None else []
    if until is not None:
        conditions.append(PracticeAttempt.attempted_at < until)
    query = (select(Technician.name.label("trainee"), month, func.count().label("rounds"),
                    func.avg(PracticeAttempt.score).label("mean_score"),
                    func.avg(PracticeAttempt.checks_used).label("mean_checks"),
                    func.sum(PracticeAttempt.safety_slips).label("safety_slips"))
             .join(Technician, Technician.id == PracticeAttempt.trainee_id)
             .where(*conditions)
             .group_by(Technician.name, month).order_by(Technician.name, month))
    return _run(store, "Practice by month", query)
