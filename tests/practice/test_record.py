"""A kept round as plain data, played again from it to open its debrief: the same readings and the
same score, or a plain word where the build cannot read it."""

from __future__ import annotations

import json

import pytest

from fixbench.practice.play import play_round
from fixbench.practice.record import RecordError, reopen, round_record, scenario_of
from fixbench.practice.scenario import Scenario

RATINGS = (("current", "2 A"), ("mains", "230 V"), ("output", "12 V"))
HARD_UNIT = Scenario("pwm_flyback", RATINGS, "C3.dried", (("C3", "dried"),), "hard", 31, True, "replay", "2024-05",
                     (("symptom_output_low", "yes"),))
ACTIONS = [("take", "series_lamp"), ("take", "mosfet_drain_source"), ("coach", ""), ("take", "bulk_discharged"),
           ("take", "output_cap_esr"), ("take", "output_board"), ("take", "output_board")]


def test_a_kept_round_opens_again_with_the_same_readings_and_score(flyback):
    played = play_round(flyback, HARD_UNIT, ACTIONS, "C3.dried", {"C3"})
    record = json.loads(json.dumps(round_record(played.practice)))  # as the store keeps it
    assert scenario_of(record) == HARD_UNIT
    again = reopen(flyback, record)
    assert again.same_readings
    assert again.played.debrief.score == played.debrief.score
    assert [s.reading for s in again.played.practice.steps] == [s.reading for s in played.practice.steps]
    assert len(again.played.practice.stops) == 1 and again.played.debrief.coach_looks == 1


def test_a_record_whose_readings_no_longer_come_out_the_same_says_so(flyback):
    played = play_round(flyback, HARD_UNIT, ACTIONS, "C3.dried", {"C3"})
    record = round_record(played.practice)
    record["readings"][0][1] = "no_flash"
    assert not reopen(flyback, record).same_readings


def test_a_record_of_another_version_or_family_is_refused_in_words(flyback, knowledge):
    record = round_record(play_round(flyback, HARD_UNIT, ACTIONS, "C3.dried", {"C3"}).practice)
    with pytest.raises(RecordError, match="family"):
        reopen(knowledge.family("self_oscillating"), record)
    with pytest.raises(RecordError, match="version"):
        scenario_of({**record, "version": 99})
