"""The practice workflow: a round kept under the workflow's clock, the next unit chosen where the
trainee is weakest on the days that clock gives, a kept round reopened, and every trainee's weak
faults and slips for the owner."""

from __future__ import annotations

from datetime import datetime

import pytest

from fixbench.knowledge import load_knowledge
from fixbench.practice.record import RecordError
from fixbench.store import open_store
from fixbench.store.people import add_practice_attempt, add_technician
from fixbench.workflows.practice import PracticeRounds, trainee_overviews


@pytest.fixture
def rounds(tmp_path):
    store = open_store(tmp_path / "t.sqlite")
    trainee = add_technician(store, "Ada Test", role="trainee")
    seeds = iter(range(20, 40))
    controller = PracticeRounds(store, load_knowledge(), seeds=lambda: next(seeds),
                                clock=lambda: datetime(2025, 6, 2, 9, 0))
    controller.trainee_id = trainee
    yield controller
    store.close()


def play_easy_start_resistor_wrong(rounds):
    rounds.start("pwm_flyback", "easy")  # seed 20: an open start resistor
    assert rounds.round.scenario.fault_id == "R1.open"
    rounds.round.take("bulk_discharged")  # units arrive charged: the discharge before the first hand on the primary
    rounds.round.take("start_resistor")
    rounds.commit("C3.dried", {"C3"})
    return rounds.finish(rounds.debrief_work()())


def test_a_round_is_kept_under_the_workflows_clock_with_what_it_taught(rounds):
    debrief = play_easy_start_resistor_wrong(rounds)
    (kept,) = rounds.attempts()
    assert kept.played_on == "2025-06-02" and kept.fault_right is False and not debrief.right
    assert kept.can_reopen and kept.attempt_id == rounds.attempt_id


def test_the_missed_fault_is_chosen_again_the_next_day(rounds):
    play_easy_start_resistor_wrong(rounds)
    assert rounds.next_for_trainee("easy").scenario.fault_id != "R1.open"  # the same day: not yet
    rounds.clock = lambda: datetime(2025, 6, 3, 9, 0)
    chosen = rounds.next_for_trainee("easy")
    assert chosen.scenario.fault_id == "R1.open" and rounds.round.scenario is chosen.scenario
    assert rounds.chosen_why == "a fault you missed before, due again"


def test_a_kept_round_reopens_with_the_same_debrief(rounds):
    debrief = play_easy_start_resistor_wrong(rounds)
    reopened = rounds.reopen_work(rounds.attempt_id)()
    assert reopened.same_readings and reopened.played.debrief.score == debrief.score


def test_a_round_kept_before_records_cannot_be_reopened_and_says_why(rounds):
    old = add_practice_attempt(rounds.store, trainee_id=rounds.trainee_id, scenario="drawn:easy:pwm_flyback:R1.open:s1",
                               checks_used=1, minutes=2, score=90, safety_slips=0)
    with pytest.raises(RecordError, match="kept before debriefs were"):
        rounds.reopen_work(old)()


def test_the_owner_sees_each_trainees_faults_missed_and_slips_by_kind(rounds):
    play_easy_start_resistor_wrong(rounds)
    rounds.start("pwm_flyback", "easy")
    rounds.round.take("series_lamp")
    rounds.round.take("start_resistor")  # stopped: the bulk capacitor was not confirmed discharged
    rounds.commit("R1.open", {"R1"})
    rounds.finish(rounds.debrief_work()())
    (ada,) = trainee_overviews(rounds.store, rounds.knowledge)
    assert ada.summary.rounds == 2
    assert ada.weak_faults[0].endswith("(missed 1 of 1)")
    assert ada.slips == ("primary touched before the discharge check: 1",)
