"""The printed reports and the CSV export: real PDFs read back with poppler, the first page of
each rendered to PNG, and the export guarded by the owner's passphrase."""

from __future__ import annotations

import csv
import shutil
import subprocess
from datetime import date

import pytest
from sqlalchemy import text

from fixbench.store.shop_settings import set_setting
from fixbench.store.case_filters import CaseFilter, filtered_count
from fixbench.ui.review.history import HistoryScreen
from fixbench.ui.review.reports import FOOTER_KEY, SAFETY_NOTE, write_job_report, \
    write_monthly_summary

from .helpers import settle

FOOTER = "Solder & Sons Bench Repairs, 3 Capstan Row. Parts carry a 90-day warranty."
poppler = pytest.mark.skipif(shutil.which("pdftotext") is None, reason="needs poppler-utils")


def _pdf_pages(path) -> int:
    info = subprocess.run(["pdfinfo", str(path)], capture_output=True, text=True, check=True)
    return int(next(line.split()[-1] for line in info.stdout.splitlines()
                    if line.startswith("Pages:")))


def _pdf_text(path) -> str:
    out = subprocess.run(["pdftotext", "-layout", str(path), "-"], capture_output=True,
                         text=True, check=True).stdout
    # Qt's PDF keeps the font's "fi"/"fl" ligatures as single glyphs; read them back as letters.
    return " ".join(out.replace("\ufb01", "fi").replace("\ufb02", "fl").split())


def _first_page_png(path, tmp_path):
    subprocess.run(["pdftoppm", "-png", "-r", "50", "-f", "1", "-l", "1", str(path),
                    str(tmp_path / "page")], check=True)
    png = next(tmp_path.glob("page*.png"))
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n" and png.stat().st_size > 5_000
    return png


def _repaired_case(store):
    with store.engine.connect() as connection:
        return connection.execute(text(
            "SELECT c.id, c.ticket_ref, c.confirmed_part, d.make, d.model FROM cases c "
            "JOIN devices d ON d.id = c.device_id WHERE c.outcome = 'repaired' "
            "AND EXISTS (SELECT 1 FROM verifications v WHERE v.case_id = c.id) "
            "ORDER BY c.id LIMIT 1")).one()


@poppler
def test_job_report_is_one_page_with_what_the_customer_needs(demo_store, knowledge, tmp_path):
    case_id, ticket, part, make, model = _repaired_case(demo_store)
    report = write_job_report(demo_store, knowledge, case_id, tmp_path / "job.pdf", FOOTER)
    assert report.pages == 1 == _pdf_pages(report.path)
    words = _pdf_text(report.path)
    with demo_store.engine.connect() as connection:
        family = connection.execute(text("SELECT family_id FROM cases WHERE id = :c"),
                                    {"c": case_id}).scalar()
    for expected in (ticket, f"{make} {model}", knowledge.family(family).part(part).title,
                     "Repair report", "What we replaced", "Measured after the work", "Charges",
                     " ".join(SAFETY_NOTE.split()[:12]), FOOTER, "page 1 of 1"):
        assert expected in words
    with demo_store.engine.connect() as connection:
        typed = connection.execute(text("SELECT typed FROM verifications WHERE case_id = :c"),
                                   {"c": case_id}).scalars().all()
    assert all(value in words for value in typed)
    _first_page_png(report.path, tmp_path)


@poppler
def test_monthly_summary_has_its_pages_numbers_and_charts(demo_store, knowledge, tmp_path):
    path = tmp_path / "summary.pdf"
    pages = write_monthly_summary(demo_store, knowledge, date(2024, 5, 1), path, FOOTER)
    assert pages == _pdf_pages(path) >= 2
    words = _pdf_text(path)
    with demo_store.engine.connect() as connection:
        closed = connection.execute(text(
            "SELECT count(*) FROM cases WHERE status = 'closed' AND opened_at >= '2024-05-01' "
            "AND opened_at < '2024-06-01'")).scalar()
    assert "Monthly summary: May 2024" in words
    assert f"Closed cases {closed}" in words
    assert "Most frequent confirmed faults this month" in words  # a chart's title, drawn as text
    assert f"page 2 of {pages}" in words
    for table in ("Faults by device model", "Comebacks by device model", "Money by model"):
        assert table in words
    _first_page_png(path, tmp_path)


