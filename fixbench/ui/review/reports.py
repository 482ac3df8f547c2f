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
from fixbench.workflows.job_report import job_report_content
from fixbench.workflows.monthly_summary import TableContent, monthly_summary_content
from fixbench.workflows.reports import FOOTER_KEY, SAFETY_NOTE, month_scope, shop_footer
from fixbench.workflows.review import Store

TITLE_PX = round(12 * 300 / 72)  # a table's title as large as a heading (12 pt at the PDF's 300 dpi)

__all__ = ["FOOTER_KEY", "SAFETY_NOTE", "JobReport", "month_scope", "shop_footer",
           "write_job_report", "write_monthly_summary"]


def _table(headers: tuple[str, ...], rows: list[tuple] | tuple[tuple, ...],
           bold_last: bool = False, title: str = "") -> str:
    """A table; its title, if given, is its first row, so a page break never parts the two
    (a heading left alone at the foot of a page is lost by Qt's page layout)."""
    head = "".join(f"<th>{escape(h)}</th>" for h in headers)
    if title:
        head = (f"<td colspan='{len(headers)}' style='font-size: {TITLE_PX}px; font-weight: 600;"
                f" color: #1d3a52;'>{escape(title)}</td></tr><tr>{head}")
    body = []
    for number, row in enumerate(rows):
        strong = bold_last and number == len(rows) - 1
        cells = "".join(f"<td>{'<b>' if strong else ''}{escape(str(c))}{'</b>' if strong else ''}"
                        f"</td>" for c in row)
        body.append(f"<tr>{cells}</tr>")
    return (f"<table width='100%' cellspacing='0' cellpadding='12' border='0.5'>"
            f"<tr>{head}</tr>{''.join(body)}</table>")


def _content_table(table: TableContent) -> str:
    if not table.rows:
        return f"<h2>{escape(table.title)}</h2><p>None this month.</p>"
    return "<p></p>" + _table(table.headers, table.rows, title=table.title)


@dataclass(frozen=True)
class JobReport:
    pages: int
    path: Path


def write_job_report(store: Store, kb: KnowledgeBase, case_id: int, path: str | Path,
                     footer: str) -> JobReport:
    """One page for the customer: the device, what was found, replaced, checked, measured and
    what it costs."""
    job = job_report_content(store, kb, case_id)
    report = ReportDocument(f"{job.title} {job.ticket}")
    report.html(f"<h1>{escape(job.title)}</h1><p>Job <b>{escape(job.ticket)}</b>"
                f"{' for ' + escape(job.customer) if job.customer else ''}"
                f", taken in on {job.opened_at:%d %B %Y}"
                + (f", finished {job.closed_at:%d %B %Y}" if job.closed_at else "") + "</p>"
                + (f"<p>{escape(job.warranty)}</p>" if job.warranty else ""))
    report.html("<h2>Your device</h2>" + _table(("Make and model", "Kind", "Serial", "Label"),
                                                [job.device]))
    report.html(f"<h2>What we found</h2><p>{escape(job.found)}<br/>Result: "
                f"<b>{escape(job.outcome)}</b>.</p>")
    report.html("<h2>What we replaced</h2>" + (
        _table(("Part", "Value fitted", "Cost"), job.replaced) if job.replaced
        else "<p>No parts were replaced.</p>"))
    if job.checked:
        report.html("<h2>Checked before power-up</h2>"
                    + _table(("Part", "Result"), job.checked))
    report.html("<h2>Measured after the work</h2>" + (
        _table(("Check", "Reading", "Expected", "Result"), job.measured)
        if job.measured else "<p>No measurements after the work were recorded.</p>"))
    report.html("<h2>Charges</h2>" + _table(("", "Amount"),
                                            list(job.charges) + [("Total", job.total)],
                                            bold_last=True)
                + (f"<p>{escape(job.tax_wording)}</p>" if job.tax_wording else ""))
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
    report.chart(LinesSpec("First-time fix, % of repairs", summary.volume_months,
                           (("first-time fix", summary.first_time_fix),), percent=True))
    report.chart(LinesSpec("Came back under warranty, % of repairs", summary.volume_months,
                           (("came back", summary.came_back),), percent=True))
    report.chart(BarsSpec("Most frequent confirmed faults this month",
                          tuple(label for label, _ in summary.faults),
                          tuple(n for _, n in summary.faults)))
    report.chart(BarsSpec("Parts most often at fault this month",
                          tuple(label for label, _ in summary.parts),
                          tuple(n for _, n in summary.parts)))
    for table in (summary.technicians, summary.model_faults, summary.model_comebacks,
                  summary.money_by_model, summary.practice):
        report.html(_content_table(table))
    return report.write(path, footer)
