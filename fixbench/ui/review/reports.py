"""The two printed reports: the customer's one-page job report and the owner's monthly summary.

Each gathers its content from the store, lays it out as a QTextDocument and writes a PDF with
:mod:`report_pdf` (no widgets, so both run off the GUI thread). The footer is the shop's own text
from its settings ("report_footer").
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import date, timedelta
from html import escape
from pathlib import Path

from sqlalchemy import select

from fixbench.knowledge import KnowledgeBase
from fixbench.store.bench_log import get_setting
from fixbench.store.case_filters import CaseFilter
from fixbench.store.database import Store
from fixbench.store.errors import StoreInputError
from fixbench.store.models import Case, RepairAction, Verification
from fixbench.ui.review.figures_snapshot import compute_figures, minutes_text, percent
from fixbench.ui.review.names import TradeNames, family_name, outcome_name
from fixbench.ui.review.report_charts import BarsSpec, LinesSpec
from fixbench.ui.review.report_pdf import ReportDocument
from fixbench.ui.review.timeline import expected_band, fault_model_of

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


def _table(headers: tuple[str, ...], rows: list[tuple[str, ...]]) -> str:
    head = "".join(f"<th>{escape(h)}</th>" for h in headers)
    body = "".join("<tr>" + "".join(f"<td>{escape(str(c))}</td>" for c in row) + "</tr>"
                   for row in rows)
    return (f"<table width='100%' cellspacing='0' cellpadding='12' border='0.5'>"
            f"<tr>{head}</tr>{body}</table>")


@dataclass(frozen=True)
class JobReport:
    pages: int
    path: Path


from fixbench.physics.ratings import describe_label  # noqa: E402  (kept beside its one use)


def write_job_report(store: Store, kb: KnowledgeBase, case_id: int, path: str | Path,
                     footer: str) -> JobReport:
    """One page for the customer: the device, what was found, replaced and measured after."""
    names = TradeNames(kb)
    with store.reading() as session:
        case = session.get(Case, case_id)
        if case is None:
            raise StoreInputError(f"there is no case {case_id}")
        fam = case.family_id
        model = fault_model_of(kb, case)
        repairs = list(session.scalars(select(RepairAction).where(RepairAction.case_id == case_id)
                                       .order_by(RepairAction.id)))
        checks = list(session.scalars(select(Verification).where(Verification.case_id == case_id)
                                      .order_by(Verification.id)))
        report = ReportDocument(f"Job report {case.ticket_ref}")
        device = case.device
        report.html(f"<h1>Repair report</h1><p>Job <b>{escape(case.ticket_ref)}</b>"
                    f"{' for ' + escape(case.customer_ref) if case.customer_ref else ''}"
                    f", taken in on {case.opened_at:%d %B %Y}"
                    + (f", finished {case.closed_at:%d %B %Y}" if case.closed_at else "") + "</p>")
        report.html("<h2>Your device</h2>" + _table(
            ("Make and model", "Kind", "Serial", "Label"),
            [(f"{device.make} {device.model}", device.kind, device.serial or "-",
              describe_label(case.ratings))]))
        found = (f"{names.fault(case.confirmed_fault, fam)} "
                 f"(part {case.confirmed_part}: {names.part(case.confirmed_part, fam)})"
                 if case.confirmed_fault else "No single faulty part was confirmed.")
        report.html(f"<h2>What we found</h2><p>{escape(found)}<br/>Result: "
                    f"<b>{escape(outcome_name(case.outcome, case.status))}</b>. "
                    f"Supply type: {escape(family_name(fam))}.</p>")
        replaced = [(r.part_id, names.part(r.part_id, fam) + (f" ({r.value_fitted})" if r.value_fitted else ""),
                     r.action if r.test_passed is None else f"{r.action}: {'passed' if r.test_passed else 'failed'}",
                     f"{r.parts_cost_cents / 100:.2f}") for r in repairs]
        total = sum(r.parts_cost_cents for r in repairs) / 100
        report.html("<h2>What we replaced</h2>" + (
            _table(("Part", "Description", "Done", "Parts cost"),
                   replaced + [("", "", "Total parts", f"{total:.2f}")])
            if repairs else "<p>No parts were replaced.</p>"))
        measured = []
        for check in checks:
            expected, _ = expected_band(model, check.check_id, check.typed)
            measured.append((names.check(check.check_id, fam), check.typed, expected,
                             "passed" if check.passed else "failed"))
        report.html("<h2>Measured after the repair</h2>" + (
            _table(("Check", "Reading", "Expected", "Result"), measured)
            if measured else "<p>No measurements after repair were recorded.</p>"))
        report.html(f"<h2>Please note</h2><p>{escape(SAFETY_NOTE)}</p>")
        target = Path(path)
        return JobReport(report.write(target, footer), target)


def month_scope(any_day: date) -> CaseFilter:
    first = any_day.replace(day=1)
    last = (first + timedelta(days=32)).replace(day=1) - timedelta(days=1)
    return CaseFilter(since=first, until=last)


def write_monthly_summary(store: Store, kb: KnowledgeBase, month: date, path: str | Path,
                          footer: str) -> int:
    """The owner's summary of one month, with the twelve months up to it for the trend."""
    names = TradeNames(kb)
    scope = month_scope(month)
    snap = compute_figures(store, scope)
    start = date(scope.since.year - 1, scope.since.month, 1)
    trend = compute_figures(store, CaseFilter(since=start, until=scope.until))
    head = snap.headline()
    report = ReportDocument(f"Monthly summary {scope.since:%Y-%m}")
    report.html(f"<h1>Monthly summary: {scope.since:%B %Y}</h1>")
    report.html("<h2>The month in numbers</h2>" + _table(("Figure", "Value"), [
        ("Closed cases", head["closed"]), ("Repaired", head["repaired"]),
        ("First-time fix rate", percent(head["first_time_fix_rate"])),
        ("Comeback rate", percent(head["comeback_rate"])),
        ("Median bench time", minutes_text(head["median_minutes"])),
        ("Middle half of bench times", f"{minutes_text(head['p25_minutes'])} to "
                                       f"{minutes_text(head['p75_minutes'])}"),
        ("Engine's first suspect was right",
         f"{percent(head['first_suspect_rate'])} of {head['first_suspect_confirmed']}")]))
    rows = trend.rates_by_month.rows
    report.chart(LinesSpec("Closed cases per month, last twelve months",
                           tuple(r[0] for r in trend.by_month.rows),
                           (("closed", tuple(r[1] for r in trend.by_month.rows)),
                            ("repaired", tuple(r[2] for r in trend.by_month.rows)))))
    report.chart(LinesSpec("First-time fix and comeback rates", tuple(r[0] for r in rows),
                           (("first-time fix", tuple(r[3] for r in rows)),
                            ("came back", tuple(r[4] for r in rows))), percent=True))
    report.chart(BarsSpec("Most frequent confirmed faults this month",
                          tuple(names.fault_label(r[0]) for r in snap.faults.rows[:8]),
                          tuple(r[1] for r in snap.faults.rows[:8])))
    report.chart(BarsSpec("Parts most often at fault this month",
                          tuple(f"{r[0]}: {names.part(r[0])}" for r in snap.parts.rows[:8]),
                          tuple(r[1] for r in snap.parts.rows[:8])))
    report.html("<h2>Per technician</h2>" + _table(
        ("Technician", "Closed", "Repaired", "First-time fix", "Came back", "Median min"),
        [(r[0], r[1], r[2], percent(r[3]), percent(r[4]), minutes_text(r[5]))
         for r in snap.technicians.rows]))
    practice = [(r[0], r[2], percent(r[3]), f"{r[4]:.1f}", r[5]) for r in snap.practice.rows]
    report.html("<h2>Trainees' practice</h2>" + (
        _table(("Trainee", "Rounds", "Mean score", "Mean checks", "Safety slips"), practice)
        if practice else "<p>No practice rounds this month.</p>"))
    return report.write(path, footer)