def test_monthly_summary_reads_practice_scores_out_of_100_over_twelve_months(demo_store,
                                                                             knowledge):
    """Scores are out of 100 (issue: "Mean score 8720%"), and the trend covers twelve months
    (issue: the "last twelve months" chart showed thirteen)."""
    from fixbench.workflows.monthly_summary import monthly_summary_content

    summary = monthly_summary_content(demo_store, knowledge, date(2024, 5, 1))
    assert summary.practice.rows
    for row in summary.practice.rows:
        assert row[2].endswith(" of 100") and 0 <= float(row[2].split()[0]) <= 100
        assert "%" not in row[2]
    assert summary.volume_months == tuple(f"{y}-{m:02d}" for y, m in
                                          [(2023, 6 + k) if k < 7 else (2024, k - 6)
                                           for k in range(12)])


def test_footer_comes_from_the_shop_settings(demo_store):
    from fixbench.ui.review.reports import shop_footer

    assert shop_footer(demo_store) == ""
    set_setting(demo_store, FOOTER_KEY, FOOTER)
    assert shop_footer(demo_store) == FOOTER


@pytest.fixture
def history(qtbot, demo_context):
    screen = HistoryScreen(demo_context)
    qtbot.addWidget(screen)
    screen.show()
    settle(qtbot, lambda: screen.model.rows and not screen.controller.loading)
    return screen


def test_csv_export_writes_the_filtered_cases(qtbot, history, demo_store, owner_passphrase,
                                              tmp_path):
    make = _repaired_case(demo_store).make.lower()  # typed in lower case: the search ignores case
    history.apply_filter({"outcome": "repaired", "text": make})
    settle(qtbot, lambda: not history.controller.loading
           and history.controller.case_filter.outcome == "repaired")
    out = tmp_path / "cases.csv"
    history.actions.export_csv(history.controller.case_filter, path=str(out),
                               passphrase=owner_passphrase)
    settle(qtbot, lambda: history.actions.running == 0)
    rows = list(csv.DictReader(out.open(encoding="utf-8")))
    expected = filtered_count(demo_store, CaseFilter(outcome="repaired", text=make))
    assert 0 < expected < filtered_count(demo_store, CaseFilter())
    assert len(rows) == expected == history.model.total
    assert {row["outcome"] for row in rows} == {"repaired"}
    assert f"{expected} cases exported" in history.busy.message.text()


def test_csv_export_refuses_a_wrong_passphrase_in_words(qtbot, history, owner_passphrase,
                                                        tmp_path):
    out = tmp_path / "cases.csv"
    history.actions.export_csv(CaseFilter(), path=str(out), passphrase="not the owner")
    settle(qtbot, lambda: history.actions.running == 0)
    assert not out.exists()
    assert "passphrase was not accepted" in history.busy.message.text()
    assert "Traceback" not in history.busy.message.text()


def test_job_report_names_the_value_fitted_and_test_results(demo_store, knowledge, tmp_path):
    import subprocess

    from sqlalchemy import select

    from fixbench.store.models import RepairAction
    from fixbench.ui.review.reports import write_job_report

    with demo_store.reading() as session:
        tested = select(RepairAction.case_id).where(RepairAction.test_passed.is_not(None))
        case_id = session.scalar(select(RepairAction.case_id).where(RepairAction.value_fitted.is_not(None),
                                                                    RepairAction.case_id.in_(tested)))
        lines = list(session.scalars(select(RepairAction).where(RepairAction.case_id == case_id)))
    if case_id is None:
        pytest.skip("the shop has no case with both a fitted value and a tested part")
    pdf = tmp_path / "job.pdf"
    write_job_report(demo_store, knowledge, case_id, pdf, footer="")
    text = subprocess.run(["pdftotext", "-layout", str(pdf), "-"], capture_output=True, text=True).stdout
    fitted = next(r.value_fitted for r in lines if r.value_fitted)
    assert fitted.split()[0] in text
    assert "Checked before power-up" in text
    assert "tested good, kept" in text or "failed its test, replaced" in text


TERMS = dict(labour_rate_cents=3600, currency="EUR", tax_wording="Prices include VAT at 20 %")
AMOUNT = r"EUR (-?[\d,]+\.\d\d)"


