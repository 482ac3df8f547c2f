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


def test_ratings_the_family_cannot_describe_keep_no_case_and_say_why(qtbot, window, bench, store):
    # A pwm_flyback unit at 2 V used to be kept first, then fail in the engine ("band inverted").
    intake = fill_intake(qtbot, bench, ticket="BW-3003", make="Quillon", model="QX-9",
                         family="pwm_flyback", ratings={"mains": "230 V", "output": "2 V", "current": "1 A"})
    open_intake(qtbot, bench, intake)
    assert bench.page == "intake"
    assert "reference of the TL431" in bench.status.text()
    assert bench.panels["cases"].model.rowCount() == 0


def test_a_kept_case_that_cannot_be_resumed_asks_for_its_ratings_and_opens(qtbot, window, bench, store,
                                                                          tmp_path):
    from PySide6.QtCore import QTimer
    from PySide6.QtWidgets import QApplication

    from fixbench.store.cases import open_case
    from fixbench.store.people import add_device
    from fixbench.ui.bench.ratings_dialog import RatingsDialog

    kept = {"mains": "230 V", "output": "2 V", "current": "1 A"}
    device = add_device(store, make="Quillon", model="QX-9", kind="phone charger", label_ratings=kept)
    open_case(store, ticket_ref="BW-3004", device_id=device, technician_id=1, family_id="pwm_flyback",
              ratings=kept)
    bench.panels["cases"].refresh()
    seen = {}

    def answer():
        dialog = QApplication.activeModalWidget()
        if not isinstance(dialog, RatingsDialog):  # the resume runs off the GUI thread first
            QTimer.singleShot(50, answer)
            return
        dialog.resize(520, 360)
        seen["problem"] = dialog.problem.text()
        seen["output"] = dialog.fields["output"].text()
        shoot(dialog, tmp_path, "ratings-dialog")
        dialog.fields["output"].set_text("5 V")
        dialog._accept()

    QTimer.singleShot(50, answer)
    qtbot.keyClick(bench.panels["cases"].table, Qt.Key.Key_Return)
    qtbot.waitUntil(lambda: "output" in seen, timeout=5000)
    settle(qtbot, bench)
    assert seen["output"] == "2 V" and "reference of the TL431" in seen["problem"]
    assert bench.page == "cautions"
    assert bench.controller.view.case.ratings["output"] == "5 V"
