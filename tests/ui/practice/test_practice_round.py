"""A trainee's rounds from pick to debrief, driven through the real screen offscreen.

Round one replays a closed case of the shop (a shorted switch whose fuse is still good) and the
trainee puts plain mains on it before the series lamp: the fuse blows, the round stops with the
bang, and the debrief reports the slip and why. Round two is a new unit with an open start
resistor, played carefully with the coach on, which costs points and the top band.
"""

from __future__ import annotations

import re
from datetime import datetime

import pytest
from PySide6.QtCore import Qt

from fixbench.quantities import parse_quantity
from fixbench.store.customers import find_or_add_customer
from fixbench.store import open_store
from fixbench.store.cases import add_reading, close_case, open_case
from fixbench.store.people import add_device, add_technician
from fixbench.ui.context import AppContext
from fixbench.ui.practice.screen import PracticeScreen
from fixbench.workflows.practice import PracticeRounds, kept_attempts

SEEDS = [2, 20, 21, 22, 23]  # replay seed 2: no collateral fuse; new-unit seed 20 on easy: an open start resistor
NOW = datetime(2025, 6, 2, 9, 30)


def close_a_case(store, device, tech, ticket, fault, when, told=()):
    case = open_case(store, ticket_ref=ticket, device_id=device, technician_id=tech, family_id="pwm_flyback",
                     ratings={"mains": "230 V", "output": "12 V", "current": "2 A"},
                     customer_id=find_or_add_customer(store, "Mr Sample"))
    for check_id, typed in told:
        add_reading(store, case, check_id=check_id, typed=typed, value=None, unit=None, outcome=typed, suspects=())
    close_case(store, case, outcome="repaired", bench_minutes=40, confirmed_fault=fault, closed_at=when)


@pytest.fixture
def shop(tmp_path):
    store = open_store(tmp_path / "t.sqlite")
    trainee = add_technician(store, "Ada Test", role="trainee")
    tech = add_technician(store, "Cy Bench")
    device = add_device(store, make="Northwind", model="NW-12", kind="adapter", label_ratings={"output": "12 V"})
    close_a_case(store, device, tech, "T-100", "Q1.short", datetime(2024, 5, 14))
    return store, trainee


def practice_screen(qtbot, shop, seeds):
    store, trainee = shop
    seeds = iter(seeds)
    context = AppContext(store, technician_id=trainee)
    widget = PracticeScreen(context, PracticeRounds(store, context.knowledge, seeds=lambda: next(seeds),
                                                    clock=lambda: NOW))
    qtbot.addWidget(widget)
    widget.resize(1366, 768)
    widget.show()
    return widget


@pytest.fixture
def screen(qtbot, shop):
    return practice_screen(qtbot, shop, SEEDS)


@pytest.fixture
def new_unit_screen(qtbot, shop):
    """The first new unit on easy hides an open start resistor (seed 20)."""
    return practice_screen(qtbot, shop, SEEDS[1:])


def snap(widget, tmp_path, name):
    widget.grab().save(str(tmp_path / f"{name}.png"))


def take(qtbot, screen, words, check_id):
    view = screen.round_view
    view.search.clear()
    qtbot.keyClicks(view.search, words)
    view.choose_check(check_id)
    assert view.step.card.title.text() == screen.controller.round.family.check(check_id).title
    qtbot.mouseClick(view.step.card.record_button, Qt.MouseButton.LeftButton)


def carry_on(qtbot, screen):
    assert screen.round_view.stopped
    qtbot.mouseClick(screen.round_view.alert.carry_on, Qt.MouseButton.LeftButton)
    assert not screen.round_view.stopped


def commit(qtbot, screen, fault_id, parts):
    view = screen.round_view
    view.choose_fault(fault_id)
    view.tick_parts(parts)
    qtbot.mouseClick(view.commit_button, Qt.MouseButton.LeftButton)
    qtbot.waitUntil(lambda: screen.pages.currentWidget() is screen.debrief_view, timeout=20000)


