"""A practice round: the trainee takes checks on the hidden unit in any order, on a running clock of
bench minutes, may ask the coach, and commits a diagnosis.

The round keeps its own diagnosis state from the trainee's readings (the same engine the bench
uses), so it can tell what each reading was worth, whether a power-up was safe at that moment, and
what the coach would show. The trainee never sees the state unless they ask the coach.
"""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.engine.inference import entropy_bits, information_about_root, root_posterior
from fixbench.engine.diagnosis import DiagnosisState, Suspect, start_diagnosis
from fixbench.knowledge.model import Check, Family
from fixbench.practice.safety import Slip, slip_before
from fixbench.practice.scenario import Scenario
from fixbench.practice.unit import HiddenUnit

COACH_SHOWN = 5  # suspects the coach lists


class RoundError(ValueError):
    """A round used out of order: a check after the diagnosis was committed, or a second commit."""


@dataclass(frozen=True)
class Step:
    number: int  # from 1
    check_id: str
    title: str
    power: str
    reading: str
    minutes: float
    clock: float  # bench minutes on the clock after this check
    bits_possible: float  # what the check could tell, given the readings before it
    bits_told: float  # how much this reading narrowed the root fault (entropy drop, may be negative)
    procedure: bool  # a safety step that tells nothing by design
    slip: Slip | None
    fault_away: bool = False
    misleading: bool = False


@dataclass(frozen=True)
class CoachLook:
    after_step: int  # how many readings had been taken when the coach was asked
    suspects: tuple[Suspect, ...]


@dataclass(frozen=True)
class Commitment:
    fault_id: str
    parts: frozenset[str]


def _root_entropy(state: DiagnosisState) -> float:
    return entropy_bits(root_posterior(state.model, state.posterior))


class PracticeRound:
    def __init__(self, family: Family, scenario: Scenario) -> None:
        self.family = family
        self.scenario = scenario
        self.unit = HiddenUnit(family, scenario)
        self.state: DiagnosisState = start_diagnosis(family, scenario.parsed_ratings())
        self.steps: list[Step] = []
        self.coach_looks: list[CoachLook] = []
        self.commitment: Commitment | None = None

    @property
    def clock(self) -> float:
        return self.steps[-1].clock if self.steps else 0.0

    @property
    def slips(self) -> tuple[Slip, ...]:
        return tuple(s.slip for s in self.steps if s.slip is not None)

    @property
    def committed(self) -> bool:
        return self.commitment is not None

    def catalogue(self, search: str = "") -> tuple[Check, ...]:
        """The bench's checks, filtered by words of the title, what it reads, or how it is made."""
        words = search.lower().split()
        found = []
        for check in self.family.checks:
            text = f"{check.title} {check.id.replace('_', ' ')} {check.instrument.replace('_', ' ')} {check.how}".lower()
            if all(w in text for w in words):
                found.append(check)
        return tuple(found)

    def take(self, check_id: str) -> Step:
        if self.committed:
            raise RoundError("the diagnosis is committed: start a new round to take more checks")
        check = self.family.check(check_id)
        before = self.state
        index = before.model.check_index(check_id)
        possible = information_about_root(before.model, before.posterior, index)
        slip = slip_before(before, check, self.unit.fuse_would_blow, len(self.steps) + 1)
        answer = self.unit.measure(check_id)
        self.state = before.with_reading(check_id, answer.text)
        step = Step(len(self.steps) + 1, check_id, check.title, check.power, answer.text, check.minutes,
                    self.clock + check.minutes, possible, _root_entropy(before) - _root_entropy(self.state),
                    check.procedure, slip, answer.fault_away, answer.misleading)
        self.steps.append(step)
        return step

    def coach(self) -> CoachLook:
        """The ranked suspects after the readings so far; asking is recorded."""
        look = CoachLook(len(self.steps), self.state.suspects[:COACH_SHOWN])
        self.coach_looks.append(look)
        return look

    def commit(self, fault_id: str, parts: frozenset[str] | set[str] | tuple[str, ...]) -> Commitment:
        if self.committed:
            raise RoundError("the diagnosis is already committed")
        known = set(self.state.model.roots)
        if fault_id not in known:
            raise RoundError(f"'{fault_id}' is not a fault of family '{self.family.id}'")
        unknown = [p for p in parts if p not in {part.id for part in self.family.parts}]
        if unknown:
            raise RoundError(f"unknown parts for family '{self.family.id}': {', '.join(unknown)}")
        self.commitment = Commitment(fault_id, frozenset(parts))
        return self.commitment
