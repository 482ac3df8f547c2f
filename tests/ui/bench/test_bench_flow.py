"""Complete cases typed through the real bench window, from intake to a closed case.

The unit on the bench is the engine's own simulated faulty unit (fixbench.engine.simulate): the
test reads the value the step card asks for off that unit and types it, as a technician reads a
meter. Assertions are on what the window shows and on what the store holds afterwards.
"""

from __future__ import annotations

from PySide6.QtCore import Qt, QTimer
from PySide6.QtWidgets import QApplication
from sqlalchemy import select

from fixbench.engine import simulate_readings
from fixbench.engine.hypotheses import NO_FAULT
from fixbench.knowledge import load_knowledge
from fixbench.physics.ratings import parse_ratings
from fixbench.store.models import (Case, CautionAcknowledgement, ReadingRow, RepairAction, SkippedCheck,
                                   Verification, WithdrawnReading)
from tests.ui.bench.conftest import (acknowledge, fill_intake, open_intake, settle, shoot,
                                     type_into, type_reading)

CHARGER = {"mains": "230 V", "output": "5 V", "current": "2 A"}
ALT, CTRL = Qt.KeyboardModifier.AltModifier, Qt.KeyboardModifier.ControlModifier


def _unit(family_id: str, fault: str, ratings=CHARGER) -> dict[str, str]:
    family = load_knowledge().family(family_id)
    return simulate_readings(family, parse_ratings(ratings), fault, seed=1, noise=False)


def follow_steps(qtbot, bench, unit: dict[str, str]) -> list[tuple[str, str, str, str]]:
    """Type the unit's reading for every step the card proposes, until the checks are done.
    Returns (title, expected shown, reading typed, mark shown) per step."""
    card = bench.panels["guided"].card
    seen = []
    for _ in range(40):
        if not card.field.isEnabled():
            return seen
        check_id = bench.controller.current_check_id()
        title, expected = card.title.text(), card.expected.text()
        type_reading(qtbot, bench, unit[check_id])
        seen.append((title, expected, unit[check_id], card.mark_label.text()))
    raise AssertionError(f"the checks did not end: {seen}")


def repair_and_verify(qtbot, bench, family_id: str, value: str, cost: str, tmp_path, name: str,
                      ratings=CHARGER) -> None:
    card = bench.panels["guided"].card
    qtbot.keyClick(card, Qt.Key.Key_R, ALT)  # Conclusion and repair
    assert bench.page == "repair"
    shoot(bench.window(), tmp_path, f"{name}-repair")
    repair = bench.panels["repair"]
    type_into(qtbot, repair.value.edit, value)
    assert repair.cost.edit.hasFocus()  # Enter moved on to the cost
    type_into(qtbot, repair.cost.edit, cost)
    settle(qtbot, bench)
    assert repair.done_list.count() == 1
    qtbot.keyClick(repair.value.edit, Qt.Key.Key_V, ALT)  # Go to verification
    assert bench.page == "verify"
    healthy = _unit(family_id, NO_FAULT, ratings)
    verify = bench.panels["verify"]
    shoot(bench.window(), tmp_path, f"{name}-verify")
    if ratings == CHARGER:  # how to prove it, with the unit's own figures: R = V / I, P = V * I
        assert "2.5 ohm resistor rated 10 W" in verify.how_label.text()
        assert "40 W incandescent lamp" in verify.how_label.text()
    for step in bench.controller.view.conclusion.verify:
        assert verify.title.text() == step.title
        type_into(qtbot, verify.field.edit, healthy[step.check])
        settle(qtbot, bench)
        assert verify.result.text().startswith("\u2714"), verify.result.text()
    assert verify.title.text() == "Every verification reading is as a good unit reads"
    qtbot.keyClick(verify, Qt.Key.Key_L, ALT)  # Close the case
    assert bench.page == "close"
    shoot(bench.window(), tmp_path, f"{name}-close")


def close_with(qtbot, bench, minutes: str) -> None:
    close = bench.panels["close"]
    type_into(qtbot, close.minutes.edit, minutes)
    settle(qtbot, bench)
    assert bench.page == "cases"


