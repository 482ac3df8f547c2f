"""One demo case at the bench, played by the engine: the guided diagnosis, the repair, the proof.

A simulated unit with the case's true fault (meter tolerance on, a few readings misread) is
measured in the order the engine proposes, and the engine's ranked suspects are kept after each
reading, until it concludes. The repair follows the conclusion: its parts are replaced at their
cost with their value written down, the parts it lists to test before power-up are tested and kept
as passed or failed (a failed one is then replaced). Then the verification checks the conclusion
names are read on the unit as repaired: if a failed part was missed, the readings show it, the
technician replaces what is still bad ("second look") and verifies again on the now healthy unit.
Bench minutes are the book minutes of every check, part and verification; the technician's pace is
applied by the writer.

Everything here is deterministic for a seed and touches no database.
"""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.engine import start_diagnosis
from fixbench.engine.follow import follow_planner
from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.readings import read
from fixbench.engine.repair_order import REPLACE_MINUTES
from fixbench.engine.simulate import simulated_unit
from fixbench.knowledge.design import Design
from fixbench.knowledge.model import Family, Part
from fixbench.physics.part_values import VALUE_UNITS, rated_voltage, value_of
from fixbench.physics.ratings import Ratings, parse_ratings
from fixbench.quantities import format_quantity
from fixbench.store.cases import RankedSuspect

WRONG_READING_RATE = 0.03  # a misread scale or a slipped probe, now and then [practice]
TEST_MINUTES = 3.0  # test one part out of circuit before power-up [practice]
MAX_READINGS = 60  # the engine concludes long before this; a guard, not a rule
KEPT_SUSPECTS = 5  # suspects kept per reading: the history shows the first three


@dataclass(frozen=True)
class BenchStep:
    """One reading the engine asked for, what the meter showed, and the suspects after it."""

    check_id: str
    typed: str
    value: float | None
    unit: str | None
    outcome: str | None
    suspects: tuple[RankedSuspect, ...]
    minutes: float


@dataclass(frozen=True)
class PartWork:
    part_id: str
    fault_id: str | None
    action: str  # "replaced" or "tested"
    cost_cents: int
    note: str
    minutes: float
    value_fitted: str | None = None  # a replaced part's value, as a technician writes it
    test_passed: bool | None = None  # a tested part's result


@dataclass(frozen=True)
class VerifyReading:
    check_id: str
    typed: str
    value: float | None
    unit: str | None
    outcome: str | None
    passed: bool
    minutes: float


@dataclass(frozen=True)
class RepairRound:
    work: tuple[PartWork, ...]
    verification: tuple[VerifyReading, ...]

    @property
    def passed(self) -> bool:
        return all(v.passed for v in self.verification)


@dataclass(frozen=True)
class BenchSession:
    """What the bench saw for one case: readings, the engine's verdict, and repair rounds."""

    steps: tuple[BenchStep, ...]
    concluded: tuple[str, ...]  # the engine's root fault (or group it could not split)
    confirmed_fault: str | None  # what the shop confirms once the unit works, None if nothing
    rounds: tuple[RepairRound, ...]

    @property
    def diagnosis_minutes(self) -> float:
        return sum(step.minutes for step in self.steps)

    @property
    def repair_minutes(self) -> float:
        return sum(w.minutes for r in self.rounds for w in r.work) + sum(
            v.minutes for r in self.rounds for v in r.verification)


