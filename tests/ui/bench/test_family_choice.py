"""The intake's board questions: answers that fit one family choose it; answers that fit none say
which family comes closest and why (issue 13: "8-pin chip, no optocoupler, no TL431")."""

from __future__ import annotations

from PySide6.QtCore import Qt

from tests.ui.bench.conftest import shoot


def _answer(qtbot, intake, **answers) -> None:
    for question, answer in answers.items():
        combo = intake.family.answers[question]
        combo.setFocus()
        combo.setCurrentIndex(combo.findData(answer))
    qtbot.wait(10)


def _open_intake(qtbot, bench):
    qtbot.keyClick(bench.panels["cases"].table, Qt.Key.Key_N, Qt.KeyboardModifier.ControlModifier)
    return bench.panels["intake"]


def test_eight_pin_chip_without_optocoupler_or_tl431_chooses_primary_side(qtbot, bench, tmp_path):
    intake = _open_intake(qtbot, bench)
    _answer(qtbot, intake, controller_chip="yes", optocoupler="no", tl431="no")
    assert intake.family.family_id() == "primary_side"
    assert intake.family.suggestion.text().startswith("\u2192 That board fits: Primary-side-regulated")
    shoot(bench.window(), tmp_path, "intake_fits")


def test_a_board_no_family_fits_names_the_closest_and_why(qtbot, bench):
    intake = _open_intake(qtbot, bench)
    _answer(qtbot, intake, controller_chip="yes", separate_switch="no", optocoupler="no")
    text = intake.family.suggestion.text()
    assert text.startswith("No single family fits those answers. Closest: Primary-side-regulated")
    assert "you saw no separate power transistor" in text
    # "not sure" takes an answer back.
    _answer(qtbot, intake, separate_switch=None)
    assert intake.family.suggestion.text().startswith("\u2192 That board fits: Primary-side-regulated")