def _case(store, ticket):
    with store.session() as session:
        case = session.scalar(select(Case).where(Case.ticket_ref == ticket))
        readings = session.scalars(select(ReadingRow).where(ReadingRow.case_id == case.id)).all()
        repairs = session.scalars(select(RepairAction).where(RepairAction.case_id == case.id)).all()
        verifications = session.scalars(select(Verification).where(Verification.case_id == case.id)).all()
        ack = session.get(CautionAcknowledgement, case.id)
        return case, readings, repairs, verifications, ack


def test_dried_vcc_capacitor_found_repaired_and_closed(qtbot, bench, store, tmp_path):
    shoot(bench.window(), tmp_path, "c1-open-cases")
    intake = fill_intake(qtbot, bench, ticket="BW-1001", make="Quillon", model="QX-5",
                         family="pwm_flyback", ratings=CHARGER, symptoms=("symptom_ticking",))
    shoot(bench.window(), tmp_path, "c1-intake")
    open_intake(qtbot, bench, intake)
    shoot(bench.window(), tmp_path, "c1-cautions")
    acknowledge(qtbot, bench)
    guided = bench.panels["guided"]
    shoot(bench.window(), tmp_path, "c1-guided")

    steps = follow_steps(qtbot, bench, _unit("pwm_flyback", "C2.dried"))

    by_title = {title: (expected, typed, mark) for title, expected, typed, mark in steps}
    # The healthy Vcc capacitor of this charger: 22 uF (knowledge file, pwm_flyback), band +/-20 %
    # widened by the capacitance range's own 3 % (cold network).
    expected, typed, mark = by_title["Vcc capacitor capacitance"]
    assert expected == "22 uF"
    assert "OUT OF BAND" in mark and "17.1 uF to 27.2 uF" in mark
    assert "in band" in by_title["Output rectifier"][2]
    assert guided.top_suspect.text().startswith("Top suspect: <b>Vcc capacitor dried out</b>")
    assert guided.suspects_model.top().part == "C2"
    assert guided.card.title.text() == "The checks are done: the conclusion is ready"
    assert guided.picture.chances["startup"] > 0.9  # the stage holding C2 is the one shaded
    shoot(bench.window(), tmp_path, "c1-done")

    repair_and_verify(qtbot, bench, "pwm_flyback", "22 uF 50 V", "0.45", tmp_path, "c1")
    assert "Vcc capacitor dried out" in bench.panels["close"].fault.currentText()
    close_with(qtbot, bench, "25")

    case, readings, repairs, verifications, ack = _case(store, "BW-1001")
    assert (case.status, case.outcome, case.confirmed_fault, case.confirmed_part) == (
        "closed", "repaired", "C2.dried", "C2")
    assert case.bench_minutes == 25 and case.confirmed_stage == "startup"
    assert [r.check_id for r in readings][0] == "symptom_ticking"
    assert len(readings) == len(steps) + 1
    assert [(r.part_id, r.action, r.parts_cost_cents, r.value_fitted, r.test_passed, r.note)
            for r in repairs] == [("C2", "replaced", 45, "22 uF 50 V", None, "")]
    assert verifications and all(v.passed for v in verifications)
    assert ack is not None
    assert "BW-1001" not in [bench.panels["cases"].model.data(bench.panels["cases"].model.index(r, 0))
                             for r in range(bench.panels["cases"].model.rowCount())]


