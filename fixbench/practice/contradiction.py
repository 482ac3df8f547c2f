"""The reading that contradicts a wrong verdict: the one least like what the named fault would give,
against the true fault, looked for in the trainee's own readings first, then in the customer's
complaint, then along the engine's path (what the trainee could have read).

"Least like" is the log ratio of the reading's chance under the verdict to its chance under the
true fault (its group), each weighted by the suspects' chances before the reading; a reading at
least three times less likely under the verdict counts as a contradiction.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from fixbench.engine.diagnosis import DiagnosisState, start_diagnosis
from fixbench.practice.engine_path import EngineStep
from fixbench.practice.explain import healthy_words, predicted_words
from fixbench.practice.round import PracticeRound

CONTRADICTS = math.log(1 / 3)  # a reading at least three times less likely under the verdict


@dataclass(frozen=True)
class Contradiction:
    where: str  # "Step 3", "The customer's complaint", "The engine's step 5"
    check_title: str
    reading: str
    would_read: str  # what the check would read with the trainee's verdict
    healthy: str


def _chance_of(state: DiagnosisState, check_id: str, outcome: str, roots: tuple[str, ...]) -> float:
    model = state.model
    check = model.checks[model.check_index(check_id)]
    members = np.isin(model.root_of, [model.roots.index(r) for r in roots])
    weights = state.posterior * members
    if weights.sum() <= 0:
        weights = model.prior * members
    return float(weights @ check.table[:, check.classes.names.index(outcome)] / weights.sum())


def contradiction(states: list[DiagnosisState], wheres: list[str], named: str,
                  group: tuple[str, ...]) -> Contradiction | None:
    """The reading least like the verdict against the true fault: ``states[i]`` is the state after
    reading i, ``states[0]`` the state before the first; ``wheres[i-1]`` names reading i."""
    worst, best = None, CONTRADICTS
    for i in range(1, len(states)):
        before, reading = states[i - 1], states[i].readings[-1]
        ratio = (math.log(_chance_of(before, reading.check, reading.outcome, (named,)))
                 - math.log(_chance_of(before, reading.check, reading.outcome, group)))
        if ratio < best:
            worst, best = i, ratio
    if worst is None:
        return None
    before, reading = states[worst - 1], states[worst].readings[-1]
    return Contradiction(wheres[worst - 1], before.family.check(reading.check).title, reading.shown(),
                         predicted_words(before, reading.check, named, before.posterior),
                         healthy_words(before, reading.check))


def verdict_contradiction(practice: PracticeRound, engine_steps: tuple[EngineStep, ...], named: str,
                          group: tuple[str, ...]) -> Contradiction | None:
    """In the trainee's own readings first, then the complaint, then the engine's path."""
    found = contradiction(practice.states, [f"Step {s.number}" for s in practice.steps], named, group)
    if found is not None:
        return found
    bare = start_diagnosis(practice.family, practice.scenario.parsed_ratings())
    told = [bare]
    for check_id, answer in practice.complaint:
        told.append(told[-1].with_reading(check_id, answer.text))
    found = contradiction(told, ["The customer's complaint"] * len(practice.complaint), named, group)
    if found is not None:
        return found
    path = [practice.opening]
    for step in engine_steps:
        path.append(path[-1].with_reading(step.check_id, step.reading))
    return contradiction(path, [f"The engine's step {i}" for i in range(1, len(path))], named, group)
