"""A unit back within the comeback window is taken in as a warranty return: intake says so before
the case is opened, the new case is linked to the job it came back from, and both jobs' stories
show the link (and why it came back). The intake ticket prints to PDF with a QR code a scanner
reads, and scanning it at the bench opens the case."""

from __future__ import annotations

import shutil
import subprocess
from datetime import timedelta

import numpy as np
import pytest
from PySide6.QtGui import QImage
from sqlalchemy import select

from fixbench.store.cases import add_repair_action, close_case, open_case, utc_now
from fixbench.store.customers import find_or_add_customer
from fixbench.store.models import Case
from fixbench.store.people import add_device, technicians
from fixbench.ui.review.history import HistoryScreen
from fixbench.ui.context import AppContext
from tests.ui.bench.conftest import fill_intake, open_intake, settle, shoot, type_into

LABEL = {"mains": "100-240 V", "bench_mains": "230 V", "output": "12 V", "current": "2 A"}
SERIAL = "HV-0042-117"


@pytest.fixture
def repaired_before(store):
    """Job W-100: the same unit repaired and handed back 30 days ago, for Odile Fenwright."""
    tech = technicians(store)[0].id
    customer = find_or_add_customer(store, "Odile Fenwright", "odile@example.org")
    device = add_device(store, make="Halvenor", model="HV-12", kind="router adapter",
                        label_ratings=LABEL, serial=SERIAL)
    opened = utc_now() - timedelta(days=32)
    case = open_case(store, ticket_ref="W-100", device_id=device, technician_id=tech,
                     family_id="pwm_flyback", ratings=LABEL, opened_at=opened,
                     customer_id=customer, quoted_cents=3900, notes="dead after a storm")
    add_repair_action(store, case, part_id="C2", action="replaced", parts_cost_cents=45,
                      done_at=opened + timedelta(hours=3))
    close_case(store, case, outcome="repaired", bench_minutes=40, confirmed_fault="C2.dried",
               confirmed_part="C2", closed_at=opened + timedelta(days=2), price_cents=3900,
               labour_rate_cents=4200)
    return case


def test_a_warranty_return_at_intake_links_to_its_original_job_and_shows_on_both(
        qtbot, window, bench, store, repaired_before, tmp_path):
    intake = fill_intake(qtbot, bench, ticket="W-200", make="Halvenor", model="HV-12",
                         family="pwm_flyback", ratings=LABEL, serial=SERIAL)
    type_into(qtbot, intake.customer.edit, "Odile Fenwright")
    type_into(qtbot, intake.notes, "dead again, same as before", enter=False)
    qtbot.waitUntil(lambda: "W-100" in intake.warranty_note.text(), timeout=5000)
    assert "Warranty return" in intake.warranty_note.text()
    shoot(window, tmp_path, "intake-warranty")
    open_intake(qtbot, bench, intake)
    assert bench.page == "cautions"
    assert "warranty return of job W-100" in bench.status.text()
    with store.reading() as session:
        back = session.scalar(select(Case).where(Case.ticket_ref == "W-200"))
        assert back.comeback_of_id == repaired_before and back.customer_id is not None
        assert session.get(Case, repaired_before).came_back

    history = HistoryScreen(AppContext(store, bench.context.knowledge))
    qtbot.addWidget(history)
    history.resize(1366, 768)
    history.show()
    qtbot.waitUntil(lambda: history.model.total == 2 and not history.controller.loading,
                    timeout=10_000)
    rows = {history.model.case_at(r).ticket: r for r in range(history.model.rowCount())}
    came_back = 7  # the "Came back" column
    assert history.model.index(rows["W-100"], came_back).data() == "yes: W-200"
    assert history.model.index(rows["W-200"], came_back).data() == "return of W-100"
    original = history.open_case(rows["W-100"])
    qtbot.waitUntil(lambda: original.story is not None, timeout=10_000)
    timeline = original.timeline.toPlainText()
    assert "Came back under warranty as job W-200" in timeline
    assert "dead again, same as before" in timeline  # why it came back, in the customer's words
    shoot(original, tmp_path, "story-came-back")
    returned = history.open_case(rows["W-200"])
    qtbot.waitUntil(lambda: returned.story is not None, timeout=10_000)
    assert "Warranty return of job W-100" in returned.timeline.toPlainText()
    assert dict(returned.story.facts)["Warranty return of"] == "W-100"


def _decoded(png) -> list[str]:
    import zxingcpp

    image = QImage(str(png)).convertToFormat(QImage.Format.Format_Grayscale8)
    pixels = np.array(image.constBits()).reshape(image.height(), image.bytesPerLine())
    return [found.text for found in zxingcpp.read_barcodes(pixels[:, :image.width()])]


@pytest.mark.skipif(shutil.which("pdftoppm") is None, reason="needs poppler-utils")
def test_the_intake_ticket_prints_to_pdf_with_a_code_a_scanner_reads(qtbot, window, bench, store,
                                                                      tmp_path):
    intake = fill_intake(qtbot, bench, ticket="W-301", make="Pellamor", model="PM-65",
                         family="pwm_flyback", ratings=LABEL, serial="PM-9")
    type_into(qtbot, intake.notes, "no output, light blinks", enter=False)
    open_intake(qtbot, bench, intake)
    pdf = tmp_path / "ticket.pdf"
    bench.print_intake_ticket(str(pdf))
    qtbot.waitUntil(lambda: "Intake ticket W-301 printed" in bench.status.text(), timeout=5000)
    words = subprocess.run(["pdftotext", str(pdf), "-"], capture_output=True, text=True,
                           check=True).stdout
    for expected in ("W-301", "Pellamor PM-65", "no output, light blinks"):
        assert expected in words
    subprocess.run(["pdftoppm", "-png", "-r", "200", str(pdf), str(tmp_path / "ticket")],
                   check=True)
    png = next(tmp_path.glob("ticket*.png"))
    # Decoded by an independent reader (zxing-cpp, ISO/IEC 18004 QR Code).
    assert _decoded(png) == ["W-301"]

    # Scanned at the bench (a scanner types the code like a keyboard), the code opens the case.
    bench.controller.back_to_cases()
    settle(qtbot, bench)
    type_into(qtbot, bench.panels["cases"].scan, "W-301")
    settle(qtbot, bench)
    assert bench.controller.view.case is not None and bench.controller.view.case.ticket == "W-301"
