"""Safety slips follow the engine's planner rules (its safety gate and its discharge rule), so a
change to those rules changes what practice calls a slip."""

from __future__ import annotations

import random

from fixbench.engine import planner
from fixbench.practice.levels import LEVELS
from fixbench.practice.play import engine_as_trainee
from fixbench.practice.round import PracticeRound, Stop
from fixbench.practice.safety import MAINS_UNPROVEN, UNDISCHARGED, slip_before
from fixbench.practice.scenario import draw_scenario


def test_the_engines_own_path_never_slips(knowledge):
    for i, family in enumerate(sorted(knowledge.families.values(), key=lambda f: f.id)):
        for level in LEVELS.values():
            played = engine_as_trainee(family, draw_scenario(family, level, 40 + i))
            assert played.debrief.slips == () and played.practice.stops == []


def test_a_slip_is_exactly_what_the_planner_would_not_propose(knowledge):
    rng = random.Random(3)
    family = knowledge.family("pwm_flyback")
    for seed in range(6):
        practice = PracticeRound(family, draw_scenario(family, LEVELS["normal"], seed))
        for _ in range(12):
            state = practice.state
            for check in family.checks:
                i = state.model.check_index(check.id)
                slip = slip_before(state, check, practice.unit.fuse_would_blow, 1)
                gate = planner.is_allowed(state.model, state.posterior, i, state.evidence)
                discharge = state.discharge_needed_before(check.id)  # planner.discharge_first
                assert (slip is not None) == ((check.power == "live" and not gate) or discharge), check.id
            practice.take(rng.choice(family.checks).id)


def test_a_change_to_the_planners_discharge_rule_flows_into_practice(flyback, monkeypatch):
    scenario = draw_scenario(flyback, LEVELS["normal"], 5)
    # The planner asks for the discharge before the first hand on the primary of every case: units
    # arrive charged [practice].
    stop = PracticeRound(flyback, scenario).take("mosfet_drain_source")
    assert isinstance(stop, Stop) and stop.slip.kind == UNDISCHARGED
    # As if the planner asked for it only after a power-up: practice follows.
    monkeypatch.setattr(planner, "discharge_first",
                        lambda model, state, check: False)
    assert not isinstance(PracticeRound(flyback, scenario).take("mosfet_drain_source"), Stop)


def test_a_change_to_the_planners_short_threshold_flows_into_practice(flyback, monkeypatch):
    scenario = draw_scenario(flyback, LEVELS["easy"], 5)
    practice = PracticeRound(flyback, scenario)
    practice.take("series_lamp")
    while practice.state.live_allowed is False and practice.state.next_check is not None:
        practice.take(practice.state.next_check.check.id)
    assert practice.state.live_allowed
    monkeypatch.setattr(planner, "SHORT_THRESHOLD", -1.0)  # no live check is ever allowed
    assert slip_before(practice.state, flyback.check("output_plug"), False, 1).kind == MAINS_UNPROVEN
