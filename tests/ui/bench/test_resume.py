"""Every step is kept as it is taken: a window closed mid-case (or a crash) costs nothing, and the
case is listed again on start, resumed where it was left."""

from __future__ import annotations

from PySide6.QtCore import Qt

from fixbench.ui.context import AppContext
from fixbench.ui.main_window import MainWindow
from tests.ui.bench.conftest import acknowledge, fill_intake, open_intake, settle, shoot, type_reading

CHARGER = {"mains": "230 V", "output": "5 V", "current": "2 A"}


def test_case_left_mid_checks_is_listed_and_resumed_where_it_was(qtbot, window, bench, store, tmp_path):
    intake = fill_intake(qtbot, bench, ticket="BW-3001", make="Quillon", model="QX-5",
                         family="pwm_flyback", ratings=CHARGER, symptoms=("symptom_dead",))
    open_intake(qtbot, bench, intake)
    acknowledge(qtbot, bench)
    type_reading(qtbot, bench, "no")
    type_reading(qtbot, bench, "yes")
    qtbot.keyClick(bench.panels["guided"].card.field.edit, Qt.Key.Key_Z, Qt.KeyboardModifier.ControlModifier)
    settle(qtbot, bench)
    card = bench.panels["guided"].card
    title, expected = card.title.text(), card.expected.text()
    readings_shown = [bench.panels["guided"].readings.item(i).text()
                      for i in range(bench.panels["guided"].readings.count())]
    window.close()  # no save step: everything was kept as it was typed

    again = MainWindow(AppContext(store))
    qtbot.addWidget(again)
    again.resize(1366, 768)
    again.show()
    qtbot.waitExposed(again)
    resumed = again.screens["Bench"]
    cases = resumed.panels["cases"]
    assert cases.model.rowCount() == 1
    assert cases.model.data(cases.model.index(0, 0)) == "BW-3001"
    assert "1 open case" in cases.count.text()
    shoot(again, tmp_path, "open-cases")
    qtbot.keyClick(cases.table, Qt.Key.Key_Return)
    settle(qtbot, resumed)
    assert resumed.page == "guided"  # cautions were acknowledged once for this case
    rcard = resumed.panels["guided"].card
    assert (rcard.title.text(), rcard.expected.text()) == (title, expected)
    assert [resumed.panels["guided"].readings.item(i).text()
            for i in range(resumed.panels["guided"].readings.count())] == readings_shown
    assert "Resumed with 2 readings" in resumed.status.text()


def test_case_left_before_cautions_asks_for_them_again(qtbot, window, bench, store):
    intake = fill_intake(qtbot, bench, ticket="BW-3002", make="Quillon", model="QX-5",
                         family="self_oscillating", ratings=CHARGER)
    open_intake(qtbot, bench, intake)
    assert bench.page == "cautions"
    qtbot.keyClick(bench.panels["cautions"], Qt.Key.Key_Escape)
    assert bench.page == "cases"
    qtbot.keyClick(bench.panels["cases"].table, Qt.Key.Key_Return)
    settle(qtbot, bench)
    assert bench.page == "cautions"
    # Enter without ticking the box does not pass the cautions.
    qtbot.keyClick(bench.panels["cautions"].confirm, Qt.Key.Key_Return)
    assert bench.page == "cautions"
    assert "Tick the box first" in bench.panels["cautions"].message.text()
