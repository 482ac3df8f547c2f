"""Board profiles in the window: filled in the editor from intake (parts, a photo with a test
point clicked on it, the file shared and read back), a marking typed at a step, and the next unit
of the model arriving with all of it. Screens are rendered at 1366x768 for looking at."""

from __future__ import annotations

from PySide6.QtCore import QPoint, Qt, QTimer
from PySide6.QtGui import QColor, QImage
from PySide6.QtWidgets import QApplication, QLineEdit

from fixbench.engine import simulate_readings
from fixbench.knowledge.board import profile_from_toml
from tests.ui.bench.conftest import (WAIT_MS, acknowledge, fill_intake, open_intake, settle, shoot, type_into,
                                     type_reading)
from tests.ui.bench.test_bench_flow import follow_steps

CHARGER = {"mains": "230 V", "output": "5 V", "current": "1 A"}
START_CHAIN = "2 x 2.2 Mohm"


def _board_photo(path) -> str:
    image = QImage(800, 600, QImage.Format.Format_RGB32)
    image.fill(QColor(30, 90, 50))  # a green board
    image.save(str(path), "PNG")
    return str(path)


def _cell(dialog, part_id: str, column: int):
    row = [p.id for p in dialog.parts.parts].index(part_id)
    return dialog.parts.index(row, column)


def _type_cell(qtbot, dialog, part_id: str, column: int, text: str) -> None:
    """Type into a table cell: its editor opened (as F2 or a double click does), the text typed,
    Enter to keep it."""
    index = _cell(dialog, part_id, column)
    dialog.table.scrollTo(index)
    dialog.table.setCurrentIndex(index)
    dialog.table.edit(index)
    editors = lambda: [w for w in dialog.table.viewport().findChildren(QLineEdit) if w.isVisible()]
    qtbot.waitUntil(lambda: len(editors()) == 1, timeout=WAIT_MS)
    editor = editors()[0]
    editor.setFocus()
    qtbot.keyClicks(editor, text)
    qtbot.keyClick(editor, Qt.Key.Key_Return)  # the delegate keeps it on the next turn of the loop
    qtbot.waitUntil(lambda: dialog.parts.data(index) == text, timeout=WAIT_MS)


