"""Every figure the Figures screen and the monthly summary show, gathered in one pass (no widgets).

The numbers are the store's SQL aggregates over the closed cases of a :class:`CaseFilter` (period,
and optionally one family or one device model), a few counts that several figures share
(:mod:`fixbench.store.chart_counts`), summed into each figure by
:class:`fixbench.workflows.figure_tables.FigureTables`; nothing is counted twice. The backlog is
the jobs still open at the end of the period (today for a period that runs to today).
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from concurrent.futures import ThreadPoolExecutor, as_completed
from dataclasses import dataclass
from datetime import date, datetime, time, timedelta

from fixbench.knowledge import KnowledgeBase
from fixbench.store import turnaround_figures as turnaround
from fixbench.store.case_filters import CaseFilter
from fixbench.store.chart_counts import (MINUTES_BIN, minutes_counts, model_fault_counts,
                                         practice_by_month, rates_by_month, technician_counts,
                                         turnaround_counts)
from fixbench.store.database import Store
from fixbench.store.owner_figures import Figure
from fixbench.store.shop_terms import shop_terms
from fixbench.workflows.figure_tables import FigureTables, minutes_figures, turnaround_figures
from fixbench.workflows.trade_names import TradeNames

TOP_BARS = 12
AGE_BANDS = turnaround.AGE_BANDS  # the backlog's bands: (lowest day, name)
_NONE = Figure("", (), ())


@dataclass(frozen=True)
class FiguresSnapshot:
    scope: CaseFilter
    by_month: Figure
    rates_by_month: Figure
    rates: Figure
    minutes: Figure
    minutes_bands: Figure
    turnaround: Figure
    turnaround_by_month: Figure
    backlog: Figure
    faults: Figure
    parts: Figure
    models: Figure
    model_faults: Figure
    technicians: Figure
    first_suspect: Figure
    practice: Figure
    comebacks_by_technician: Figure
    comebacks_by_model: Figure
    comebacks_by_fault: Figure
    model_comebacks: Figure
    money_by_month: Figure
    money_by_model: Figure
    money_by_fault: Figure
    money_by_technician: Figure
    comeback_cost: Figure

    def headline(self) -> dict[str, float | int | None]:
        """The key numbers: closed, repaired, rates, bench minutes, turnaround, first-suspect
        hits, revenue and margin."""
        def first(figure: Figure) -> dict:
            return dict(zip(figure.columns, figure.rows[0])) if figure.rows else {}

        rates, spread, hits = first(self.rates), first(self.minutes), first(self.first_suspect)
        days = first(self.turnaround)
        money = [row for row in self.money_by_month.rows]
        return {"closed": rates.get("closed", 0), "repaired": rates.get("repaired", 0),
                "first_time_fix_rate": rates.get("first_time_fix_rate"),
                "comeback_rate": rates.get("comeback_rate"),
                "median_minutes": spread.get("median_minutes"),
                "p25_minutes": spread.get("p25_minutes"), "p75_minutes": spread.get("p75_minutes"),
                "median_turnaround_days": _days(days.get("median_hours")),
                "first_suspect_rate": hits.get("hit_rate"),
                "first_suspect_confirmed": hits.get("confirmed", 0),
                "revenue_cents": sum(row[3] for row in money),
                "margin_cents": sum(row[6] for row in money),
                "open_jobs": sum(row[1] for row in self.backlog.rows)}


def _days(hours: float | None) -> float | None:
    return None if hours is None else hours / 24


def _end_of(scope: CaseFilter) -> datetime:
    """The moment the period ends: midnight after its last day, or now for an open-ended one."""
    if scope.until is None:
        return datetime.now()
    return datetime.combine(scope.until + timedelta(days=1), time())


def figure_queries(store: Store, knowledge: KnowledgeBase, scope: CaseFilter
                   ) -> list[Callable[[], dict[str, Figure]]]:
    """The queries for ``scope``, each giving one or more named figures, the screen's first page
    first."""
    period = scope.closed()
    names = TradeNames(knowledge)
    rate = shop_terms(store).labour_rate_cents
    since = None if scope.since is None else datetime.combine(scope.since, time())
    until = None if scope.until is None else _end_of(scope)

    def months() -> dict[str, Figure]:
        monthly = rates_by_month(store, period, rate)
        tables = FigureTables(names, _NONE, _NONE, monthly)
        return {"rates_by_month": monthly, "money_by_month": tables.money_by("month"),
                "comeback_cost": tables.comeback_cost()}

    def model_fault() -> dict[str, Figure]:
        tables = FigureTables(names, model_fault_counts(store, period, rate), _NONE, _NONE)
        return {"faults": _top(tables.by_what("fault")), "parts": _top(tables.by_what("part")),
                "first_suspect": tables.first_suspect(), "models": _top(tables.models()),
                "model_faults": tables.model_faults(),
                "comebacks_by_model": _top(tables.comebacks_by("model")),
                "comebacks_by_fault": _top(tables.comebacks_by("fault")),
                "model_comebacks": tables.model_comebacks(),
                "money_by_model": _top(tables.money_by("model")),
                "money_by_fault": _top(tables.money_by("fault"))}

    def minutes_and_people() -> dict[str, Figure]:
        counted = minutes_figures(minutes_counts(store, period),
                                  technician_counts(store, period, rate), MINUTES_BIN)
        tables = FigureTables(names, _NONE, counted["technicians"], _NONE)
        return {**counted, "comebacks_by_technician": tables.comebacks_by("technician"),
                "money_by_technician": tables.money_by("technician")}

    def backlog() -> dict[str, Figure]:
        open_scope = scope.updated(since=None, until=None).where()
        return {"backlog": turnaround.backlog_by_age(store, _end_of(scope), open_scope)}

    return [
        model_fault,  # the longest first, beside the others on the second thread
        months,
        minutes_and_people,
        lambda: turnaround_figures(turnaround_counts(store, period)),
        backlog,
        lambda: {"practice": practice_by_month(store, since, until)},
    ]


COUNTING_THREADS = 2  # a bench PC has two cores or more; more threads would only queue


def count_figures(store: Store, knowledge: KnowledgeBase,
                  scope: CaseFilter) -> Iterator[tuple[str, Figure]]:
    """Each figure of ``scope`` as soon as it is counted, two queries at a time.

    Started in the screen's order, so the first page fills first, and handed over as each is
    done, so each chart is drawn as soon as its figure is in. The queries are plain reads through
    :meth:`fixbench.store.database.Store.read_connection` on connections of their own: SQLite's
    readers (WAL) and PostgreSQL's run side by side and never wait for a bench's write.
    """
    queries = figure_queries(store, knowledge, scope)
    with ThreadPoolExecutor(COUNTING_THREADS, thread_name_prefix="figures") as pool:
        for done in as_completed([pool.submit(query) for query in queries]):
            yield from done.result().items()


def snapshot_of(scope: CaseFilter, counted: dict[str, Figure]) -> FiguresSnapshot:
    """The snapshot from every figure :func:`count_figures` gave."""
    monthly = counted["rates_by_month"]
    return FiguresSnapshot(scope=scope, by_month=_volume(monthly), rates=_whole_period(monthly),
                           **counted)


def compute_figures(store: Store, knowledge: KnowledgeBase, scope: CaseFilter) -> FiguresSnapshot:
    """Every figure for ``scope`` at once."""
    return snapshot_of(scope, dict(count_figures(store, knowledge, scope)))


def _volume(monthly: Figure) -> Figure:
    """Closed and repaired per month: the first columns of the monthly rates (one query less)."""
    return Figure("Cases by month", ("month", "cases", "repaired"),
                  tuple(row[:3] for row in monthly.rows))


def _whole_period(monthly: Figure) -> Figure:
    """The period's rates from the monthly counts (the same sums as ``repair_rates``)."""
    closed = sum(row[1] for row in monthly.rows)
    repaired = sum(row[2] or 0 for row in monthly.rows)
    fixed = sum(row[5] or 0 for row in monthly.rows)
    back = sum(row[6] or 0 for row in monthly.rows)
    return Figure("First-time fix and comebacks",
                  ("closed", "repaired", "first_time_fix_rate", "comeback_rate"),
                  ((closed, repaired, fixed / repaired if repaired else None,
                    back / repaired if repaired else None),))


def _top(figure: Figure, count: int = TOP_BARS) -> Figure:
    return Figure(figure.title, figure.columns, figure.rows[:count])


def percent(value: float | None) -> str:
    return "-" if value is None else f"{value:.0%}"


def minutes_text(value: float | None) -> str:
    return "-" if value is None else f"{value:g} min"


def days_text(value: float | None) -> str:
    return "-" if value is None else f"{value:.1f} days"


def score_text(value: float | None) -> str:
    """A practice score as practice gives it: out of 100."""
    return "-" if value is None else f"{value:.0f} of 100"


def twelve_months_to(last: date) -> CaseFilter:
    """The twelve calendar months up to ``last``: from the first day of the month eleven months
    before to ``last`` (a year of months, the last one as far as ``last``)."""
    start = date(last.year - 1, last.month + 1, 1) if last.month < 12 else date(last.year, 1, 1)
    return CaseFilter(since=start, until=last)