def test_shorted_mosfet_with_undo_skip_and_another_check(qtbot, bench, store, tmp_path):
    intake = fill_intake(qtbot, bench, ticket="BW-1002", make="Tamsin", model="TC-12",
                         family="pwm_flyback", ratings={"mains": "universal", "bench_mains": "230 V",
                                                        "output": "12 V", "current": "1.5 A"},
                         symptoms=("symptom_dead",))
    open_intake(qtbot, bench, intake)
    acknowledge(qtbot, bench)
    adapter = {"mains": "universal", "output": "12 V", "current": "1.5 A"}
    unit = _unit("pwm_flyback", "Q1.short", adapter)
    guided, card = bench.panels["guided"], bench.panels["guided"].card

    # A slip: the opposite answer, marked at once, then taken back with Ctrl+Z.
    first_title = card.title.text()
    first = bench.controller.current_check_id()
    wrong = "yes" if unit[first] == "no" else "no"
    type_reading(qtbot, bench, wrong)
    assert guided.readings.count() == 2
    qtbot.keyClick(card.field.edit, Qt.Key.Key_Z, CTRL)
    settle(qtbot, bench)
    assert guided.readings.count() == 1
    assert card.title.text() == first_title
    assert bench.status.text().startswith("Undone:")

    # Take another check off the searchable list: the fuse, from its name.
    def pick():
        finder = QApplication.activeModalWidget()
        qtbot.keyClicks(finder.filter, "fuse resist")
        assert finder.matching() == ["fuse_resistance"]
        qtbot.keyClick(finder.filter, Qt.Key.Key_Return)

    QTimer.singleShot(50, pick)
    qtbot.keyClick(card.field.edit, Qt.Key.Key_F, CTRL)
    assert card.title.text() == "Fuse resistance"
    type_reading(qtbot, bench, unit["fuse_resistance"])
    assert "OUT OF BAND" in card.mark_label.text()  # the fuse of a shorted MOSFET is open

    # One step cannot be made on this unit.
    skipped_title = card.title.text()
    skipped_check = bench.controller.current_check_id()
    qtbot.keyClick(card.field.edit, Qt.Key.Key_C, ALT)
    settle(qtbot, bench)
    assert card.title.text() != skipped_title

    steps = follow_steps(qtbot, bench, unit)
    assert steps
    assert guided.suspects_model.top().fault == "Q1.short"
    assert "Switching MOSFET shorted" in guided.top_suspect.text()
    conclusion = bench.controller.view.conclusion
    assert conclusion.test_before_power  # a shorted MOSFET takes others with it
    repair_and_verify(qtbot, bench, "pwm_flyback", "650 V 4 A MOSFET", "1.20", tmp_path, "c2", adapter)
    assert "cost 1.20" in bench.panels["repair"].done_list.item(0).text()
    close_with(qtbot, bench, "40")

    case, readings, repairs, verifications, _ack = _case(store, "BW-1002")
    assert (case.status, case.outcome, case.confirmed_fault) == ("closed", "repaired", "Q1.short")
    with store.session() as session:
        withdrawn = session.scalars(select(WithdrawnReading.reading_id)).all()
        skipped = session.scalars(select(SkippedCheck.check_id)).all()
    assert len(withdrawn) == 1 and skipped == [skipped_check]
    assert {r.check_id for r in readings if r.id in withdrawn} == {first}
    assert repairs[0].parts_cost_cents == 120 and case.ratings["mains"] == "universal"


def test_open_base_resistor_in_a_self_oscillating_charger(qtbot, bench, store, tmp_path):
    intake = fill_intake(qtbot, bench, ticket="BW-1003", make="Orrin", model="OR-1A",
                         family="self_oscillating", ratings=CHARGER, symptoms=("symptom_dead",))
    open_intake(qtbot, bench, intake)
    acknowledge(qtbot, bench)
    steps = follow_steps(qtbot, bench, _unit("self_oscillating", "R1.open"))
    guided = bench.panels["guided"]
    shoot(bench.window(), tmp_path, "c3-done")
    titles = [title for title, *_ in steps]
    assert titles[0] == "Fuse blackened or visibly blown"
    assert any("OUT OF BAND" in mark and typed == "OL" for _t, _e, typed, mark in steps)
    assert guided.suspects_model.top().fault == "R1.open"
    repair_and_verify(qtbot, bench, "self_oscillating", "2.2 Mohm 1/4 W", "0.05", tmp_path, "c3")
    close_with(qtbot, bench, "18")
    case, *_rest = _case(store, "BW-1003")
    assert (case.status, case.confirmed_fault, case.family_id) == ("closed", "R1.open", "self_oscillating")
