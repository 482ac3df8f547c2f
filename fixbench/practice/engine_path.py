"""The engine's own path on the same hidden unit: the par for a round's minutes and the path the
debrief sets beside the trainee's.

The engine hears the same complaint, then takes its proposed check each step, on a fresh copy of
the unit (same scenario, same random streams), until it stops. Then it does what a careful
technician does before powering a repaired unit up: it reads each part its conclusion would
replace or test that no reading has shown yet (the collateral parts, and the root part itself if
only signals pointed at it), confirming the bulk capacitor discharged first where the planner's
rule asks. It names its leading fault, and replaces the parts its conclusion replaces plus any
part whose own reading came out of band. It never slips: it takes only checks that are safe then.
"""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.engine import planner
from fixbench.engine.diagnosis import DiagnosisState
from fixbench.engine.follow import follow_planner
from fixbench.knowledge.model import Family
from fixbench.practice.explain import careful_check_words, healthy_words, why_engine_chose
from fixbench.practice.round import opening_state
from fixbench.practice.scenario import Scenario
from fixbench.practice.unit import HiddenUnit

MAX_STEPS = 80  # the engine benchmark's bound on one unit


@dataclass(frozen=True)
class EngineStep:
    check_id: str
    title: str
    reading: str
    healthy: str  # what a healthy unit reads there
    minutes: float
    reason: str  # why the engine took it, in plain words
    careful: bool = False  # a check before power-up after the planner stopped


@dataclass(frozen=True)
class EnginePath:
    steps: tuple[EngineStep, ...]
    minutes: float
    fault_id: str
    parts: frozenset[str]


def part_checks(family: Family, part_id: str) -> tuple[str, ...]:
    """The cold checks that read this part, quickest first (the family's order breaks ties)."""
    checks = [c for c in family.checks if c.power == "cold" and c.target == f"part:{part_id}"]
    return tuple(c.id for c in sorted(checks, key=lambda c: c.minutes))


def parts_read_failed(state: DiagnosisState) -> set[str]:
    """Parts whose own cold reading came out of the healthy band."""
    family = state.family
    return {family.check(r.check).target_id for r in state.readings
            if not r.in_band and family.check(r.check).target_kind == "part"
            and family.check(r.check).power == "cold"}


def careful_parts(state: DiagnosisState) -> list[tuple[str, bool]]:
    """(part, is the root's own part) for the parts to read before power-up, in the conclusion's order."""
    conclusion = state.final_conclusion()
    family = state.family
    roots = {family.fault(f).part for f in conclusion.faults if f != "no_fault"}
    read = {family.check(r.check).target_id for r in state.readings if family.check(r.check).target_kind == "part"}
    wanted = []
    for action in conclusion.replace + conclusion.test_before_power:
        if action.part not in read and part_checks(family, action.part) and action.part not in dict(wanted):
            wanted.append((action.part, action.part in roots))
    return wanted


def engine_path(family: Family, scenario: Scenario) -> EnginePath:
    unit = HiddenUnit(family, scenario)
    followed = follow_planner(opening_state(family, scenario, unit),
                              lambda check_id: unit.measure(check_id).text, MAX_STEPS)
    steps = [EngineStep(s.proposal.check.id, s.proposal.title, s.typed, healthy_words(s.before, s.proposal.check.id),
                        s.proposal.minutes, why_engine_chose(s.before, s.proposal.check.id)) for s in followed.steps]
    state = followed.final
    for part_id, confirming in careful_parts(state):
        check_id = part_checks(family, part_id)[0]
        takes = [(check_id, careful_check_words(family, part_id, confirming))]
        if state.discharge_needed_before(check_id):
            takes.insert(0, (planner.DISCHARGE_CHECK, why_engine_chose(state, planner.DISCHARGE_CHECK)))
        for take, reason in takes:
            typed = unit.measure(take).text
            steps.append(EngineStep(take, family.check(take).title, typed, healthy_words(state, take),
                                    family.check(take).minutes, reason, careful=True))
            state = state.with_reading(take, typed)
    parts = {a.part for a in state.final_conclusion().replace} | parts_read_failed(state)
    return EnginePath(tuple(steps), sum(s.minutes for s in steps), state.suspects[0].fault, frozenset(parts))
