"""A practice round: readings of the hidden unit, the clock, safety slips and the coach."""

from __future__ import annotations

import pytest

from fixbench.practice.round import PracticeRound, RoundError
from fixbench.practice.safety import MAINS_ON_SHORT, MAINS_UNPROVEN, UNDISCHARGED
from fixbench.practice.scenario import Scenario

RATINGS = (("current", "2 A"), ("mains", "230 V"), ("output", "12 V"))


def shorted_switch(level="normal"):
    """A shorted MOSFET whose fuse is still good: plain mains will blow it."""
    return Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"),), level, 3, False)


def dried_output_cap():
    return Scenario("pwm_flyback", RATINGS, "C3.dried", (("C3", "dried"),), "easy", 4, False)


def test_each_check_adds_its_minutes_to_the_clock(flyback):
    practice = PracticeRound(flyback, dried_output_cap())
    practice.take("symptom_dead")
    practice.take("fuse_resistance")
    step = practice.take("series_lamp")
    expected = flyback.check("fuse_resistance").minutes + flyback.check("series_lamp").minutes
    assert step.clock == practice.clock == expected


def test_plain_mains_on_a_shorted_switch_blows_the_fuse_and_is_a_slip(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    step = practice.take("bulk_voltage")
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


def test_touching_the_primary_after_the_lamp_without_discharge_is_a_slip(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    practice.take("series_lamp")
    step = practice.take("mosfet_drain_source")
    assert step.slip is not None and step.slip.kind == UNDISCHARGED
    assert "bulk capacitor" in step.slip.why.lower()


def test_confirming_the_discharge_first_is_no_slip(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    practice.take("series_lamp")
    practice.take("bulk_discharged")
    assert practice.take("mosfet_drain_source").slip is None
    assert practice.slips == ()


def test_plain_mains_before_ruling_out_a_short_is_a_slip_even_when_nothing_blows(flyback):
    practice = PracticeRound(flyback, dried_output_cap())
    step = practice.take("output_plug")
    assert step.slip is not None and step.slip.kind == MAINS_UNPROVEN


def test_a_telling_reading_narrows_the_fault(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    step = practice.take("mosfet_drain_source")
    assert step.bits_possible > 0.1
    assert step.bits_told > 0.1


def test_the_coach_is_recorded_with_the_readings_taken_so_far(flyback):
    practice = PracticeRound(flyback, shorted_switch())
    practice.take("series_lamp")
    look = practice.coach()
    assert look.after_step == 1
    assert look.suspects[0].probability >= look.suspects[-1].probability
    assert len(practice.coach_looks) == 1


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
