"""The debrief after a committed round, in plain words.

Right or wrong; the score and what took points; for each of the trainee's steps the reading beside
what a healthy unit reads, what it told (the suspects it raised or cleared), and the check the
engine would have taken at that point with why; the first reading that settled the fault; for a
wrong verdict, the reading that contradicts it (:mod:`fixbench.practice.contradiction`); the
checks that told the most and those that told nothing, each with the earlier reading that had
already settled it (a part tested before power-up, one the conclusion at that point would replace
or test, is a careful check, never a waste); each kind of safety slip once, with why it is
dangerous; and the engine's own path with its reasons.

"Told the most" ranks by the narrowing of the root fault each reading caused (an entropy drop,
used for ranking only and never shown); a reading taken in a slip is not praised. "Told nothing"
is a check that, given the readings before it, could not tell anything worth its minutes (the
planner's own MIN_INFORMATION), which judges the choice and not the luck. Safety steps (the
discharge confirmation) tell nothing by design and are never listed as wasted.
"""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.engine.diagnosis import DiagnosisState, start_diagnosis
from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.inference import entropy_bits, information_about_root
from fixbench.engine.planner import CLEAR_ROOT, MIN_INFORMATION, group_chances
from fixbench.knowledge.model import Family
from fixbench.practice.contradiction import Contradiction, verdict_contradiction
from fixbench.practice.engine_path import EnginePath
from fixbench.practice.explain import (complaint_words, fault_title, healthy_words, root_chances, what_it_told,
                                       why_engine_chose)
from fixbench.practice.round import PracticeRound, RoundError, Step
from fixbench.practice.safety import Slip
from fixbench.practice.scoring import Score, score_round

MOST_SHOWN = 3
TOLD_MUCH = 0.1  # narrowing (entropy drop) under which a reading is not among the telling ones


@dataclass(frozen=True)
class PartLine:
    part: str
    title: str
    verdict: str  # "failed, replaced" / "failed, missed" / "good, replaced needlessly"


@dataclass(frozen=True)
class StepReview:
    step: Step
    shown: str  # the reading as the meter shows it
    healthy: str  # what a healthy unit reads there
    in_band: bool
    told: str  # the suspects it raised or cleared, in words
    engine_title: str | None  # the check the engine would have taken at this point
    engine_why: str
    settled_by: str | None  # for a check that told nothing: the earlier reading that had settled it
    narrowing: float  # for ranking only

    @property
    def same_as_engine(self) -> bool:
        return self.engine_title == self.step.title

    @property
    def told_nothing(self) -> bool:
        return self.settled_by is not None


@dataclass(frozen=True)
class SlipLesson:
    kind: str
    what: str
    why: str
    steps: tuple[int, ...]  # where the mistake was made (counted once each)
    shouts: int  # times a colleague stopped it, repeats included


@dataclass(frozen=True)
class Debrief:
    scenario_id: str
    score: Score
    true_fault: str  # title
    same_group: tuple[str, ...]  # titles of faults no check tells from the true one
    named_fault: str  # title
    complaint: tuple[tuple[str, str], ...]  # (question check id, the customer's answer)
    complaint_words: str
    parts: tuple[PartLine, ...]
    reviews: tuple[StepReview, ...]
    settled: str | None  # the first reading after which the true fault was clear
    true_chance: float  # the true fault's group's chance when the trainee committed
    contradiction: Contradiction | None
    slips: tuple[Slip, ...]  # each mistake once
    lessons: tuple[SlipLesson, ...]
    engine: EnginePath
    engine_fault: str  # title
    engine_right: bool
    coach_looks: int
    coach_first_after: int | None  # readings taken when the coach was first asked
    fault_away: tuple[int, ...]  # steps read while an intermittent fault was away
    misleading: tuple[str, ...]  # complaint answers that were wrong

    @property
    def right(self) -> bool:
        return self.score.fault_right

    @property
    def most_telling(self) -> tuple[StepReview, ...]:
        telling = [r for r in self.reviews if r.narrowing >= TOLD_MUCH and r.step.slip is None]
        return tuple(sorted(telling, key=lambda r: (-r.narrowing, r.step.number))[:MOST_SHOWN])

    @property
    def told_nothing(self) -> tuple[StepReview, ...]:
        return tuple(r for r in self.reviews if r.told_nothing)


def _part_lines(family: Family, score: Score) -> tuple[PartLine, ...]:
    lines = []
    for part_id in sorted(score.parts_needed | score.parts_named):
        if part_id in score.parts_needed:
            verdict = "failed, replaced" if part_id in score.parts_named else "failed, missed"
        else:
            verdict = "good, replaced needlessly"
        lines.append(PartLine(part_id, family.part(part_id).title, verdict))
    return tuple(lines)


def _root_entropy(state: DiagnosisState) -> float:
    return entropy_bits(root_chances(state))


def _information(state: DiagnosisState, check_id: str) -> float:
    return information_about_root(state.model, state.posterior, state.model.check_index(check_id))


