"""What the owner's monthly summary says: the month's numbers and money, the twelve months up to
it for the trend, what failed on which models and what came back, the technicians and the
trainees. From :mod:`fixbench.workflows.figures_snapshot`, the figures the Figures screen shows;
plain text and numbers, laid out on the page by :mod:`fixbench.ui.review.reports`.

The caller asks for the owner's passphrase first (:func:`fixbench.workflows.review.require_owner`).
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import date

from fixbench.knowledge import KnowledgeBase
from fixbench.store.chart_counts import rates_by_month
from fixbench.store.database import Store
from fixbench.store.owner_figures import Figure
from fixbench.store.shop_terms import shop_terms
from fixbench.workflows.figures_snapshot import (FiguresSnapshot, compute_figures, days_text,
                                                 minutes_text, percent, score_text,
                                                 twelve_months_to)
from fixbench.workflows.money import money_text
from fixbench.workflows.reports import month_scope

TOP_ROWS = 8
PRINTED_FAULTS = 4  # fault columns of the model x fault table that fit an A4 page


@dataclass(frozen=True)
class TableContent:
    title: str
    headers: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]


@dataclass(frozen=True)
class MonthlySummaryContent:
    month: date  # its first day
    numbers: tuple[tuple[str, str], ...]  # figure, value
    volume_months: tuple[str, ...]  # the twelve months up to it
    closed: tuple[int, ...]
    repaired: tuple[int, ...]
    first_time_fix: tuple[float | None, ...]
    came_back: tuple[float | None, ...]
    faults: tuple[tuple[str, int], ...]  # label, cases: the month's most frequent
    parts: tuple[tuple[str, int], ...]
    technicians: TableContent
    model_faults: TableContent
    model_comebacks: TableContent
    money_by_model: TableContent
    practice: TableContent


def _numbers(snap: FiguresSnapshot, currency: str) -> tuple[tuple[str, str], ...]:
    head = snap.headline()
    money = snap.money_by_month.rows
    parts = sum(row[4] for row in money)
    labour = sum(row[5] for row in money)
    unpriced = sum(row[2] for row in money)
    (returns, minutes, _p, _l, cost, _charged), = snap.comeback_cost.rows
    return (
        ("Closed cases", str(head["closed"])), ("Repaired", str(head["repaired"])),
        ("First-time fix rate", percent(head["first_time_fix_rate"])),
        ("Comeback rate", percent(head["comeback_rate"])),
        ("Median bench time", minutes_text(head["median_minutes"])),
        ("Middle half of bench times", f"{minutes_text(head['p25_minutes'])} to "
                                       f"{minutes_text(head['p75_minutes'])}"),
        ("Median turnaround, intake to handed back", days_text(head["median_turnaround_days"])),
        ("Jobs still open at the month's end", str(head["open_jobs"])),
        ("Charged", money_text(head["revenue_cents"], currency)),
        ("Parts fitted", money_text(parts, currency)),
        ("Labour (bench time at the labour rate)", money_text(labour, currency)),
        ("Margin", money_text(head["margin_cents"], currency)
         + (f" ({unpriced} jobs closed without a price)" if unpriced else "")),
        ("Warranty returns taken in", f"{returns} {'job' if returns == 1 else 'jobs'}: "
                                      f"{minutes} min and {money_text(cost, currency)} spent "
                                      "again"),
        ("Engine's first suspect was right",
         f"{percent(head['first_suspect_rate'])} of {head['first_suspect_confirmed']}"))


def _months(first: date, count: int) -> list[str]:
    return [f"{first.year + (first.month - 1 + k) // 12}-{(first.month - 1 + k) % 12 + 1:02d}"
            for k in range(count)]


def _narrowed(table: Figure, keep: int = PRINTED_FAULTS) -> Figure:
    """The model x fault table with only its first ``keep`` faults in columns of their own, the
    others added to "other faults"."""
    faults = len(table.columns) - 4  # model, the faults, other faults, no fault confirmed, cases
    if faults <= keep:
        return table
    rows = tuple((r[0], *r[1:1 + keep], sum(r[1 + keep:2 + faults]), *r[-2:])
                 for r in table.rows)
    return Figure(table.title, (table.columns[0], *table.columns[1:1 + keep],
                                *table.columns[-3:]), rows)


def _table(figure: Figure, headers: tuple[str, ...], shown, limit: int = TOP_ROWS) -> TableContent:
    return TableContent(figure.title, headers, tuple(tuple(shown(r)) for r in figure.rows[:limit]))


def monthly_summary_content(store: Store, kb: KnowledgeBase, month: date) -> MonthlySummaryContent:
    """The owner's summary of one month, with the twelve months up to it for the trend."""
    currency = shop_terms(store).currency
    scope = month_scope(month)
    snap = compute_figures(store, kb, scope)
    months = twelve_months_to(scope.until)
    counted = {row[0]: row for row in rates_by_month(store, months.closed()).rows}
    # Every month of the twelve, a month without cases too (nothing closed, no rate).
    trend = [counted.get(month, (month, 0, 0, None, None)) for month in _months(months.since, 12)]
    people = {r[0]: r for r in snap.money_by_technician.rows}
    model_faults = _narrowed(snap.model_faults)
    return MonthlySummaryContent(
        month=scope.since, numbers=_numbers(snap, currency),
        volume_months=tuple(r[0] for r in trend), closed=tuple(r[1] for r in trend),
        repaired=tuple(r[2] for r in trend), first_time_fix=tuple(r[3] for r in trend),
        came_back=tuple(r[4] for r in trend),
        faults=tuple((r[0], r[1]) for r in snap.faults.rows[:TOP_ROWS]),
        parts=tuple((r[0], r[1]) for r in snap.parts.rows[:TOP_ROWS]),
        technicians=_table(
            snap.technicians, ("Technician", "Closed", "Repaired", "First-time fix", "Came back",
                               "Median min", "Charged", "Margin"),
            lambda r: (r[0], str(r[1]), str(r[2]), percent(r[3]), percent(r[4]),
                       minutes_text(r[5]), money_text(people[r[0]][3], currency),
                       money_text(people[r[0]][6], currency)), limit=50),
        model_faults=TableContent(
            "Faults by device model", tuple(h.capitalize() if h.islower() else h
                                            for h in model_faults.columns),
            tuple(tuple(str(v) for v in r) for r in model_faults.rows[:TOP_ROWS])),
        model_comebacks=_table(
            snap.model_comebacks, ("Model", "Repaired", "Came back", "Comeback rate",
                                   "Returns taken in", "Minutes on returns"),
            lambda r: (r[0], str(r[1]), str(r[2]), percent(r[3]), str(r[4]), str(r[5]))),
        money_by_model=_table(
            snap.money_by_model, ("Model", "Jobs", "Charged", "Parts", "Labour", "Margin"),
            lambda r: (r[0], str(r[1]), *(money_text(c, currency) for c in r[3:7]))),
        practice=TableContent(
            "Trainees' practice", ("Trainee", "Rounds", "Mean score", "Mean checks",
                                   "Safety slips"),
            tuple((r[0], str(r[2]), score_text(r[3]), f"{r[4]:.1f}", str(r[5]))
                  for r in snap.practice.rows)))