def test_a_profile_filled_at_intake_a_marking_at_a_step_and_the_next_unit_arrives_with_both(
        qtbot, bench, tmp_path):
    from fixbench.ui.bench.board_profile import DESIGNATOR, MARKED

    intake = fill_intake(qtbot, bench, ticket="BP-100", make="Quillon", model="QX-5",
                         family="primary_side", ratings=CHARGER, symptoms=("symptom_dead",))
    dialog = intake.edit_board()
    qtbot.waitUntil(lambda: dialog.loaded, timeout=WAIT_MS)
    _type_cell(qtbot, dialog, "R1", DESIGNATOR, "R3 + R4")
    _type_cell(qtbot, dialog, "R1", MARKED, START_CHAIN)
    _type_cell(qtbot, dialog, "C1", MARKED, "10 uF 400 V")
    assert dialog.parts.data(_cell(dialog, "R1", MARKED)) == START_CHAIN

    # A photo of the board; the start-up resistor's pins marked by one click on it.
    dialog.add_photo_from(_board_photo(tmp_path / "board.png"))
    qtbot.waitUntil(lambda: dialog.photos.count() == 1, timeout=WAIT_MS)
    dialog.point.setCurrentIndex(dialog.point.findData("r1_pins"))
    area = dialog.marker.area()
    click = QPoint(round(area.x() + 0.25 * area.width()), round(area.y() + 0.5 * area.height()))
    qtbot.mouseClick(dialog.marker, Qt.MouseButton.LeftButton, pos=click)
    qtbot.waitUntil(lambda: "r1_pins" in dialog.marker.marks, timeout=WAIT_MS)
    x, y = dialog.marker.marks["r1_pins"]
    assert abs(x - 0.25) < 0.01 and abs(y - 0.5) < 0.01
    shoot(dialog, tmp_path, "board-profile-editor")

    # Shared as a file and read back: the same profile.
    exported = tmp_path / "qx5.toml"
    dialog.export_to(str(exported))
    profile = profile_from_toml(exported.read_text(encoding="utf-8"))
    assert profile.model == "QX-5" and profile.family == "primary_side"
    assert {e.part: (e.designator, e.value) for e in profile.parts} == {
        "R1": ("R3 + R4", START_CHAIN), "C1": ("", "10 uF 400 V")}
    with qtbot.waitSignal(dialog.finished, timeout=WAIT_MS):
        dialog.save()
    qtbot.waitUntil(lambda: "Board profile of QX-5: 2 parts" in intake.board_note.text(), timeout=WAIT_MS)
    shoot(bench.window(), tmp_path, "intake-with-profile")

    open_intake(qtbot, bench, intake)
    assert bench.page == "cautions", intake.message.text()
    acknowledge(qtbot, bench)
    guided = bench.panels["guided"]
    bench.controller.choose_check("start_resistor")
    card = guided.card
    assert "R3 + R4" in card.board.words.text() and f"marked {START_CHAIN}" in card.board.words.text()
    assert card.board.photo.isVisible()  # the board around the marked pins
    # The two 2.2 Mohm in series read about 3.7 Mohm in circuit: inside the band shown.
    assert "Mohm" in card.band.text() and "722 kohm" not in card.band.text()
    shoot(bench.window(), tmp_path, "step-with-board")

    # At a step: "this board's part is marked ..." for the output capacitor.
    bench.controller.choose_check("output_cap_capacitance")
    assert "C3, typical 330 uF" in card.board.words.text()

    def fill_marking():
        marking = QApplication.activeModalWidget()
        marking.designator.setText("C9")
        qtbot.keyClicks(marking.value, "1000uF 10V")
        shoot(marking, tmp_path, "marking-dialog")
        marking.accept()

    QTimer.singleShot(0, fill_marking)
    qtbot.mouseClick(card.board.button, Qt.MouseButton.LeftButton)
    settle(qtbot, bench)
    assert bench.controller.current_check_id() == "output_cap_capacitance"
    assert "C9, marked 1000uF 10V" in card.board.words.text()
    assert "Kept for every QX-5" in bench.controller.view.notice
    assert card.expected.text() == "1000 uF"  # capacitors in microfarads, as they are marked
    type_reading(qtbot, bench, "1010")  # a bare number, in the microfarads the step shows
    assert "1.01 mF" not in bench.controller.view.notice
    assert "Kept: 1010 uF (in band). The bare number 1010 was read in uF" in bench.controller.view.notice

    # This unit's start-up chain is open: the steps read off it (the engine's simulated unit on
    # this board), then the conclusion names the board's parts and what to buy.
    view = bench.controller.view
    unit = simulate_readings(view.state.family, view.state.model.ratings, "R1.open", seed=1, noise=False)
    follow_steps(qtbot, bench, unit)
    qtbot.keyClick(card, Qt.Key.Key_R, Qt.KeyboardModifier.AltModifier)
    assert bench.page == "repair"
    repair = bench.panels["repair"]
    replace = repair.replace_label.text()
    assert "R3 + R4" in replace and "buy 2 x 2.2 Mohm in series" in replace, replace
    assert repair.part.itemText(0).startswith("R3 + R4")
    shoot(bench.window(), tmp_path, "repair-with-board")

    # The next unit of the model arrives with its board.
    bench.controller.back_to_cases()
    intake = fill_intake(qtbot, bench, ticket="BP-101", make="Quillon", model="qx-5",
                         family="primary_side", ratings=CHARGER, symptoms=("symptom_dead",))
    qtbot.waitUntil(lambda: "Board profile of QX-5: 3 parts" in intake.board_note.text(), timeout=WAIT_MS)
    open_intake(qtbot, bench, intake)
    acknowledge(qtbot, bench)
    bench.controller.choose_check("output_cap_esr")
    assert "C9, marked 1000uF 10V" in guided.card.board.words.text()
    family = bench.controller.view.state.family
    assert family.part("R1").label == "R3 + R4" and family.part("R3").label == "R3 (typical)"
    suspects = guided.suspects_model
    labels = {suspects.data(suspects.index(r, 2)) for r in range(suspects.rowCount())}
    assert "R3 + R4" in labels or "C5" in labels or "R3 (typical)" in labels


def test_a_profile_file_exported_from_one_model_is_imported_for_another(qtbot, bench, tmp_path):
    from fixbench.ui.bench.board_profile import DESIGNATOR, MARKED

    intake = fill_intake(qtbot, bench, ticket="BP-200", make="Quillon", model="QX-5",
                         family="primary_side", ratings=CHARGER)
    first = intake.edit_board()
    qtbot.waitUntil(lambda: first.loaded, timeout=WAIT_MS)
    _type_cell(qtbot, first, "R1", DESIGNATOR, "R3 + R4")
    _type_cell(qtbot, first, "R1", MARKED, START_CHAIN)
    _type_cell(qtbot, first, "C3", MARKED, "1000uF 10V 105C")
    shared = tmp_path / "shared.toml"
    first.export_to(str(shared))
    first.reject()

    type_into(qtbot, intake.model.edit, "QX-5 rev B")
    second = intake.edit_board()
    qtbot.waitUntil(lambda: second.loaded, timeout=WAIT_MS)
    second.import_from(str(shared))
    qtbot.waitUntil(lambda: "Imported" in second.message.text() or "\u26a0" in second.message.text(),
                    timeout=WAIT_MS)
    assert "Imported 2 parts" in second.message.text(), second.message.text()
    assert second.parts.data(_cell(second, "R1", DESIGNATOR)) == "R3 + R4"
    assert second.parts.data(_cell(second, "C3", MARKED)) == "1000uF 10V 105C"
    with qtbot.waitSignal(second.finished, timeout=WAIT_MS):
        second.save()
    qtbot.waitUntil(lambda: "Board profile of QX-5 rev B: 2 parts" in intake.board_note.text(), timeout=WAIT_MS)
    # A slip in a marking is told in the table and nothing is kept until it is put right.
    third = intake.edit_board()
    qtbot.waitUntil(lambda: third.loaded, timeout=WAIT_MS)
    _type_cell(qtbot, third, "C1", MARKED, "10 ohm")
    third.save()
    assert "C1: '10 ohm': an electrolytic capacitor is marked with its value in F" in third.message.text()
    third.reject()
