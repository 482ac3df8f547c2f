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


def test_eight_pin_chip_without_optocoupler_or_tl431_asks_for_the_switch_then_chooses(qtbot, bench, tmp_path):
    intake = _open_intake(qtbot, bench)
    _answer(qtbot, intake, controller_chip="yes", optocoupler="no", tl431="no")
    text = intake.family.suggestion.text()
    assert text.startswith("2 families fit those answers")
    assert "Answer this to tell them apart: A separate power transistor" in text
    _answer(qtbot, intake, separate_switch="no")
    assert intake.family.family_id() == "integrated_primary_side"
    assert intake.family.suggestion.text().startswith("\u2192 That board fits: Integrated controller and MOSFET")
    shoot(bench.window(), tmp_path, "intake_fits")


def test_a_board_no_family_fits_names_the_closest_and_why(qtbot, bench, tmp_path):
    intake = _open_intake(qtbot, bench)
    _answer(qtbot, intake, controller_chip="yes", separate_switch="no", optocoupler="yes", tl431="no")
    text = intake.family.suggestion.text()
    assert text.startswith("No single family fits those answers. Closest: Integrated controller and MOSFET")
    assert "its boards have a TL431 near the output; you saw no TL431" in text
    shoot(bench.window(), tmp_path, "intake_no_fit")
    # "not sure" takes an answer back.
    _answer(qtbot, intake, tl431=None)
    assert intake.family.family_id() == "integrated_opto"
    assert intake.family.suggestion.text().startswith("\u2192 That board fits: Integrated controller and MOSFET")


def test_a_pfc_adapter_shows_its_boost_stage_before_the_bulk(qtbot, bench, tmp_path):
    from tests.ui.bench.conftest import acknowledge, fill_intake

    intake = fill_intake(qtbot, bench, ticket="BW-3090", make="Pellamor", model="PM-90", family="pwm_pfc",
                         ratings={"mains": "universal", "output": "19.5 V", "current": "4.62 A"},
                         symptoms=("symptom_dead",))
    qtbot.keyClick(intake.ticket.edit, Qt.Key.Key_Return, Qt.KeyboardModifier.ControlModifier)
    # the largest family's model is built once on opening, off the GUI thread: seconds on a slow machine
    qtbot.waitUntil(lambda: not bench.controller.busy, timeout=120_000)
    acknowledge(qtbot, bench)
    picture = bench.panels["guided"].picture
    assert picture.family.id == "pwm_pfc"
    # the boost stage sits above the power path between the bridge and the bulk capacitor
    assert picture.places["rectifier"][0] < picture.places["pfc"][0] < picture.places["bulk"][0]
    shoot(bench.window(), tmp_path, "pfc_case")