def _pdf_lines(path) -> list[str]:
    out = subprocess.run(["pdftotext", "-layout", str(path), "-"], capture_output=True,
                         text=True, check=True).stdout
    return [" ".join(line.replace("\ufb01", "fi").replace("\ufb02", "fl").split())
            for line in out.splitlines()]


def _section(lines: list[str], start: str, end: str) -> list[str]:
    first = next(i for i, line in enumerate(lines) if line.startswith(start))
    last = next(i for i, line in enumerate(lines) if i > first and line.startswith(end))
    return lines[first + 1:last]


def _amounts(section: list[str]) -> list[int]:
    """The amount at the end of each line that ends with one (a rate inside the words is not)."""
    import re

    found = [re.search(AMOUNT + r"$", line) for line in section]
    return [round(float(m.group(1).replace(",", "")) * 100) for m in found if m]


def _case_with(store, where: str) -> int:
    with store.engine.connect() as connection:
        return connection.execute(text(f"SELECT c.id FROM cases c WHERE {where} "
                                       "ORDER BY c.id LIMIT 1")).scalar()


@poppler
def test_job_report_of_a_repair_lists_only_fitted_parts_and_its_totals_add_up(
        demo_store, knowledge, tmp_path):
    """Parts only tested before power-up are not "replaced" rows at 0.00; the bill names its
    currency, labour and total, and its lines add up (issue: none of these held)."""
    from fixbench.store.shop_terms import ShopTerms, set_shop_terms

    set_shop_terms(demo_store, ShopTerms(**TERMS))
    case_id = _case_with(demo_store, "c.outcome = 'repaired' AND EXISTS (SELECT 1 FROM "
                                     "repair_actions r WHERE r.case_id = c.id AND r.action = "
                                     "'tested' AND r.test_passed) AND c.price_cents > 0")
    assert case_id is not None
    pdf = write_job_report(demo_store, knowledge, case_id, tmp_path / "repair.pdf", FOOTER).path
    lines = _pdf_lines(pdf)
    _first_page_png(pdf, tmp_path)
    with demo_store.engine.connect() as connection:
        kept = connection.execute(text(
            "SELECT part_id, action, test_passed, parts_cost_cents FROM repair_actions "
            "WHERE case_id = :c"), {"c": case_id}).all()
        family, price = connection.execute(text("SELECT family_id, price_cents FROM cases "
                                                "WHERE id = :c"), {"c": case_id}).one()
    replaced_ids = {part for part, action, _p, _c in kept if action == "replaced"}
    only_tested = {part for part, action, _p, _c in kept if action == "tested"} - replaced_ids
    assert only_tested
    replaced = "\n".join(_section(lines, "What we replaced", "Checked before power-up"))
    for part in only_tested:
        assert knowledge.family(family).part(part).title not in replaced
    assert "0.00" not in replaced
    assert _amounts(replaced.splitlines()) == [cents for _part, action, _p, cents in kept
                                               if action == "replaced"]
    charges = _section(lines, "Charges", "Please note")
    *items, total = _amounts(charges)
    assert any(line.startswith("Labour:") for line in charges)
    assert charges[-1] == TERMS["tax_wording"] or TERMS["tax_wording"] in charges
    assert items[0] == sum(_amounts(replaced.splitlines()))  # the parts line: the parts listed
    assert sum(items) == total == price


@poppler
def test_job_report_of_a_no_fault_job_is_a_test_report(demo_store, knowledge, tmp_path):
    """A unit with no fault found is not sent home with a "Repair report" (issue)."""
    from fixbench.store.shop_terms import ShopTerms, set_shop_terms

    set_shop_terms(demo_store, ShopTerms(**TERMS))
    case_id = _case_with(demo_store, "c.outcome = 'no_fault_found'")
    pdf = write_job_report(demo_store, knowledge, case_id, tmp_path / "nff.pdf", FOOTER).path
    words = _pdf_text(pdf)
    assert "Test report: no fault found" in words and "Repair report" not in words
    assert "No parts were replaced." in words
    assert not any(jargon in words for jargon in ("PWM flyback", "Self-oscillating",
                                                  "Primary-side regulated", "Supply type"))
    *items, total = _amounts(_section(_pdf_lines(pdf), "Charges", "Please note"))
    assert sum(items) == total
