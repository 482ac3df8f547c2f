"""A trainee's rounds from pick to debrief, driven through the real screen offscreen.

Round one replays a closed case of the shop (a shorted switch whose fuse is still good) and the
trainee puts plain mains on it before the series lamp: the debrief must report the slip and why.
Round two is a new unit with an open start resistor, played carefully with the coach on.
"""

from __future__ import annotations

from datetime import datetime

import pytest
from PySide6.QtCore import Qt

from fixbench.quantities import parse_quantity
from fixbench.store import open_store
from fixbench.store.cases import close_case, open_case
from fixbench.store.people import add_device, add_technician
from fixbench.ui.context import AppContext
from fixbench.ui.practice.screen import PracticeScreen
from fixbench.workflows.practice import PracticeRounds, kept_attempts

SEEDS = [2, 20]  # replay seed 2: no collateral fuse; new-unit seed 20 on easy: an open start resistor


@pytest.fixture
def shop(tmp_path):
    store = open_store(tmp_path / "t.sqlite")
    trainee = add_technician(store, "Ada Test", role="trainee")
    tech = add_technician(store, "Cy Bench")
    device = add_device(store, make="Northwind", model="NW-12", kind="adapter", label_ratings={"output": "12 V"})
    case = open_case(store, ticket_ref="T-100", device_id=device, technician_id=tech, family_id="pwm_flyback",
                     ratings={"mains": "230 V", "output": "12 V", "current": "2 A"}, customer_ref="Mr Sample")
    close_case(store, case, outcome="repaired", bench_minutes=40, confirmed_fault="Q1.short",
               closed_at=datetime(2024, 5, 14))
    return store, trainee


@pytest.fixture
def screen(qtbot, shop):
    store, trainee = shop
    seeds = iter(SEEDS)
    context = AppContext(store, technician_id=trainee)
    widget = PracticeScreen(context, PracticeRounds(store, context.knowledge, seeds=lambda: next(seeds)))
    qtbot.addWidget(widget)
    widget.resize(1366, 768)
    widget.show()
    return widget


def snap(widget, tmp_path, name):
    widget.grab().save(str(tmp_path / f"{name}.png"))


def take(qtbot, screen, words, check_id):
    view = screen.round_view
    view.search.clear()
    qtbot.keyClicks(view.search, words)
    view.choose_check(check_id)
    assert view.step.card.title.text() == screen.controller.round.family.check(check_id).title
    qtbot.mouseClick(view.step.card.record_button, Qt.MouseButton.LeftButton)


def commit(qtbot, screen, fault_id, parts):
    view = screen.round_view
    view.choose_fault(fault_id)
    view.tick_parts(parts)
    qtbot.mouseClick(view.commit_button, Qt.MouseButton.LeftButton)
    qtbot.waitUntil(lambda: screen.pages.currentWidget() is screen.debrief_view, timeout=20000)


