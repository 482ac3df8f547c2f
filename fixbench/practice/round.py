"""A practice round: the trainee hears the customer's complaint, takes checks on the hidden unit in
any order on a running clock of bench minutes, may ask the coach, and commits a diagnosis.

The round keeps its own diagnosis state from the complaint and the trainee's readings (the same
engine the bench uses), so it can tell what each reading was worth, whether reaching for a check
was safe at that moment, and what the coach would show. The trainee never sees the state unless
they ask the coach.

A slip stops the round when it happens (see :mod:`fixbench.practice.safety`): the check the
colleague stopped is not taken, and the round waits until the trainee has read why. Every action
is kept in order (:attr:`PracticeRound.actions`), so a kept round can be played again exactly.
"""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.engine.diagnosis import DiagnosisState, Suspect, start_diagnosis
from fixbench.knowledge.model import Check, Family
from fixbench.practice.safety import Slip, mistake_key, slip_before
from fixbench.practice.scenario import Scenario
from fixbench.practice.unit import Answer, HiddenUnit

COACH_SHOWN = 5  # suspects the coach lists
TAKE, COACH = "take", "coach"  # the kinds of action a round keeps


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
    procedure: bool  # a safety step that tells nothing by design
    slip: Slip | None  # a slip that happened with this reading (plain mains on a short)
    fault_away: bool = False
    misleading: bool = False
    fuse_blew: bool = False  # the fuse opened as this reading was taken


@dataclass(frozen=True)
class Stop:
    """A check the trainee reached for and a colleague stopped: not taken, no minutes."""

    slip: Slip
    counted: bool  # the first time for this mistake (a repeat is shouted again, not counted again)


@dataclass(frozen=True)
class CoachLook:
    after_step: int  # how many readings had been taken when the coach was asked
    suspects: tuple[Suspect, ...]


@dataclass(frozen=True)
class Commitment:
    fault_id: str
    parts: frozenset[str]


def opening_state(family: Family, scenario: Scenario, unit: HiddenUnit) -> DiagnosisState:
    """The diagnosis as the unit comes in: the customer's complaint already read."""
    state = start_diagnosis(family, scenario.parsed_ratings())
    for check_id, answer in unit.complaint:
        state = state.with_reading(check_id, answer.text)
    return state


class PracticeRound:
    def __init__(self, family: Family, scenario: Scenario) -> None:
        self.family = family
        self.scenario = scenario
        self.unit = HiddenUnit(family, scenario)
        self.opening: DiagnosisState = opening_state(family, scenario, self.unit)
        self.states: list[DiagnosisState] = [self.opening]  # before the first step, then after each
        self.steps: list[Step] = []
        self.stops: list[Stop] = []
        self.coach_looks: list[CoachLook] = []
        self.actions: list[tuple[str, str]] = []
        self.commitment: Commitment | None = None
        self._mistakes: set[tuple[str, int]] = set()
        self._slips: list[Slip] = []

    @property
    def state(self) -> DiagnosisState:
        return self.states[-1]

    @property
    def complaint(self) -> tuple[tuple[str, Answer], ...]:
        return self.unit.complaint

    @property
    def clock(self) -> float:
        return self.steps[-1].clock if self.steps else 0.0

    @property
    def slips(self) -> tuple[Slip, ...]:
        """Each mistake once, in the order made."""
        return tuple(self._slips)

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

    def take(self, check_id: str) -> Step | Stop:
        """Take a check; a :class:`Stop` when a colleague would have stopped it (not taken)."""
        if self.committed:
            raise RoundError("the diagnosis is committed: start a new round to take more checks")
        check = self.family.check(check_id)
        before = self.state
        self.actions.append((TAKE, check_id))
        slip = slip_before(before, check, self.unit.fuse_would_blow, len(self.steps) + 1)
        counted = False
        if slip is not None:
            key = mistake_key(before, slip)
            counted = key not in self._mistakes
            self._mistakes.add(key)
            if counted:
                self._slips.append(slip)
        if slip is not None and slip.stopped:
            stop = Stop(slip, counted)
            self.stops.append(stop)
            return stop
        was_blown = self.unit.fuse_blown_on_bench
        answer = self.unit.measure(check_id)
        self.states.append(before.with_reading(check_id, answer.text))
        step = Step(len(self.steps) + 1, check_id, check.title, check.power, answer.text, check.minutes,
                    self.clock + check.minutes, check.procedure, slip if counted else None,
                    answer.fault_away, answer.misleading, self.unit.fuse_blown_on_bench and not was_blown)
        self.steps.append(step)
        return step

    def coach(self) -> CoachLook:
        """The ranked suspects after the readings so far; asking is recorded (and costs points)."""
        self.actions.append((COACH, ""))
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
