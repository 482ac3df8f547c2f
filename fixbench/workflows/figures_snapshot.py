"""Every figure the Figures screen and the monthly summary show, gathered in one pass (no widgets).

The numbers are the store's SQL aggregates over the closed cases of a :class:`CaseFilter` (period,
and optionally one family or one device model); nothing is recounted here.
"""

from __future__ import annotations

from collections.abc import Callable, Iterator
from dataclasses import dataclass
from datetime import datetime, time, timedelta

from fixbench.store import owner_figures as store_figures
from fixbench.store.case_filters import CaseFilter
from fixbench.store.database import Store
from fixbench.store.owner_figures import Figure
from fixbench.store.chart_counts import (confirmed_figures, minutes_distribution,
                                           practice_by_month, rates_by_month)

TOP_BARS = 12


@dataclass(frozen=True)
class FiguresSnapshot:
    scope: CaseFilter
    by_month: Figure
    rates_by_month: Figure
    rates: Figure
    minutes: Figure
    minutes_bands: Figure
    faults: Figure
    parts: Figure
    models: Figure
    technicians: Figure
    first_suspect: Figure
    practice: Figure

    def headline(self) -> dict[str, float | int | None]:
        """The key numbers: closed, repaired, rates, median and quartiles, first-suspect hits."""
        rates = dict(zip(self.rates.columns, self.rates.rows[0])) if self.rates.rows else {}
        spread = dict(zip(self.minutes.columns, self.minutes.rows[0])) if self.minutes.rows else {}
        hits = (dict(zip(self.first_suspect.columns, self.first_suspect.rows[0]))
                if self.first_suspect.rows else {})
        return {"closed": rates.get("closed", 0), "repaired": rates.get("repaired", 0),
                "first_time_fix_rate": rates.get("first_time_fix_rate"),
                "comeback_rate": rates.get("comeback_rate"),
                "median_minutes": spread.get("median_minutes"),
                "p25_minutes": spread.get("p25_minutes"), "p75_minutes": spread.get("p75_minutes"),
                "first_suspect_rate": hits.get("hit_rate"),
                "first_suspect_confirmed": hits.get("confirmed", 0)}


def figure_queries(store: Store, scope: CaseFilter) -> list[Callable[[], dict[str, Figure]]]:
    """The queries for ``scope``, each giving one or more named figures, the screen's first page
    first. Faults, parts and first-suspect hits come from one count of the confirmed cases."""
    period = scope.closed()
    since = None if scope.since is None else datetime.combine(scope.since, time())
    until = None if scope.until is None else datetime.combine(scope.until + timedelta(days=1),
                                                              time())

    def confirmed() -> dict[str, Figure]:
        faults, parts, first_suspect = confirmed_figures(store, period)
        return {"faults": _top(faults), "parts": _top(parts), "first_suspect": first_suspect}

    return [
        lambda: {"rates_by_month": rates_by_month(store, period)},
        lambda: {"minutes_bands": minutes_distribution(store, period)},
        lambda: {"minutes": store_figures.bench_minutes(store, period)},
        confirmed,
        lambda: {"models": _top(store_figures.cases_by_model(store, period))},
        lambda: {"technicians": store_figures.per_technician(store, period)},
        lambda: {"practice": practice_by_month(store, since, until)},
    ]


def count_figures(store: Store, scope: CaseFilter) -> Iterator[tuple[str, Figure]]:
    """Each figure of ``scope`` as soon as it is counted, one query after another.

    One after another on purpose, in the screen's order, so each chart is drawn as soon as its
    figure is in and the first page fills first (the queries are plain reads through
    :meth:`fixbench.store.database.Store.read_connection`, which never wait for a bench's write).
    """
    for query in figure_queries(store, scope):
        yield from query().items()


def snapshot_of(scope: CaseFilter, counted: dict[str, Figure]) -> FiguresSnapshot:
    """The snapshot from every figure :func:`count_figures` gave."""
    monthly = counted["rates_by_month"]
    return FiguresSnapshot(scope=scope, by_month=_volume(monthly), rates=_whole_period(monthly),
                           **counted)


def compute_figures(store: Store, scope: CaseFilter) -> FiguresSnapshot:
    """Every figure for ``scope`` at once."""
    return snapshot_of(scope, dict(count_figures(store, scope)))


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
