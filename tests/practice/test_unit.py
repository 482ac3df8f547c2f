"""The hidden unit's level quirks: misleading reports and faults that come and go."""

from __future__ import annotations

from fixbench.practice.scenario import Scenario
from fixbench.practice.unit import HiddenUnit

RATINGS = (("current", "2 A"), ("mains", "230 V"), ("output", "12 V"))


def test_a_broken_lead_that_comes_and_goes_sometimes_reads_like_a_good_one(flyback):
    scenario = Scenario("pwm_flyback", RATINGS, "W1.open", (("W1", "open"),), "hard", 21, True)
    unit = HiddenUnit(flyback, scenario)
    answers = [unit.measure("lead_continuity") for _ in range(60)]
    away = [a for a in answers if a.fault_away]
    present = [a for a in answers if not a.fault_away]
    assert 5 < len(away) < 40
    # present, the lead reads open, bar the hard level's occasional reading that is off (5 %)
    assert sum(a.text == "OL" for a in present) >= 0.8 * len(present)
    assert all(a.text != "OL" for a in away)


def test_on_the_hard_level_some_customer_reports_mislead(flyback):
    scenario = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"), ("F1", "open")), "hard", 22, False)
    answers = [HiddenUnit(flyback, scenario.__class__(**{**scenario.__dict__, "seed": s})).measure("symptom_dead")
               for s in range(100)]
    assert 5 < sum(a.misleading for a in answers) < 50


def test_on_the_normal_level_reports_never_mislead(flyback):
    scenario = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"),), "normal", 23, False)
    unit = HiddenUnit(flyback, scenario)
    assert not any(unit.measure("symptom_dead").misleading for _ in range(50))
