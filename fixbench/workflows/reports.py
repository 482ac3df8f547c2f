"""What the two printed reports say, gathered from the store: the customer's one-page job report
and the owner's monthly summary. Plain values in the owner's and customer's words; the ui lays
them out on the page (:mod:`fixbench.ui.review.reports`).

The job report is written from :func:`fixbench.store.case_record.load_case_record`, the one case
loader; the monthly summary from :mod:`fixbench.workflows.figures_snapshot`, the figures the
Figures screen shows. The footer is the shop's own text from its settings ("report_footer").
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import date, datetime, timedelta

from fixbench.knowledge import KnowledgeBase
from fixbench.physics.ratings import describe_label
from fixbench.store.case_filters import CaseFilter
from fixbench.store.case_record import load_case_record
from fixbench.store.database import Store
from fixbench.store.shop_settings import get_setting, set_setting
from fixbench.workflows.case_story import expected_band, fault_model_of
from fixbench.workflows.figures_snapshot import compute_figures, minutes_text, percent
from fixbench.workflows.trade_names import TradeNames, family_name, outcome_name

FOOTER_KEY = "report_footer"
SAFETY_NOTE = (
    "Safety: this power supply runs from mains voltage, and its capacitors can keep a dangerous "
    "charge for some time after it is unplugged. Please do not open its case. Any further work on "
    "it, or on the installation it plugs into, belongs with a suitably licensed person working to "
    "the electrical rules that apply where you live; where those rules ask for more than this "
    "report says, follow them.")


def shop_footer(store: Store) -> str:
    """The shop's footer text from its settings (empty if none has been set)."""
    return get_setting(store, FOOTER_KEY, "") or ""


def set_shop_footer(store: Store, text: str) -> None:
    set_setting(store, FOOTER_KEY, text)


@dataclass(frozen=True)
class JobReportContent:
    ticket: str
    customer_ref: str | None
    opened_at: datetime
    closed_at: datetime | None
    device: tuple[str, str, str, str]  # make and model, kind, serial, label
    found: str  # what was found, in words
    outcome: str
    family: str
    replaced: tuple[tuple[str, str, str, str], ...]  # part, description, done, parts cost
    parts_total: float
    measured: tuple[tuple[str, str, str, str], ...]  # check, reading, expected, result


def job_report_content(store: Store, kb: KnowledgeBase, case_id: int) -> JobReportContent:
    """For the customer: the device, what was found, replaced and measured after."""
    names = TradeNames(kb)
    case = load_case_record(store, case_id)
    fam = case.family_id
    model = fault_model_of(kb, case)
    found = (f"{names.fault(case.confirmed_fault, fam)} "
             f"(part {case.confirmed_part}: {names.part(case.confirmed_part, fam)})"
             if case.confirmed_fault else "No single faulty part was confirmed.")
    replaced = tuple(
        (r.part_id, names.part(r.part_id, fam) + (f" ({r.value_fitted})" if r.value_fitted else ""),
         r.action if r.test_passed is None else f"{r.action}: {'passed' if r.test_passed else 'failed'}",
         f"{r.cost_cents / 100:.2f}") for r in case.repairs)
    measured = tuple((names.check(v.check_id, fam), v.typed,
                      expected_band(model, v.check_id, v.typed)[0],
                      "passed" if v.passed else "failed") for v in case.verifications)
    return JobReportContent(
        case.ticket, case.customer_ref, case.opened_at, case.closed_at,
        (f"{case.make} {case.model}", case.kind, case.serial or "-", describe_label(case.ratings)),
        found, outcome_name(case.outcome, case.status), family_name(fam), replaced,
        sum(r.cost_cents for r in case.repairs) / 100, measured)


def month_scope(any_day: date) -> CaseFilter:
    first = any_day.replace(day=1)
    last = (first + timedelta(days=32)).replace(day=1) - timedelta(days=1)
    return CaseFilter(since=first, until=last)


@dataclass(frozen=True)
class MonthlySummaryContent:
    month: date  # its first day
    numbers: tuple[tuple[str, str], ...]  # figure, value
    volume_months: tuple[str, ...]  # the twelve months up to it
    closed: tuple[int, ...]
    repaired: tuple[int, ...]
    rate_months: tuple[str, ...]
    first_time_fix: tuple[float | None, ...]
    came_back: tuple[float | None, ...]
    faults: tuple[tuple[str, int], ...]  # label, cases: the month's most frequent (up to eight)
    parts: tuple[tuple[str, int], ...]
    technicians: tuple[tuple, ...]  # name, closed, repaired, first-time fix, came back, median
    practice: tuple[tuple, ...]  # trainee, rounds, mean score, mean checks, safety slips


def monthly_summary_content(store: Store, kb: KnowledgeBase, month: date) -> MonthlySummaryContent:
    """The owner's summary of one month, with the twelve months up to it for the trend (the caller
    asks for the owner's passphrase first: :func:`fixbench.workflows.review.require_owner`)."""
    names = TradeNames(kb)
    scope = month_scope(month)
    snap = compute_figures(store, scope)
    start = date(scope.since.year - 1, scope.since.month, 1)
    trend = compute_figures(store, CaseFilter(since=start, until=scope.until))
    head = snap.headline()
    numbers = (
        ("Closed cases", str(head["closed"])), ("Repaired", str(head["repaired"])),
        ("First-time fix rate", percent(head["first_time_fix_rate"])),
        ("Comeback rate", percent(head["comeback_rate"])),
        ("Median bench time", minutes_text(head["median_minutes"])),
        ("Middle half of bench times", f"{minutes_text(head['p25_minutes'])} to "
                                       f"{minutes_text(head['p75_minutes'])}"),
        ("Engine's first suspect was right",
         f"{percent(head['first_suspect_rate'])} of {head['first_suspect_confirmed']}"))
    volume, rates = trend.by_month.rows, trend.rates_by_month.rows
    return MonthlySummaryContent(
        month=scope.since, numbers=numbers,
        volume_months=tuple(r[0] for r in volume), closed=tuple(r[1] for r in volume),
        repaired=tuple(r[2] for r in volume), rate_months=tuple(r[0] for r in rates),
        first_time_fix=tuple(r[3] for r in rates), came_back=tuple(r[4] for r in rates),
        faults=tuple((names.fault_label(r[0]), r[1]) for r in snap.faults.rows[:8]),
        parts=tuple((f"{r[0]}: {names.part(r[0])}", r[1]) for r in snap.parts.rows[:8]),
        technicians=tuple((r[0], r[1], r[2], percent(r[3]), percent(r[4]), minutes_text(r[5]))
                          for r in snap.technicians.rows),
        practice=tuple((r[0], r[2], percent(r[3]), f"{r[4]:.1f}", r[5])
                       for r in snap.practice.rows))
