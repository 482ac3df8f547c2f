"""Scenarios: drawn from the fault weights by level, or replayed from a closed case."""

from __future__ import annotations

import pytest

from fixbench.engine.hypotheses import NO_FAULT
from fixbench.practice.levels import EASY, HARD, NORMAL
from fixbench.practice.scenario import (PastCase, draw_scenario, intermittent_fault, replay_scenario,
                                       scenario_with_fault)


def test_the_same_seed_draws_the_same_unit(flyback):
    assert draw_scenario(flyback, NORMAL, 5) == draw_scenario(flyback, NORMAL, 5)


def test_easy_hides_one_clear_fault_with_only_its_near_certain_damage(flyback):
    for seed in range(60):
        scenario = draw_scenario(flyback, EASY, seed)
        assert scenario.fault_id != NO_FAULT
        fault = flyback.fault(scenario.fault_id)
        sure = {c.part for c in fault.collateral if c.probability >= 0.8}
        assert set(scenario.failed_parts()) <= {fault.part} | sure


def test_hard_draws_faults_that_come_and_go_more_often(flyback):
    def share(level):
        return sum(intermittent_fault(flyback, draw_scenario(flyback, level, s).fault_id) for s in range(300))
    assert share(HARD) > 1.5 * share(NORMAL)
    assert any(draw_scenario(flyback, HARD, s).intermittent for s in range(300))
    assert not any(draw_scenario(flyback, NORMAL, s).intermittent for s in range(300))


def test_a_replayed_case_keeps_its_fault_and_ratings_and_nothing_else(flyback):
    case = PastCase("pwm_flyback", {"mains": "230 V", "output": "12 V", "current": "2 A"}, "C3.dried", "2024-03")
    scenario = replay_scenario(flyback, case, NORMAL, 9)
    assert scenario.fault_id == "C3.dried" and ("C3", "dried") in scenario.modes
    assert scenario.id.startswith("replay:normal:pwm_flyback:C3.dried")
    assert "2024-03" in scenario.describe() and "C3" not in scenario.describe()


def test_a_case_whose_fault_the_family_lacks_is_refused(flyback):
    case = PastCase("pwm_flyback", {"mains": "230 V", "output": "5 V", "current": "1 A"}, "ZD1.short", "2024-03")
    with pytest.raises(ValueError, match="ZD1.short"):
        replay_scenario(flyback, case, NORMAL, 1)


def test_a_replayed_case_keeps_what_its_customer_said_as_outcomes(flyback):
    case = PastCase("pwm_flyback", {"mains": "230 V", "output": "12 V", "current": "2 A"}, "Q1.short", "2024-05",
                    (("symptom_dead", "y"), ("symptom_hot", "no"), ("symptom_whatever", "yes"), ("look_fuse", "maybe")))
    scenario = replay_scenario(flyback, case, NORMAL, 3)
    # typed words read as the outcomes; a check the family lacks, or an answer that does not read,
    # is left for the simulated customer
    assert scenario.told == (("symptom_dead", "yes"), ("symptom_hot", "no"))


def test_the_curriculum_can_hide_a_chosen_fault_drawing_its_damage_as_the_level_does(flyback):
    scenario = scenario_with_fault(flyback, EASY, "R1.open", 4)
    assert scenario.fault_id == "R1.open" and scenario.source == "chosen" and scenario.modes[0] == ("R1", "open")
    assert scenario == scenario_with_fault(flyback, EASY, "R1.open", 4)
    with pytest.raises(KeyError):
        scenario_with_fault(flyback, EASY, "ZD1.short", 4)