def engine_bench_session(family: Family, ratings: dict, fault_id: str, seed: int,
                         repair: bool = True) -> BenchSession:
    """Diagnose a simulated unit with ``fault_id`` by the engine's own proposals; then repair it."""
    parsed = parse_ratings(ratings)
    unit = simulated_unit(family, parsed, fault_id, seed, wrong_rate=WRONG_READING_RATE)
    path = follow_planner(start_diagnosis(family, parsed), unit.measure, MAX_READINGS)
    steps = [BenchStep(step.proposal.check.id, step.reading.text, step.reading.value,
                       step.reading.unit, step.reading.outcome,
                       tuple(RankedSuspect.from_engine(s)
                             for s in step.after.suspects[:KEPT_SUSPECTS]),
                       float(step.proposal.minutes))
             for step in path.steps]
    state = path.final
    conclusion = state.final_conclusion()
    if not repair:
        return BenchSession(tuple(steps), conclusion.faults, None, ())
    failed = dict(unit.modes)  # every part really failed, including a fuse blown on the bench
    rounds, fixed = [], set()
    work = []
    for action in conclusion.replace:
        work.append(_replaced(family, parsed, action.part,
                              _root_of(family, conclusion.faults, action.part),
                              "replaced as the diagnosis concluded"))
        fixed.add(action.part)
    for action in conclusion.test_before_power:
        if action.part in fixed:
            continue
        passed = action.part not in failed
        work.append(PartWork(action.part, None, "tested", 0, "", TEST_MINUTES, test_passed=passed))
        if not passed:
            work.append(_replaced(family, parsed, action.part, None,
                                  "failed its test before power-up"))
            fixed.add(action.part)
    rounds.append(RepairRound(tuple(work), _verify(family, parsed, conclusion.verify, failed,
                                                   fixed, seed)))
    if not rounds[-1].passed:
        missed = [part for part in failed if part not in fixed]
        work = [_replaced(family, parsed, part, None,
                          "found on a second look after a failed check") for part in missed]
        fixed.update(missed)
        rounds.append(RepairRound(tuple(work), _verify(family, parsed, conclusion.verify, failed,
                                                       fixed, seed + 1)))
    confirmed = _confirmed(family, fault_id, conclusion.faults, failed, fixed)
    return BenchSession(tuple(steps), conclusion.faults, confirmed, tuple(rounds))


def _root_of(family: Family, faults: tuple[str, ...], part_id: str) -> str | None:
    return next((f for f in faults if f != NO_FAULT and family.fault(f).part == part_id), None)


def _replaced(family: Family, ratings: Ratings, part_id: str, fault_id: str | None,
              note: str) -> PartWork:
    part = family.part(part_id)
    return PartWork(part_id, fault_id, "replaced", round(part.cost * 100), note, REPLACE_MINUTES,
                    value_fitted=value_fitted(part, ratings, family.design))


def value_fitted(part: Part, ratings: Ratings, design: Design) -> str | None:
    """What a technician writes down for a new part: its value, with a capacitor's voltage rating
    ("22 uF 50 V"); None for a part bought by type (semiconductors, controllers, leads) and for a
    transformer, whose value in the family file is its winding resistance, not a marking."""
    if part.value is None or part.kind not in VALUE_UNITS or part.kind == "transformer":
        return None
    text = format_quantity(value_of(part, ratings, design), VALUE_UNITS[part.kind])
    if part.rated:
        text += " " + format_quantity(rated_voltage(part, ratings, design), "V")
    return text


def _verify(family, ratings, steps, failed: dict, fixed: set, seed: int) -> tuple:
    """The verification readings of the unit as repaired (still faulty where a part was missed)."""
    still_bad = {part: mode for part, mode in failed.items() if part not in fixed}
    unit = simulated_unit(family, ratings, NO_FAULT, seed, modes=still_bad)
    out = []
    for step in steps:
        check_model = unit.model.checks[unit.model.check_index(step.check)]
        reading = read(check_model, unit.measure(step.check))
        out.append(VerifyReading(step.check, reading.text, reading.value, reading.unit,
                                 reading.outcome, reading.in_band,
                                 float(check_model.check.minutes)))
    return tuple(out)


def _confirmed(family: Family, fault_id: str, concluded: tuple[str, ...], failed: dict,
               fixed: set) -> str | None:
    """The root fault the shop writes down once the unit works.

    With the true root's part replaced, the bad part was in hand: the true fault. If the unit
    verified without it (a fault the proof readings cannot see), the shop believes the engine.
    """
    if fault_id == NO_FAULT or not failed:
        return None
    if family.fault(fault_id).part in fixed:
        return fault_id
    return next((f for f in concluded if f != NO_FAULT), None)