def start_new(qtbot, screen, level_id="easy"):
    pick = screen.pick
    pick.family.setCurrentIndex(pick.family.findData("pwm_flyback"))
    pick.level.setCurrentIndex(pick.level.findData(level_id))
    qtbot.mouseClick(pick.start_button, Qt.MouseButton.LeftButton)


def test_two_rounds_from_pick_to_debrief_one_with_a_safety_slip(qtbot, screen, shop, tmp_path):
    store, trainee = shop
    pick = screen.pick
    assert pick.trainee.currentText() == "Ada Test"
    assert pick.cases_model.rowCount() == 1
    line = " ".join(pick.cases_model.index(0, c).data() for c in range(4))
    assert "2024-05" in line and "T-100" not in line and "Mr Sample" not in line and "Q1" not in line
    snap(screen, tmp_path, "1_pick")

    # Round one: the replayed case, plain mains before the lamp.
    pick.level.setCurrentIndex(pick.level.findData("normal"))
    assert "Damage:" in pick.level_changes.text() and "complaint" in pick.level_changes.text()
    qtbot.mouseClick(pick.replay_button, Qt.MouseButton.LeftButton)
    assert screen.pages.currentWidget() is screen.round_view
    assert "F1" not in screen.controller.round.scenario.failed_parts()  # the premise: the fuse is good
    assert "closed case" in screen.round_view.unit_label.text()
    assert screen.round_view.complaint.text().startswith("<b>The customer says:</b>")
    take(qtbot, screen, "bulk", "bulk_voltage")
    assert screen.round_view.clock_label.text() == "Clock: 2 min"
    assert "The fuse has blown" in screen.round_view.alert.text()  # the bang is heard at once
    assert not screen.round_view.step.card.record_button.isEnabled()  # the round waits
    snap(screen, tmp_path, "2_round_after_mains")
    carry_on(qtbot, screen)
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
    assert text.count("Plain mains on a unit with a shorted primary: the fuse blew again.") == 1
    assert "Why it is dangerous" in text and "series lamp" in text
    assert "Keep practising" in text and "held down by a safety slip" in text
    assert "Your steps, and the engine's choice at each" in text and "The engine's own path" in text
    assert "Kept in Ada Test's progress." == screen.debrief_view.saved.text()

    # Round two: a new unit on easy, played with the coach.
    qtbot.mouseClick(screen.debrief_view.again_button, Qt.MouseButton.LeftButton)
    start_new(qtbot, screen, "easy")
    screen.round_view.coach_box.setChecked(True)
    assert screen.round_view.coach_list.count() == 5
    take(qtbot, screen, "lamp", "series_lamp")
    take(qtbot, screen, "discharged", "bulk_discharged")
    take(qtbot, screen, "start", "start_resistor")
    # In circuit an open start-up resistor reads only the junction leakage behind it: megohms on
    # the top range, far above its band (cold network).
    assert parse_quantity(screen.round_view.steps_model.index(2, 2).data(), "ohm").value > 5e6
    assert "Start" in screen.round_view.coach_list.item(0).text() or "R1" in screen.round_view.coach_list.item(0).text()
    snap(screen, tmp_path, "4_round_coach")
    commit(qtbot, screen, "R1.open", {"R1"})
    text = screen.debrief_view.text()
    snap(screen, tmp_path, "5_debrief_clean")
    assert text.startswith("Right")
    assert "Safety slips" not in text
    assert "Coach asked" in text and "the coach (" in text and "held down by the coach" in text
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
    model = screen.progress_view.attempts_model
    columns = [model.headerData(c, Qt.Orientation.Horizontal) for c in range(model.columnCount())]
    assert columns[:5] == ["Date", "Level", "Family", "Fault", "Verdict"]
    rows = [[model.index(r, c).data() for c in range(model.columnCount())] for r in range(2)]
    assert [r[7] for r in rows] == ["Nearly there", "Keep practising"]  # newest first
    assert rows[0][0] == attempts[1].played_on == "2025-06-02"
    assert rows[1][3] == "Switching MOSFET shorted" and rows[1][4] == "right"
    assert [r[9] for r in rows] == ["yes", ""]
    snap(screen, tmp_path, "6_progress")


