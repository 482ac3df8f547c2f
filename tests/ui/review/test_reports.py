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
    for expected in (ticket, f"{make} {model}", part, "What we replaced", "Measured after the repair",
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
    assert pages == _pdf_pages(path) == 2
    words = _pdf_text(path)
    with demo_store.engine.connect() as connection:
        closed = connection.execute(text(
            "SELECT count(*) FROM cases WHERE status = 'closed' AND opened_at >= '2024-05-01' "
            "AND opened_at < '2024-06-01'")).scalar()
    assert "Monthly summary: May 2024" in words
    assert f"Closed cases {closed}" in words
    assert "Most frequent confirmed faults this month" in words  # a chart's title, drawn as text
    assert f"page 2 of {pages}" in words
    _first_page_png(path, tmp_path)


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
    assert "tested: passed" in text or "tested: failed" in text
