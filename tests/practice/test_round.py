"""A practice round: the complaint, readings of the hidden unit, the clock, safety slips that stop
the round (each mistake counted once) and the coach."""

from __future__ import annotations

import pytest

from fixbench.practice.round import PracticeRound, RoundError, Step, Stop
from fixbench.practice.safety import MAINS_ON_SHORT, MAINS_UNPROVEN, UNDISCHARGED
from fixbench.practice.scenario import Scenario

RATINGS = (("current", "2 A"), ("mains", "230 V"), ("output", "12 V"))


def shorted_switch(level="normal"):
    """A shorted MOSFET whose fuse is still good: plain mains will blow it."""
    return Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"),), level, 3, False)


def dried_output_cap():
    return Scenario("pwm_flyback", RATINGS, "C3.dried", (("C3", "dried"),), "easy", 4, False)


def test_the_round_opens_with_the_customers_complaint_already_heard(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    asked = [c for c, _ in practice.complaint]
    assert asked == [c.id for c in flyback.checks if c.instrument == "question"]
    assert [r.check for r in practice.opening.readings] == asked
    again = practice.take("symptom_dead")  # the customer tells the same story again, at no cost
    assert again.reading == dict(practice.complaint)["symptom_dead"].text and again.minutes == 0


def test_each_check_adds_its_minutes_to_the_clock(flyback):
    practice = PracticeRound(flyback, dried_output_cap())
    practice.take("bulk_discharged")
    practice.take("fuse_resistance")
    step = practice.take("series_lamp")
    expected = sum(flyback.check(c).minutes for c in ("bulk_discharged", "fuse_resistance", "series_lamp"))
    assert step.clock == practice.clock == expected


def test_plain_mains_on_a_shorted_switch_blows_the_fuse_and_is_a_slip(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    step = practice.take("bulk_voltage")
    assert isinstance(step, Step) and step.fuse_blew
    assert step.slip is not None and step.slip.kind == MAINS_ON_SHORT
    assert "series lamp" in step.slip.why
    assert practice.unit.failed_parts["F1"] == "open"
    practice.take("bulk_discharged")
    assert practice.take("fuse_resistance").reading == "OL"  # the blown fuse reads open afterwards


def test_the_series_lamp_glows_bright_on_a_shorted_switch_without_a_slip(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    step = practice.take("series_lamp")
    assert step.reading == "bright"
    assert step.slip is None
    assert "F1" not in practice.unit.failed_parts


def test_a_hand_on_the_primary_after_the_lamp_is_stopped_before_it_is_taken(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    practice.take("series_lamp")
    stop = practice.take("mosfet_drain_source")
    assert isinstance(stop, Stop) and stop.counted
    assert stop.slip.kind == UNDISCHARGED and "bulk capacitor" in stop.slip.why.lower()
    assert stop.slip.shout.startswith("Stop!")
    assert [s.check_id for s in practice.steps] == ["series_lamp"]  # not taken, no minutes
    assert practice.clock == flyback.check("series_lamp").minutes


def test_a_missed_discharge_counts_once_however_often_the_hand_goes_back(flyback):
    # Reproduces the issue: one missed discharge with three touches cost 30 points.
    practice = PracticeRound(flyback, shorted_switch())
    practice.take("series_lamp")
    stops = [practice.take(c) for c in ("mosfet_drain_source", "sense_resistor", "gate_resistor")]
    assert [s.counted for s in stops] == [True, False, False]
    assert [s.kind for s in practice.slips] == [UNDISCHARGED]
    practice.take("bulk_discharged")
    assert isinstance(practice.take("mosfet_drain_source"), Step)
    practice.take("series_lamp")  # a second power-up, and the same slip again: a second mistake
    assert isinstance(practice.take("gate_resistor"), Stop)
    assert [s.kind for s in practice.slips] == [UNDISCHARGED, UNDISCHARGED]


def test_confirming_the_discharge_first_is_no_slip(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    practice.take("series_lamp")
    practice.take("bulk_discharged")
    assert practice.take("mosfet_drain_source").slip is None
    assert practice.slips == () and practice.stops == []


def test_plain_mains_before_the_lamp_is_stopped_even_when_nothing_would_blow(flyback):
    practice = PracticeRound(flyback, dried_output_cap())
    stop = practice.take("output_plug")
    assert isinstance(stop, Stop) and stop.slip.kind == MAINS_UNPROVEN
    assert practice.steps == []


def test_the_coach_is_recorded_with_the_readings_taken_so_far(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    practice.take("series_lamp")
    look = practice.coach()
    assert look.after_step == 1
    assert look.suspects[0].probability >= look.suspects[-1].probability
    assert len(practice.coach_looks) == 1
    assert practice.actions == [("take", "series_lamp"), ("coach", "")]


def test_catalogue_search_finds_checks_by_words(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    found = {c.id for c in practice.catalogue("series lamp")}
    assert found == {"series_lamp"}
    assert len(practice.catalogue("")) == len(flyback.checks)


def test_no_check_after_the_diagnosis_is_committed(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    practice.commit("Q1.short", {"Q1"})
    with pytest.raises(RoundError):
        practice.take("series_lamp")
    with pytest.raises(RoundError):
        practice.commit("Q1.short", {"Q1"})


def test_commit_refuses_a_fault_or_part_of_another_family(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    with pytest.raises(RoundError, match="not a fault"):
        practice.commit("ZD1.short", set())
    with pytest.raises(RoundError, match="unknown parts"):
        practice.commit("Q1.short", {"Q99"})
