"""The repair panel: a replaced part is kept with the value fitted, a part tested before power-up
with its result, passed or failed, chosen from the keyboard."""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtWidgets import QApplication
from sqlalchemy import select

from fixbench.store.models import RepairAction
from tests.ui.bench.conftest import acknowledge, fill_intake, open_intake, settle, type_into

CHARGER = {"mains": "230 V", "output": "5 V", "current": "2 A"}
TAB = Qt.Key.Key_Tab


def _to_repair(qtbot, bench):
    intake = fill_intake(qtbot, bench, ticket="BW-3100", make="Quillon", model="QX-5",
                         family="pwm_flyback", ratings=CHARGER, symptoms=("symptom_dead",))
    open_intake(qtbot, bench, intake)
    acknowledge(qtbot, bench)
    qtbot.keyClick(bench.panels["guided"].card, Qt.Key.Key_R, Qt.KeyboardModifier.AltModifier)
    assert bench.page == "repair"
    return bench.panels["repair"]


def _kept(store) -> list[tuple]:
    with store.session() as session:
        return [(r.part_id, r.action, r.value_fitted, r.test_passed, r.parts_cost_cents, r.note)
                for r in session.scalars(select(RepairAction).order_by(RepairAction.id))]


def _choose_part(qtbot, repair, part: str) -> None:
    """Type the part's reference into the part list, as a person picks from a closed list."""
    qtbot.wait(QApplication.keyboardInputInterval() + 50)  # a new search, not the last one's end
    repair.part.setFocus()
    qtbot.keyClicks(repair.part, part)


def _test_part(qtbot, repair, part: str, result_key) -> None:
    """Part, Tab, t for tested, Tab, p or f for the result, Tab to the cost, Enter to keep."""
    _choose_part(qtbot, repair, part)
    assert repair.part.currentData() == part
    qtbot.keyClick(repair.part, TAB)
    assert repair.action.hasFocus()
    qtbot.keyClick(repair.action, Qt.Key.Key_T)
    assert repair.action.currentText() == "tested"
    qtbot.keyClick(repair.action, TAB)
    assert repair.result.hasFocus()
    qtbot.keyClick(repair.result, result_key)
    qtbot.keyClick(repair.result, TAB)
    assert repair.cost.edit.hasFocus()  # the value field is passed over: nothing was fitted
    qtbot.keyClick(repair.cost.edit, Qt.Key.Key_Return)


def test_tested_parts_are_kept_passed_or_failed_and_the_failed_one_replaced(qtbot, bench, store):
    repair = _to_repair(qtbot, bench)
    assert not repair.result.isEnabled() and repair.value.isEnabled()  # "replaced" comes first

    _test_part(qtbot, repair, "D2", Qt.Key.Key_F)
    settle(qtbot, bench)
    _test_part(qtbot, repair, "R3", Qt.Key.Key_P)
    settle(qtbot, bench)
    assert repair.result.currentIndex() == -1  # the next test needs its own choice

    _choose_part(qtbot, repair, "D2")
    assert repair.part.currentData() == "D2"
    qtbot.keyClick(repair.part, TAB)
    qtbot.keyClick(repair.action, Qt.Key.Key_R)
    assert repair.action.currentText() == "replaced"
    assert not repair.result.isEnabled() and repair.value.isEnabled()
    qtbot.keyClick(repair.action, TAB)
    assert repair.value.edit.hasFocus()  # the result is passed over for a replaced part
    type_into(qtbot, repair.value.edit, "1 A 600 V fast diode")
    type_into(qtbot, repair.cost.edit, "0.10")
    settle(qtbot, bench)

    assert [repair.done_list.item(i).text() for i in range(repair.done_list.count())] == [
        "D2 tested: failed  cost 0.00", "R3 tested: passed  cost 0.00",
        "D2 replaced  1 A 600 V fast diode  cost 0.10"]
    assert _kept(store) == [("D2", "tested", None, False, 0, ""),
                            ("R3", "tested", None, True, 0, ""),
                            ("D2", "replaced", "1 A 600 V fast diode", None, 10, "")]


def test_a_tested_part_is_not_kept_until_its_result_is_chosen(qtbot, bench, store):
    repair = _to_repair(qtbot, bench)
    repair.action.setCurrentIndex(repair.action.findText("tested"))
    type_into(qtbot, repair.cost.edit, "0")
    settle(qtbot, bench)
    assert repair.result_message.isVisible()
    assert "passed or failed" in repair.result_message.text()
    assert repair.result.hasFocus()
    assert _kept(store) == [] and repair.done_list.count() == 0

    qtbot.keyClick(repair.result, Qt.Key.Key_P)
    assert not repair.result_message.isVisible()
    type_into(qtbot, repair.cost.edit, "0")
    settle(qtbot, bench)
    assert [row[:4] for row in _kept(store)] == [(repair.part.currentData(), "tested", None, True)]
