"""The engine's path and par: the planner's checks, then the careful checks before power-up (each
part the conclusion replaces or tests, not yet read), the discharge confirmed where the planner's
rule asks."""

from __future__ import annotations

from fixbench.engine import planner
from fixbench.practice.engine_path import engine_path, part_checks
from fixbench.practice.levels import LEVELS
from fixbench.practice.play import engine_as_trainee, play_round
from fixbench.practice.scenario import Scenario, draw_scenario
from fixbench.practice.scoring import READY

RATINGS = (("current", "2 A"), ("mains", "230 V"), ("output", "12 V"))
# A shorted MOSFET that took the fuse, the current-sense resistor and the gate resistor with it.
FOUR_FAILED = Scenario("pwm_flyback", RATINGS, "Q1.short",
                       (("Q1", "short"), ("F1", "open"), ("R3", "open"), ("R2", "open")), "normal", 16, False)


def test_a_unit_with_four_failed_parts_gets_a_par_that_tests_each_of_them(flyback):
    # Reproduces the issue: the par was the planner's 2-3 minutes and named two parts of four.
    path = engine_path(flyback, FOUR_FAILED)
    careful = [s.check_id for s in path.steps if s.careful]
    for part in ("Q1", "F1", "R3", "R2"):  # each failed part read, by the planner or before power-up
        assert any(s.check_id in part_checks(flyback, part) for s in path.steps), part
    assert any(c in part_checks(flyback, "R2") for c in careful)  # the planner never asks for the gate resistor
    assert path.parts >= {"Q1", "F1", "R3", "R2"}
    assert path.minutes >= sum(flyback.check(c).minutes for c in careful) + 2
    assert all("before" in s.reason for s in path.steps if s.careful)


def test_confirming_the_fuse_and_sense_resistor_costs_a_trainee_nothing(flyback):
    path = engine_path(flyback, FOUR_FAILED)
    checks = ["look_fuse", "bulk_discharged", "mosfet_drain_source", "fuse_resistance", "sense_resistor",
              "gate_resistor"]
    played = play_round(flyback, FOUR_FAILED, checks, "Q1.short", {"Q1", "F1", "R3", "R2"}, path)
    assert played.debrief.score.effort_points == 30.0
    assert played.debrief.score.band == READY
    assert not {r.step.check_id for r in played.debrief.told_nothing} & {"fuse_resistance", "sense_resistor"}


def test_the_engine_confirms_the_discharge_before_a_careful_check_on_the_primary(flyback):
    # A dead controller found live: the careful checks on the primary wait for the discharge
    # confirmation, as the planner's rule asks after a power-up.
    scenario = draw_scenario(flyback, LEVELS["hard"], 63)
    assert scenario.modes == (("U1", "dead"),)  # the premise
    path = engine_path(flyback, scenario)
    first = next(i for i, s in enumerate(path.steps) if s.careful)
    assert any(flyback.check(s.check_id).power in ("lamp", "live") for s in path.steps[:first])
    assert path.steps[first].check_id == planner.DISCHARGE_CHECK and "discharged" in path.steps[first].reason
    assert flyback.touches_primary(flyback.check(path.steps[first + 1].check_id))
    assert engine_as_trainee(flyback, scenario).debrief.slips == ()


def test_the_engine_played_as_a_trainee_scores_its_own_par(flyback):
    played = engine_as_trainee(flyback, FOUR_FAILED)
    score = played.debrief.score
    assert score.minutes == score.par == played.engine.minutes
    assert score.band == READY and score.total == 100.0