def _settled_by(practice: PracticeRound, number: int) -> str | None:
    """For a step that could tell nothing, the earlier reading after which it could not."""
    states, step = practice.states, practice.steps[number - 1]
    if step.procedure or _information(states[number - 1], step.check_id) >= MIN_INFORMATION:
        return None
    same = [s for s in practice.steps[:number - 1] if s.check_id == step.check_id]
    if same:  # the same check taken before: that reading is the one that settled it
        return f"step {same[-1].number}, the same check ({states[same[-1].number].readings[-1].shown()})"
    for j in range(number - 1, 0, -1):
        if _information(states[j - 1], step.check_id) >= MIN_INFORMATION:
            earlier = practice.steps[j - 1]
            return f"step {j}, {earlier.title} ({states[j].readings[-1].shown()})"
    bare = start_diagnosis(practice.family, practice.scenario.parsed_ratings())
    if _information(bare, step.check_id) >= MIN_INFORMATION:
        return "the customer's complaint"
    return "nothing: on this unit it cannot tell one suspect from another"


def _careful_part(before: DiagnosisState, check_id: str) -> str | None:
    """The part a check tests before power-up: one the conclusion at that point would replace or
    test besides the leading fault's own part, not read before. Such a check tells little about
    the root fault and is no waste."""
    family = before.family
    check = family.check(check_id)
    if check.power != "cold" or check.target_kind != "part":
        return None
    if any(family.check(r.check).target == check.target for r in before.readings):
        return None
    conclusion = before.final_conclusion()
    roots = {family.fault(f).part for f in conclusion.faults if f != NO_FAULT}
    wanted = {a.part for a in conclusion.replace + conclusion.test_before_power} - roots
    return check.target_id if check.target_id in wanted else None


def _told(before: DiagnosisState, after: DiagnosisState, step: Step, careful: str | None) -> str:
    if step.procedure:
        return "A safety step: it tells nothing about the fault, by design"
    told = what_it_told(before, after).words()
    if careful is None:
        return told
    found = "failed: replace it" if after.readings[-1].in_band is False else "healthy"
    return (f"A check before power-up: {careful} ({before.family.part(careful).title}) is often damaged "
            f"along with the leading suspect; it read {found}. {told[0].upper()}{told[1:]}")


def _review(practice: PracticeRound, step: Step) -> StepReview:
    before, after = practice.states[step.number - 1], practice.states[step.number]
    reading = after.readings[-1]
    proposal = before.next_check
    careful = _careful_part(before, step.check_id)
    return StepReview(step, reading.shown(), healthy_words(before, step.check_id), reading.in_band,
                      _told(before, after, step, careful),
                      proposal.title if proposal is not None else None,
                      why_engine_chose(before, proposal.check.id) if proposal is not None
                      else "it would have stopped here and named the leading suspect",
                      None if careful else _settled_by(practice, step.number),
                      _root_entropy(before) - _root_entropy(after))


def _settled(practice: PracticeRound, group: tuple[str, ...]) -> str | None:
    for i, state in enumerate(practice.states):
        if dict(group_chances(state.model, state.posterior)).get(group, 0.0) >= CLEAR_ROOT:
            if i == 0:
                return "the customer's complaint"
            step = practice.steps[i - 1]
            return f"step {i}, {step.title}: {state.readings[-1].shown()}"
    return None


def _lessons(practice: PracticeRound) -> tuple[SlipLesson, ...]:
    lessons = []
    for slip in practice.slips:
        if any(lesson.kind == slip.kind for lesson in lessons):
            continue
        steps = tuple(s.step for s in practice.slips if s.kind == slip.kind)
        shouts = sum(stop.slip.kind == slip.kind for stop in practice.stops)
        lessons.append(SlipLesson(slip.kind, slip.what, slip.why, steps, shouts))
    return tuple(lessons)


def debrief_round(practice: PracticeRound, engine: EnginePath) -> Debrief:
    if practice.commitment is None:
        raise RoundError("commit a diagnosis before the debrief")
    family, model, scenario = practice.family, practice.state.model, practice.scenario
    group = model.group_of(scenario.fault_id)
    named = practice.commitment.fault_id
    looks = practice.coach_looks
    score = score_round(true_group=group, failed_parts=practice.unit.failed_parts, fault_named=named,
                        parts_named=practice.commitment.parts, minutes=practice.clock, par=engine.minutes,
                        slips=practice.slips, coach_looks=len(looks))
    right = named in group
    return Debrief(
        scenario_id=scenario.id, score=score, true_fault=fault_title(family, scenario.fault_id),
        same_group=tuple(fault_title(family, f) for f in group if f != scenario.fault_id),
        named_fault=fault_title(family, named),
        complaint=tuple((c, a.text) for c, a in practice.complaint),
        complaint_words=complaint_words(family, tuple((c, a.text) for c, a in practice.complaint)),
        parts=_part_lines(family, score), reviews=tuple(_review(practice, s) for s in practice.steps),
        settled=_settled(practice, group),
        true_chance=dict(group_chances(model, practice.state.posterior)).get(group, 0.0),
        contradiction=None if right else verdict_contradiction(practice, engine.steps, named, group),
        slips=practice.slips, lessons=_lessons(practice), engine=engine,
        engine_fault=fault_title(family, engine.fault_id), engine_right=engine.fault_id in group,
        coach_looks=len(looks), coach_first_after=looks[0].after_step if looks else None,
        fault_away=tuple(s.number for s in practice.steps if s.fault_away),
        misleading=tuple(family.check(c).title for c, a in practice.complaint if a.misleading),
    )
