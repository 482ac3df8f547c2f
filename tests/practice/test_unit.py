"""The hidden unit's level quirks: the complaint heard once, a misleading complaint on the hard
level, and faults that come and go while the unit is powered."""

from __future__ import annotations

from dataclasses import replace

from fixbench.practice.scenario import Scenario
from fixbench.practice.unit import HiddenUnit

RATINGS = (("current", "2 A"), ("mains", "230 V"), ("output", "12 V"))


def test_a_broken_lead_that_comes_and_goes_sometimes_reads_like_a_good_one_when_powered(flyback):
    scenario = Scenario("pwm_flyback", RATINGS, "W1.open", (("W1", "open"),), "hard", 21, True)
    unit = HiddenUnit(flyback, scenario)
    answers = [unit.measure("output_plug") for _ in range(60)]
    away = [a for a in answers if a.fault_away]
    assert 5 < len(away) < 40
    volts = [float(a.text.split()[0]) for a in away]
    assert all(11.0 < v < 13.0 for v in volts)  # away, the plug shows the healthy 12 V
    present = [a for a in answers if not a.fault_away]
    # present, the open lead gives nothing at the plug, bar the level's odd reading that is off (5 %)
    assert sum(a.text == "0 V" for a in present) >= 0.8 * len(present)


def test_a_fault_that_comes_and_goes_still_reads_as_it_is_cold(flyback):
    # A dried capacitor reads its ESR whether or not it starts the unit today, and a lead broken
    # in its jacket reads open when flexed along its length [practice].
    for fault, check in (("W1.open", "lead_continuity"), ("C3.dried", "output_cap_esr")):
        part, mode = fault.split(".")
        unit = HiddenUnit(flyback, Scenario("pwm_flyback", RATINGS, fault, ((part, mode),), "hard", 21, True))
        assert not any(unit.measure(check).fault_away for _ in range(40))


def test_the_customer_tells_the_same_story_when_asked_again(flyback):
    scenario = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"), ("F1", "open")), "hard", 22, False)
    unit = HiddenUnit(flyback, scenario)
    told = dict(unit.complaint)
    assert {unit.measure("symptom_dead").text for _ in range(10)} == {told["symptom_dead"].text}


def test_on_the_hard_level_one_complaint_in_four_has_a_detail_wrong(flyback):
    scenario = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"), ("F1", "open")), "hard", 22, False)
    misled = [sum(a.misleading for _, a in HiddenUnit(flyback, replace(scenario, seed=s)).complaint)
              for s in range(200)]
    assert max(misled) == 1  # one detail at most
    assert 30 < sum(misled) < 70  # about one complaint in four (0.25 x 200 = 50)


def test_on_the_normal_level_the_complaint_never_misleads(flyback):
    scenario = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"),), "normal", 23, False)
    assert not any(a.misleading for s in range(50)
                   for _, a in HiddenUnit(flyback, replace(scenario, seed=s)).complaint)


def test_a_replayed_case_keeps_what_its_customer_said(flyback):
    scenario = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"),), "hard", 24, False,
                        "replay", "2024-05", (("symptom_dead", "yes"), ("symptom_hot", "no")))
    told = dict(HiddenUnit(flyback, scenario).complaint)
    assert (told["symptom_dead"].text, told["symptom_hot"].text) == ("yes", "no")


def test_the_complaint_is_exact_on_easy_and_now_and_then_off_on_normal(flyback):
    # As the levels say: the engine's own prediction on easy; drawn with its spread on normal.
    scenario = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"), ("F1", "open")), "easy", 0, False)
    easy = {tuple((c, a.text) for c, a in HiddenUnit(flyback, replace(scenario, seed=s)).complaint)
            for s in range(30)}
    assert len(easy) == 1  # whatever the seed, the same story: exactly what the unit does
    normal = {tuple((c, a.text) for c, a in HiddenUnit(flyback, replace(scenario, level_id="normal", seed=s)).complaint)
              for s in range(30)}
    assert len(normal) > 1
