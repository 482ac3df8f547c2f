"""The engine's own path on the same hidden unit: the par for a round's minutes and the path the
debrief sets beside the trainee's.

The engine takes its proposed check each step, on a fresh copy of the unit (same scenario, same
random streams), until it stops, then names its leading fault and the parts its conclusion
replaces. It never slips: the planner proposes only checks that are safe at the time.
"""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.engine.diagnosis import start_diagnosis
from fixbench.engine.follow import follow_planner
from fixbench.knowledge.model import Family
from fixbench.practice.scenario import Scenario
from fixbench.practice.unit import HiddenUnit

MAX_STEPS = 80  # the engine benchmark's bound on one unit


@dataclass(frozen=True)
class EngineStep:
    check_id: str
    title: str
    reading: str
    minutes: float
    reason: str


@dataclass(frozen=True)
class EnginePath:
    steps: tuple[EngineStep, ...]
    minutes: float
    fault_id: str
    parts: frozenset[str]


def engine_path(family: Family, scenario: Scenario) -> EnginePath:
    unit = HiddenUnit(family, scenario)
    path = follow_planner(start_diagnosis(family, scenario.parsed_ratings()),
                          lambda check_id: unit.measure(check_id).text, MAX_STEPS)
    steps = tuple(EngineStep(step.proposal.check.id, step.proposal.title, step.typed,
                             step.proposal.minutes, step.proposal.reason) for step in path.steps)
    conclusion = path.final.final_conclusion()
    return EnginePath(steps, sum(s.minutes for s in steps), path.final.suspects[0].fault,
                      frozenset(a.part for a in conclusion.replace))
