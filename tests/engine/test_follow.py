"""Following the planner: the one loop behind the engine benchmark, the demo shop's cases and the
practice par walks the engine's own proposals on a unit and stops where the engine stops."""

from __future__ import annotations

from fixbench.engine.follow import follow_planner
from fixbench.engine.simulate import simulated_unit
from fixbench.practice.engine_path import engine_path
from fixbench.practice.levels import NORMAL
from fixbench.practice.round import opening_state
from fixbench.practice.scenario import draw_scenario
from fixbench.practice.unit import HiddenUnit


def test_each_step_takes_the_proposal_made_in_the_state_before_it(family, ratings, start):
    unit = simulated_unit(family, ratings, "Q1.short", 3, exact=True)
    path = follow_planner(start, unit.measure, 80)
    assert path.steps and path.final.next_check is None  # stopped because the engine concluded
    state = start
    for step in path.steps:
        assert step.before is state
        assert step.proposal == state.next_check
        assert step.after.readings[-1].check == step.proposal.check.id == step.reading.check
        assert step.reading.text == step.typed
        state = step.after
    assert path.final is state
    assert path.minutes == sum(step.proposal.minutes for step in path.steps)


def test_the_step_bound_cuts_the_walk_short(family, ratings, start):
    unit = simulated_unit(family, ratings, "Q1.short", 3, exact=True)
    path = follow_planner(start, unit.measure, 2)
    assert len(path.steps) == 2 and path.final.next_check is not None


def test_nothing_is_measured_once_the_engine_has_concluded(family, ratings, start):
    unit = simulated_unit(family, ratings, "Q1.short", 3, exact=True)
    done = follow_planner(start, unit.measure, 80).final
    asked = []
    again = follow_planner(done, lambda check_id: asked.append(check_id) or "", 80)
    assert again.steps == () and again.final is done and asked == []


def test_the_practice_par_is_the_same_walk_on_the_hidden_unit(family):
    # The par walks from the customer's complaint, then adds the careful checks before power-up.
    scenario = draw_scenario(family, NORMAL, 7)
    par = engine_path(family, scenario)
    unit = HiddenUnit(family, scenario)
    walk = follow_planner(opening_state(family, scenario, unit), lambda check_id: unit.measure(check_id).text, 80)
    planned = [s for s in par.steps if not s.careful]
    assert [s.check_id for s in planned] == [s.proposal.check.id for s in walk.steps]
    assert [s.reading for s in planned] == [s.typed for s in walk.steps]
    assert all(s.careful for s in par.steps[len(planned):])