def test_browsing_the_fault_list_ticks_nothing(qtbot, new_unit_screen):
    screen = new_unit_screen
    start_new(qtbot, screen, "normal")
    box = screen.round_view.diagnosis
    assert box.fault.currentData() is None and box.fault.currentText() == "Choose the fault\u2026"
    box.fault.setFocus()
    for _ in range(box.fault.count()):  # arrow down through every fault, as a trainee scrolls
        qtbot.keyClick(box.fault, Qt.Key.Key_Down)
    assert box.fault.currentIndex() == box.fault.count() - 1
    assert box.ticked_parts() == set()
    qtbot.mouseClick(box.commit_button, Qt.MouseButton.LeftButton)  # a fault chosen, no part: allowed
    qtbot.waitUntil(lambda: screen.pages.currentWidget() is screen.debrief_view, timeout=20000)
    assert "replaced needlessly" not in screen.debrief_view.text()


def test_committing_without_a_fault_asks_for_one(qtbot, new_unit_screen):
    screen = new_unit_screen
    start_new(qtbot, screen)
    qtbot.mouseClick(screen.round_view.commit_button, Qt.MouseButton.LeftButton)
    assert screen.round_view.message.text() == "\u26a0 Choose the fault first."
    assert screen.pages.currentWidget() is screen.round_view


def test_a_missed_discharge_stops_the_round_once_with_an_alert(qtbot, new_unit_screen, tmp_path):
    screen = new_unit_screen
    start_new(qtbot, screen, "easy")
    take(qtbot, screen, "lamp", "series_lamp")
    take(qtbot, screen, "start", "start_resistor")
    view = screen.round_view
    assert view.alert.frame.isVisible() and "Stop! Hands off the primary" in view.alert.text()
    assert "The check was not taken" in view.alert.text()
    assert view.steps_model.rowCount() == 1 and view.clock_label.text() == "Clock: 3 min"
    assert not view.catalogue.isEnabled() and not view.step.card.record_button.isEnabled()
    snap(screen, tmp_path, "stopped")
    carry_on(qtbot, screen)
    take(qtbot, screen, "start", "start_resistor")  # the same mistake again
    assert "counts once" in view.alert.text()
    carry_on(qtbot, screen)
    take(qtbot, screen, "discharged", "bulk_discharged")
    take(qtbot, screen, "start", "start_resistor")
    assert not view.stopped and view.steps_model.rowCount() == 3
    commit(qtbot, screen, "R1.open", {"R1"})
    text = screen.debrief_view.text()
    assert "safety (10: 1 mistake)" in text and "A colleague stopped you twice" in text
    assert text.count("Why it is dangerous") == 1


def test_a_wrong_verdicts_debrief_names_the_contradicting_reading(qtbot, new_unit_screen, tmp_path):
    screen = new_unit_screen
    start_new(qtbot, screen, "easy")  # an open start resistor (seed 20)
    take(qtbot, screen, "bulk", "bulk_discharged")  # units arrive charged: discharge before the primary
    take(qtbot, screen, "start", "start_resistor")
    commit(qtbot, screen, "C3.dried", {"C3"})
    text = screen.debrief_view.text()
    snap(screen, tmp_path, "debrief_wrong")
    assert text.startswith("Wrong: Start-up resistor open")
    c = screen.controller.debrief.contradiction
    assert (c.where, c.check_title) == ("Step 2", "Start-up resistor") and c.would_read.startswith("about ")
    assert (f"What said otherwise: Step 2, Start-up resistor, read {c.reading}. With your verdict it would "
            f"read {c.would_read} (a healthy unit: {c.healthy}).") in text
    assert not re.search(r"\bbits?\b", text)
    assert not [f for f in ("R1.open", "C3.dried", "no_fault") if f in text]  # no internal fault ids


