"""The counts behind the owner's review charts, beyond :mod:`fixbench.store.owner_figures`, as SQL.

Each takes the same kind of period as the owner figures module (anything with a ``where()`` over
``cases``, such as :class:`fixbench.store.owner_figures.Period` or
:meth:`fixbench.store.case_filters.CaseFilter.closed`), and keeps that module's definitions of
first-time fix and comeback, so a rate per month adds up to the rate of the whole period.

:func:`confirmed_figures` gives three of that module's figures (cases by confirmed fault, by
confirmed part, and the engine's first-suspect hits) from one count, since all three read the same
confirmed cases; each is row for row what its function in the owner figures module returns.
"""

from __future__ import annotations

from datetime import datetime

from sqlalchemy import and_, case, func, select

from fixbench.store.database import Store
from fixbench.store.owner_figures import Figure, _month, _repaired, _run
from fixbench.store.models import Case, PracticeAttempt, Technician

MINUTES_BIN = 10


def rates_by_month(store: Store, period) -> Figure:
    """Per month of opening: closed, repaired, both rates, then first-time fixes and comebacks."""
    month = _month(store.dialect, Case.opened_at).label("month")
    repaired = Case.outcome == "repaired"
    first_time = and_(repaired, ~Case.came_back, ~Case.failed_verification)
    flow = (select(month, func.count().label("closed"),
                   func.sum(case((repaired, 1), else_=0)).label("repaired"),
                   func.sum(case((first_time, 1), else_=0)).label("ftf"),
                   func.sum(case((and_(repaired, Case.came_back), 1), else_=0)).label("comebacks"))
            .where(period.where()).group_by(month).subquery())
    per_repaired = func.nullif(flow.c.repaired, 0)
    query = (select(flow.c.month, flow.c.closed, flow.c.repaired,
                    (flow.c.ftf * 1.0 / per_repaired).label("first_time_fix_rate"),
                    (flow.c.comebacks * 1.0 / per_repaired).label("comeback_rate"),
                    flow.c.ftf.label("first_time_fixes"), flow.c.comebacks)
             .order_by(flow.c.month))
    return _run(store, "First-time fix and comebacks by month", query)


def confirmed_counts(store: Store, period) -> Figure:
    """Per confirmed fault and part: cases, repaired, and how often the engine's first suspect
    was that fault; cases with neither confirmed are left out."""
    hit = case((Case.top_suspect_fault == Case.confirmed_fault, 1), else_=0)
    query = (select(Case.confirmed_fault.label("fault"), Case.confirmed_part.label("part"),
                    func.count().label("cases"), _repaired().label("repaired"),
                    func.sum(hit).label("hits"))
             .where(period.where(),
                    Case.confirmed_fault.is_not(None) | Case.confirmed_part.is_not(None))
             .group_by(Case.confirmed_fault, Case.confirmed_part))
    return _run(store, "Confirmed faults and parts", query)


def confirmed_figures(store: Store, period) -> tuple[Figure, Figure, Figure]:
    """``cases_by_fault``, ``cases_by_part`` and ``first_suspect_hits`` of the owner figures module, from
    :func:`confirmed_counts` (summed over its few rows, not recounted)."""
    counts = confirmed_counts(store, period).rows
    faults = _totals("Cases by confirmed fault", "fault", counts, key=0)
    parts = _totals("Cases by confirmed part", "part", counts, key=1)
    confirmed = [row for row in counts if row[0] is not None]
    cases = sum(row[2] for row in confirmed)
    hits = sum(row[4] for row in confirmed) if confirmed else None
    first_suspect = Figure("Engine's first suspect was the confirmed fault",
                           ("confirmed", "hits", "hit_rate"),
                           ((cases, hits, hits / cases if cases else None),))
    return faults, parts, first_suspect


def _totals(title: str, name: str, counts, key: int) -> Figure:
    """Cases and repaired per value of column ``key``, most cases first, ties by value."""
    totals: dict[str, list[int]] = {}
    for row in counts:
        if row[key] is not None:
            total = totals.setdefault(row[key], [0, 0])
            total[0] += row[2]
            total[1] += row[3]
    rows = sorted(((value, n, repaired) for value, (n, repaired) in totals.items()),
                  key=lambda row: (-row[1], row[0]))
    return Figure(title, (name, "cases", "repaired"), tuple(rows))


def minutes_distribution(store: Store, period, bin_minutes: int = MINUTES_BIN) -> Figure:
    """How many closed cases took each band of bench minutes: [0, 10), [10, 20), ..."""
    band = ((Case.bench_minutes // bin_minutes) * bin_minutes).label("from_minutes")
    query = (select(band, func.count().label("cases"))
             .where(period.where(), Case.bench_minutes.is_not(None))
             .group_by(band).order_by(band))
    return _run(store, "Bench minutes", query)


def practice_by_month(store: Store, since: datetime | None = None,
                      until: datetime | None = None) -> Figure:
    """Trainees' practice rounds per month: rounds, mean score, mean checks, safety slips."""
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
