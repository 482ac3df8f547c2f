"""The debrief: right or wrong, par, telling and wasted checks, slips, the engine's path beside."""

from __future__ import annotations

import pytest

from fixbench.practice.debrief import debrief_round
from fixbench.practice.engine_path import engine_path
from fixbench.practice.round import PracticeRound, RoundError
from fixbench.practice.safety import MAINS_ON_SHORT
from fixbench.practice.scenario import Scenario

RATINGS = (("current", "2 A"), ("mains", "230 V"), ("output", "12 V"))
SHORTED = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"), ("F1", "open")), "normal", 11, False)


def test_a_careful_round_is_right_and_lists_the_telling_checks(flyback):
    practice = PracticeRound(flyback, SHORTED)
    for check in ("look_fuse", "fuse_resistance", "mosfet_drain_source", "symptom_hot"):
        practice.take(check)
    practice.commit("Q1.short", {"Q1", "F1"})
    debrief = debrief_round(practice, engine_path(flyback, SHORTED))
    assert debrief.right
    assert debrief.true_fault == flyback.fault("Q1.short").title
    assert "mosfet_drain_source" in [s.check_id for s in debrief.most_telling]
    assert debrief.slips == ()
    assert debrief.engine_right
    assert debrief.score.par == debrief.engine.minutes > 0


def test_a_check_that_could_tell_nothing_is_listed(flyback):
    practice = PracticeRound(flyback, SHORTED)
    practice.take("mosfet_drain_source")
    practice.take("mosfet_drain_source")
    practice.take("mosfet_drain_source")  # the third time adds nothing
    practice.commit("Q1.short", {"Q1", "F1"})
    debrief = debrief_round(practice, engine_path(flyback, SHORTED))
    assert 3 in [s.number for s in debrief.told_nothing]


def test_a_slip_is_reported_with_why_and_the_paths_sit_side_by_side(flyback):
    scenario = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"),), "normal", 12, False)
    practice = PracticeRound(flyback, scenario)
    practice.take("bulk_voltage")
    practice.commit("Q1.short", {"Q1"})
    debrief = debrief_round(practice, engine_path(flyback, scenario))
    assert [s.kind for s in debrief.slips] == [MAINS_ON_SHORT]
    assert "fuse" in debrief.slips[0].what and "series lamp" in debrief.slips[0].why
    assert "F1" in debrief.score.parts_missed  # the fuse the trainee blew must be replaced too
    assert debrief.pairs[0][0].check_id == "bulk_voltage"
    assert len(debrief.pairs) == max(1, len(debrief.engine.steps))


def test_coach_use_is_in_the_debrief(flyback):
    practice = PracticeRound(flyback, SHORTED)
    practice.take("look_fuse")
    practice.coach()
    practice.commit("Q1.short", {"Q1", "F1"})
    debrief = debrief_round(practice, engine_path(flyback, SHORTED))
    assert debrief.coach_looks == 1 and debrief.coach_first_after == 1


def test_no_debrief_before_a_commit(flyback):
    practice = PracticeRound(flyback, SHORTED)
    with pytest.raises(RoundError):
        debrief_round(practice, engine_path(flyback, SHORTED))
