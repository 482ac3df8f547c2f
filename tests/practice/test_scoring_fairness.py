"""The score is fair: the engine playing as a trainee on 200 simulated units reaches the top band in
at least 95 % of rounds; a random clicker almost never does."""

from __future__ import annotations

import random

from fixbench.practice.debrief import debrief_round
from fixbench.practice.engine_path import engine_path
from fixbench.practice.levels import NORMAL
from fixbench.practice.round import PracticeRound
from fixbench.practice.scenario import draw_scenario
from fixbench.practice.scoring import READY

ROUNDS = 200


def _units(knowledge, first_seed):
    families = sorted(knowledge.families.values(), key=lambda f: f.id)
    for i in range(ROUNDS):
        family = families[i % len(families)]
        yield family, draw_scenario(family, NORMAL, first_seed + i)


def test_engine_as_trainee_reaches_the_top_band_in_95_percent_of_rounds(knowledge):
    ready, faults_right = 0, 0
    for family, scenario in _units(knowledge, 1000):
        practice = PracticeRound(family, scenario)
        state = practice.state
        while state.next_check is not None and len(practice.steps) < 80:
            practice.take(state.next_check.check.id)
            state = practice.state
        conclusion = state.final_conclusion()
        practice.commit(state.suspects[0].fault, {a.part for a in conclusion.replace})
        debrief = debrief_round(practice, engine_path(family, scenario))
        assert debrief.score.par == debrief.score.minutes  # the engine's minutes are the par
        ready += debrief.score.band == READY
        faults_right += debrief.score.fault_right
    print(f"engine as trainee: {ready}/{ROUNDS} rounds in the top band, {faults_right} faults right")
    assert ready / ROUNDS >= 0.95
    assert faults_right / ROUNDS >= 0.95


def test_random_clicker_rarely_reaches_the_top_band(knowledge):
    rng = random.Random(7)
    ready = 0
    for family, scenario in _units(knowledge, 5000):
        practice = PracticeRound(family, scenario)
        for _ in range(rng.randint(1, 15)):
            practice.take(rng.choice(family.checks).id)
        fault = rng.choice(practice.state.model.roots)
        parts = rng.sample([p.id for p in family.parts], rng.randint(0, 3))
        practice.commit(fault, parts)
        debrief = debrief_round(practice, engine_path(family, scenario))
        ready += debrief.score.band == READY
    print(f"random clicker: {ready}/{ROUNDS} rounds in the top band")
    assert ready / ROUNDS <= 0.05