def test_two_rounds_from_pick_to_debrief_one_with_a_safety_slip(qtbot, screen, shop, tmp_path):
    store, trainee = shop
    pick = screen.pick
    assert pick.trainee.currentText() == "Ada Test"
    assert pick.cases.count() == 1
    case_line = pick.cases.item(0).text()
    assert "2024-05" in case_line and "T-100" not in case_line and "Mr Sample" not in case_line
    snap(screen, tmp_path, "1_pick")

    # Round one: the replayed case, plain mains before the lamp.
    pick.level.setCurrentIndex(pick.level.findData("normal"))
    qtbot.mouseClick(pick.replay_button, Qt.MouseButton.LeftButton)
    assert screen.pages.currentWidget() is screen.round_view
    assert "F1" not in screen.controller.round.scenario.failed_parts()  # the premise: the fuse is good
    assert "closed case" in screen.round_view.unit_label.text()
    take(qtbot, screen, "bulk", "bulk_voltage")
    assert screen.round_view.clock_label.text() == "Clock: 2 min"
    assert "the fuse has blown" in screen.round_view.event.text()  # the bang is heard at once
    snap(screen, tmp_path, "2_round_after_mains")
    take(qtbot, screen, "lamp", "series_lamp")
    take(qtbot, screen, "discharged", "bulk_discharged")
    take(qtbot, screen, "mosfet", "mosfet_drain_source")
    take(qtbot, screen, "fuse", "fuse_resistance")
    model = screen.round_view.steps_model
    assert model.rowCount() == 5
    assert model.index(4, 2).data() == "OL"  # the fuse the trainee blew reads open
    commit(qtbot, screen, "Q1.short", {"Q1", "F1"})
    text = screen.debrief_view.text()
    snap(screen, tmp_path, "3_debrief_slip")
    assert text.startswith("Right")
    assert "Safety slips" in text
    assert "Step 1: Plain mains on a unit with a shorted primary: the fuse blew again." in text
    assert "Why it is dangerous" in text and "series lamp" in text
    assert "Keep practising" in text and "capped by a safety slip" in text
    assert "Your path and the engine's" in text
    assert "Kept in Ada Test's progress." == screen.debrief_view.saved.text()

    # Round two: a new unit on easy, played with the coach.
    qtbot.mouseClick(screen.debrief_view.again_button, Qt.MouseButton.LeftButton)
    pick.family.setCurrentIndex(pick.family.findData("pwm_flyback"))
    pick.level.setCurrentIndex(pick.level.findData("easy"))
    qtbot.mouseClick(pick.start_button, Qt.MouseButton.LeftButton)
    screen.round_view.coach_box.setChecked(True)
    assert screen.round_view.coach_list.count() == 5
    take(qtbot, screen, "dead", "symptom_dead")
    take(qtbot, screen, "lamp", "series_lamp")
    take(qtbot, screen, "discharged", "bulk_discharged")
    take(qtbot, screen, "start", "start_resistor")
    # In circuit an open start-up resistor reads only the junction leakage behind it: megohms on
    # the top range, far above its band (cold network).
    assert parse_quantity(screen.round_view.steps_model.index(3, 2).data(), "ohm").value > 5e6
    assert "Start" in screen.round_view.coach_list.item(0).text() or "R1" in screen.round_view.coach_list.item(0).text()
    snap(screen, tmp_path, "4_round_coach")
    commit(qtbot, screen, "R1.open", {"R1"})
    text = screen.debrief_view.text()
    snap(screen, tmp_path, "5_debrief_clean")
    assert text.startswith("Right")
    assert "Safety slips" not in text
    assert "Coach asked" in text
    assert "Checks that told the most" in text and "Start" in text.split("Checks that told the most")[1]

    attempts = kept_attempts(store, trainee)
    assert [a.safety_slips for a in attempts] == [1, 0]
    assert attempts[0].scenario.startswith("replay:normal:pwm_flyback:Q1.short")
    assert attempts[0].band == "Keep practising"
    assert attempts[0].fuse_blown and not attempts[0].coach_used
    assert attempts[1].coach_used and not attempts[1].fuse_blown and attempts[1].level == "easy"
    assert all(len(a.scenario.split(":")) == 5 for a in attempts)  # the scenario id, no marks
    assert attempts[1].score > attempts[0].score

    screen.tabs.setCurrentWidget(screen.progress_view)
    assert screen.progress_view.attempts_model.rowCount() == 2
    assert "2 rounds" in screen.progress_view.summary.text()
    bands = [screen.progress_view.attempts_model.index(r, 5).data() for r in range(2)]
    assert bands == ["Bench-ready", "Keep practising"]  # newest first
    assert [screen.progress_view.attempts_model.index(r, 7).data() for r in range(2)] == ["yes", ""]
    snap(screen, tmp_path, "6_progress")


def test_the_owner_sees_every_trainee_after_the_passphrase(qtbot, screen, shop, tmp_path):
    from fixbench.store.owner import set_owner_passphrase

    store, _ = shop
    add_technician(store, "Bo Test", role="trainee")
    set_owner_passphrase(store, "workshop-owner-1")
    view = screen.progress_view
    screen.tabs.setCurrentWidget(view)
    qtbot.keyClicks(view.passphrase, "wrong guess")
    qtbot.mouseClick(view.unlock_button, Qt.MouseButton.LeftButton)
    qtbot.waitUntil(lambda: "not accepted" in view.owner_message.text(), timeout=10000)
    assert not view.trainees.isVisible()
    view.passphrase.clear()
    qtbot.keyClicks(view.passphrase, "workshop-owner-1")
    qtbot.mouseClick(view.unlock_button, Qt.MouseButton.LeftButton)
    qtbot.waitUntil(view.trainees.isVisible, timeout=10000)
    names = [view.trainees_model.index(r, 0).data() for r in range(view.trainees_model.rowCount())]
    assert names == ["Ada Test", "Bo Test"]
    snap(screen, tmp_path, "7_owner")
