"""The debrief after a committed round: right or wrong, minutes against the engine's par, the
checks that told the most and those that told nothing, the safety slips with why they are
dangerous, and the trainee's path beside the engine's.

"Told the most" is the actual narrowing of the root fault each reading caused (entropy drop, in
bits); "told nothing" is a check that, given the readings before it, could not tell anything worth
its minutes (the planner's own MIN_INFORMATION), which judges the choice and not the luck.
Safety steps (the discharge confirmation) tell nothing by design and are never listed as wasted.
"""

from __future__ import annotations

from dataclasses import dataclass
from itertools import zip_longest

from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.planner import MIN_INFORMATION
from fixbench.knowledge.model import Family
from fixbench.practice.engine_path import EnginePath, EngineStep
from fixbench.practice.round import PracticeRound, RoundError, Step
from fixbench.practice.safety import Slip
from fixbench.practice.scoring import Score, score_round

MOST_SHOWN = 3
TOLD_MUCH = 0.1  # bits: a reading that narrowed the fault less than this is not among the telling ones
NO_FAULT_TITLE = "No fault in the supply (device or its cable)"


@dataclass(frozen=True)
class PartLine:
    part: str
    title: str
    verdict: str  # "failed, replaced" / "failed, missed" / "good, replaced needlessly"


@dataclass(frozen=True)
class Debrief:
    scenario_id: str
    score: Score
    true_fault: str  # title
    same_group: tuple[str, ...]  # titles of faults no check tells from the true one
    named_fault: str  # title
    parts: tuple[PartLine, ...]
    most_telling: tuple[Step, ...]
    told_nothing: tuple[Step, ...]
    slips: tuple[Slip, ...]
    pairs: tuple[tuple[Step | None, EngineStep | None], ...]  # trainee's path beside the engine's
    engine: EnginePath
    engine_fault: str  # title
    engine_right: bool
    coach_looks: int
    coach_first_after: int | None  # readings taken when the coach was first asked
    fault_away: tuple[int, ...]  # steps read while an intermittent fault was away
    misleading: tuple[int, ...]  # steps where the customer's report was wrong

    @property
    def right(self) -> bool:
        return self.score.fault_right


def fault_title(family: Family, fault_id: str) -> str:
    return NO_FAULT_TITLE if fault_id == NO_FAULT else family.fault(fault_id).title


def _part_lines(family: Family, score: Score) -> tuple[PartLine, ...]:
    lines = []
    for part_id in sorted(score.parts_needed | score.parts_named):
        if part_id in score.parts_needed:
            verdict = "failed, replaced" if part_id in score.parts_named else "failed, missed"
        else:
            verdict = "good, replaced needlessly"
        lines.append(PartLine(part_id, family.part(part_id).title, verdict))
    return tuple(lines)


def debrief_round(practice: PracticeRound, engine: EnginePath) -> Debrief:
    if practice.commitment is None:
        raise RoundError("commit a diagnosis before the debrief")
    family, model, scenario = practice.family, practice.state.model, practice.scenario
    group = model.group_of(scenario.fault_id)
    score = score_round(true_group=group, failed_parts=practice.unit.failed_parts,
                        fault_named=practice.commitment.fault_id, parts_named=practice.commitment.parts,
                        minutes=practice.clock, par=engine.minutes, slips=practice.slips)
    steps = practice.steps
    telling = sorted((s for s in steps if s.bits_told >= TOLD_MUCH), key=lambda s: (-s.bits_told, s.number))
    nothing = tuple(s for s in steps if not s.procedure and s.bits_possible < MIN_INFORMATION)
    looks = practice.coach_looks
    return Debrief(
        scenario_id=scenario.id, score=score, true_fault=fault_title(family, scenario.fault_id),
        same_group=tuple(fault_title(family, f) for f in group if f != scenario.fault_id),
        named_fault=fault_title(family, practice.commitment.fault_id), parts=_part_lines(family, score),
        most_telling=tuple(telling[:MOST_SHOWN]), told_nothing=nothing, slips=practice.slips,
        pairs=tuple(zip_longest(steps, engine.steps)), engine=engine,
        engine_fault=fault_title(family, engine.fault_id), engine_right=engine.fault_id in group,
        coach_looks=len(looks), coach_first_after=looks[0].after_step if looks else None,
        fault_away=tuple(s.number for s in steps if s.fault_away),
        misleading=tuple(s.number for s in steps if s.misleading),
    )
