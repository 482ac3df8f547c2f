"""The two printed reports laid out on the page: the customer's one-page job report and the
owner's monthly summary.

What they say comes from :mod:`fixbench.workflows.reports`; here it becomes a QTextDocument with
charts and is written as a PDF with :mod:`report_pdf` (no widgets, so both run off the GUI thread).
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import date
from html import escape
from pathlib import Path

from fixbench.knowledge import KnowledgeBase
from fixbench.ui.review.report_charts import BarsSpec, LinesSpec
from fixbench.ui.review.report_pdf import ReportDocument
from fixbench.workflows.review import Store
from fixbench.workflows.reports import (FOOTER_KEY, SAFETY_NOTE, job_report_content, month_scope,
                                        monthly_summary_content, shop_footer)

__all__ = ["FOOTER_KEY", "SAFETY_NOTE", "JobReport", "month_scope", "shop_footer",
           "write_job_report", "write_monthly_summary"]


def _table(headers: tuple[str, ...], rows: list[tuple] | tuple[tuple, ...]) -> str:
    head = "".join(f"<th>{escape(h)}</th>" for h in headers)
    body = "".join("<tr>" + "".join(f"<td>{escape(str(c))}</td>" for c in row) + "</tr>"
                   for row in rows)
    return (f"<table width='100%' cellspacing='0' cellpadding='12' border='0.5'>"
            f"<tr>{head}</tr>{body}</table>")


@dataclass(frozen=True)
class JobReport:
    pages: int
    path: Path


def write_job_report(store: Store, kb: KnowledgeBase, case_id: int, path: str | Path,
                     footer: str) -> JobReport:
    """One page for the customer: the device, what was found, replaced and measured after."""
    job = job_report_content(store, kb, case_id)
    report = ReportDocument(f"Job report {job.ticket}")
    report.html(f"<h1>Repair report</h1><p>Job <b>{escape(job.ticket)}</b>"
                f"{' for ' + escape(job.customer_ref) if job.customer_ref else ''}"
                f", taken in on {job.opened_at:%d %B %Y}"
                + (f", finished {job.closed_at:%d %B %Y}" if job.closed_at else "") + "</p>")
    report.html("<h2>Your device</h2>" + _table(("Make and model", "Kind", "Serial", "Label"),
                                                [job.device]))
    report.html(f"<h2>What we found</h2><p>{escape(job.found)}<br/>Result: "
                f"<b>{escape(job.outcome)}</b>. Supply type: {escape(job.family)}.</p>")
    report.html("<h2>What we replaced</h2>" + (
        _table(("Part", "Description", "Done", "Parts cost"),
               list(job.replaced) + [("", "", "Total parts", f"{job.parts_total:.2f}")])
        if job.replaced else "<p>No parts were replaced.</p>"))
    report.html("<h2>Measured after the repair</h2>" + (
        _table(("Check", "Reading", "Expected", "Result"), job.measured)
        if job.measured else "<p>No measurements after repair were recorded.</p>"))
    report.html(f"<h2>Please note</h2><p>{escape(SAFETY_NOTE)}</p>")
    target = Path(path)
    return JobReport(report.write(target, footer), target)


def write_monthly_summary(store: Store, kb: KnowledgeBase, month: date, path: str | Path,
                          footer: str) -> int:
    """The owner's summary of one month, with the twelve months up to it for the trend."""
    summary = monthly_summary_content(store, kb, month)
    report = ReportDocument(f"Monthly summary {summary.month:%Y-%m}")
    report.html(f"<h1>Monthly summary: {summary.month:%B %Y}</h1>")
    report.html("<h2>The month in numbers</h2>" + _table(("Figure", "Value"), summary.numbers))
    report.chart(LinesSpec("Closed cases per month, last twelve months", summary.volume_months,
                           (("closed", summary.closed), ("repaired", summary.repaired))))
    report.chart(LinesSpec("First-time fix and comeback rates", summary.rate_months,
                           (("first-time fix", summary.first_time_fix),
                            ("came back", summary.came_back)), percent=True))
    report.chart(BarsSpec("Most frequent confirmed faults this month",
                          tuple(label for label, _ in summary.faults),
                          tuple(n for _, n in summary.faults)))
    report.chart(BarsSpec("Parts most often at fault this month",
                          tuple(label for label, _ in summary.parts),
                          tuple(n for _, n in summary.parts)))
    report.html("<h2>Per technician</h2>" + _table(
        ("Technician", "Closed", "Repaired", "First-time fix", "Came back", "Median min"),
        summary.technicians))
    report.html("<h2>Trainees' practice</h2>" + (
        _table(("Trainee", "Rounds", "Mean score", "Mean checks", "Safety slips"), summary.practice)
        if summary.practice else "<p>No practice rounds this month.</p>"))
    return report.write(path, footer)