def test_the_replay_list_tells_cases_apart_without_giving_the_fault_away(qtbot, shop, screen):
    store, _ = shop
    tech, device = 2, 1
    close_a_case(store, device, tech, "T-101", "C3.dried", datetime(2024, 6, 3),
                 (("symptom_output_low", "yes"), ("symptom_dead", "no")))
    close_a_case(store, device, tech, "T-102", "W1.open", datetime(2024, 6, 9), (("symptom_intermittent", "y"),))
    screen.refresh()
    model = screen.pick.cases_model
    said = [model.index(r, 3).data() for r in range(model.rowCount())]
    assert said == ["Works on and off, or when the cable is moved", "Device charges slowly or output reads low",
                    "not kept"]
    assert [model.index(r, 0).data() for r in range(3)] == ["2024-06", "2024-06", "2024-05"]
    screen.pick.cases.selectRow(1)
    qtbot.mouseClick(screen.pick.replay_button, Qt.MouseButton.LeftButton)
    assert "Device charges slowly or output reads low" in screen.round_view.complaint.text()


def test_a_past_debrief_opens_again_from_progress(qtbot, new_unit_screen):
    screen = new_unit_screen
    start_new(qtbot, screen, "easy")
    take(qtbot, screen, "bulk", "bulk_discharged")
    take(qtbot, screen, "start", "start_resistor")
    commit(qtbot, screen, "R1.open", {"R1"})
    first = screen.debrief_view.text()
    qtbot.mouseClick(screen.debrief_view.again_button, Qt.MouseButton.LeftButton)
    screen.tabs.setCurrentWidget(screen.progress_view)
    screen.progress_view.attempts.selectRow(0)
    qtbot.mouseClick(screen.progress_view.reopen_button, Qt.MouseButton.LeftButton)
    qtbot.waitUntil(lambda: screen.pages.currentWidget() is screen.debrief_view
                    and screen.tabs.currentIndex() == 0, timeout=20000)
    assert screen.debrief_view.saved.text() == "Opened again from the kept round."
    assert screen.debrief_view.text() == first


def test_the_next_unit_is_drawn_where_the_trainee_is_weakest(qtbot, new_unit_screen):
    screen = new_unit_screen
    start_new(qtbot, screen, "easy")  # an open start resistor, named wrong
    commit(qtbot, screen, "C3.dried", {"C3"})
    qtbot.mouseClick(screen.debrief_view.again_button, Qt.MouseButton.LeftButton)
    screen.controller.clock = lambda: datetime(2025, 6, 3, 9, 0)  # the next day: the missed fault is due
    qtbot.mouseClick(screen.pick.next_button, Qt.MouseButton.LeftButton)
    assert screen.controller.round.scenario.fault_id == "R1.open"
    assert "Chosen for you: a fault you missed before, due again" in screen.round_view.complaint.text()


def test_the_owner_sees_every_trainee_with_faults_missed_and_slips(qtbot, new_unit_screen, shop, tmp_path):
    screen = new_unit_screen
    from fixbench.store.owner import set_owner_passphrase

    store, _ = shop
    add_technician(store, "Bo Test", role="trainee")
    start_new(qtbot, screen, "easy")
    take(qtbot, screen, "lamp", "series_lamp")
    take(qtbot, screen, "start", "start_resistor")
    carry_on(qtbot, screen)
    commit(qtbot, screen, "C3.dried", {"C3"})
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
    model = view.trainees_model
    rows = [[model.index(r, c).data() for c in range(model.columnCount())] for r in range(model.rowCount())]
    assert [r[0] for r in rows] == ["Ada Test", "Bo Test"]
    assert rows[0][5] == "Start-up resistor open (missed 1 of 1)"
    assert rows[0][6] == "primary touched before the discharge check: 1"
    assert rows[1][5:] == ["-", "-"]
    snap(screen, tmp_path, "7_owner")
