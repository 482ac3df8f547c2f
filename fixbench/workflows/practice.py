"""Practice, as the trainee and the owner use it: rounds from the practice package (drawn, chosen
where the trainee is weakest, or replayed from the shop's closed cases), the engine's par path, the
debrief kept as an attempt and opened again later, a trainee's progress, and every trainee's
summary with their weak faults and slips for the owner.

The impure choices here are the seed of a new round, drawn from the operating system, and the
clock, for the date an attempt is kept under and the curriculum's spacing; a test gives both. The store's plain rows become practice's own
values here, so the store and the practice package never import each other.
"""

from __future__ import annotations

import random
from collections.abc import Callable
from dataclasses import dataclass
from datetime import UTC, datetime

from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.readings import SYNONYMS
from fixbench.knowledge import KnowledgeBase
from fixbench.knowledge.model import Family
from fixbench.practice.curriculum import NextUnit, next_unit, weaknesses
from fixbench.practice.debrief import Debrief, debrief_round
from fixbench.practice.engine_path import engine_path
from fixbench.practice.explain import fault_title
from fixbench.practice.levels import LEVELS, level
from fixbench.practice.progress import AttemptRecord, Progress, attempt_fields, progress_of
from fixbench.practice.record import RecordError, ReopenedRound, reopen, scenario_of
from fixbench.practice.round import PracticeRound
from fixbench.practice.safety import NAMES as SLIP_NAMES
from fixbench.practice.scenario import PastCase, Scenario, draw_scenario, replay_scenario
from fixbench.practice.unit import complaint_checks
from fixbench.store import owner, people, practice_cases
from fixbench.store.database import Store
from fixbench.store.practice_cases import KeptAttempt, TraineeSummary, trainee_summaries
from fixbench.workflows.trade_names import TradeNames


YES_WORDS = SYNONYMS["yes"]


@dataclass(frozen=True)
class FaultChoice:
    fault_id: str
    title: str
    part: str | None


@dataclass(frozen=True)
class ReplayChoice:
    """A closed case as the pick screen lists it: never its fault, always what tells it apart."""

    case: PastCase
    closed: str  # "2024-05"
    family: str  # the family's title
    unit: str  # "12 V / 2 A, 230 V"
    said: str  # what the customer reported when it came in


@dataclass(frozen=True)
class TraineeOverview:
    """What the owner sees of one trainee: the summary, the faults missed and the slips by kind."""

    summary: TraineeSummary
    weak_faults: tuple[str, ...]  # "Start-up resistor open (missed 2 of 3)", weakest first
    slips: tuple[str, ...]  # "plain mains before the lamp: 2"


def attempt_of(kept: KeptAttempt) -> AttemptRecord:
    when = kept.attempted_at
    return AttemptRecord(kept.scenario, kept.checks_used, kept.minutes, kept.score, kept.safety_slips,
                         kept.coach_used, kept.fuse_blown, kept.attempt_id,
                         when.toordinal() if when else None, when.strftime("%Y-%m-%d") if when else "",
                         kept.fault_right, tuple(k for k in (kept.slip_kinds or "").split(",") if k),
                         kept.checks_wasted, kept.has_record)


def kept_attempts(store: Store, trainee_id: int) -> list[AttemptRecord]:
    """One trainee's kept attempts, oldest first, as practice reads them (with band and level)."""
    return [attempt_of(a) for a in practice_cases.attempts_of(store, trainee_id)]


def past_cases(store: Store, knowledge: KnowledgeBase) -> list[PastCase]:
    """The shop's closed cases a round can replay (families and faults this build still knows),
    with what each customer said when it came in."""
    known = set(knowledge.families)
    told = {c.id for f in knowledge.families.values() for c in complaint_checks(f)}
    cases = [PastCase(c.family_id, c.ratings, c.confirmed_fault, c.closed, c.told)
             for c in practice_cases.replayable_cases(store, known, told_checks=told)]
    return [c for c in cases if c.confirmed_fault == NO_FAULT
            or c.confirmed_fault in {f.id for f in knowledge.family(c.family_id).faults}]


def replay_choices(knowledge: KnowledgeBase, cases: list[PastCase]) -> list[ReplayChoice]:
    out = []
    for case in cases:
        family = knowledge.family(case.family_id)
        r = case.ratings
        unit = f"{r.get('output', '?')} / {r.get('current', '?')}, {r.get('bench_mains', r.get('mains', '?'))}"
        said = [family.check(c).title for c, a in case.told
                if family.has_check(c) and a.strip().lower() in YES_WORDS]
        out.append(ReplayChoice(case, case.closed, family.title, unit,
                                "; ".join(said) if said else "nothing specific" if case.told else "not kept"))
    return out


def trainee_overviews(store: Store, knowledge: KnowledgeBase) -> list[TraineeOverview]:
    """Every trainee summed up, with the faults they miss and the slips they make."""
    attempts = practice_cases.every_trainees_attempts(store)
    names = TradeNames(knowledge)
    out = []
    for summary in trainee_summaries(store):
        found = weaknesses([attempt_of(a) for a in attempts.get(summary.trainee_id, [])])
        faults = [f"{names.fault(item.fault_id, item.family_id)} (missed {item.missed} of {item.rounds})"
                  for item in found.weak_faults()]
        slips = tuple(f"{SLIP_NAMES.get(kind, kind)}: {n}" for kind, n in
                      sorted(found.slips.items(), key=lambda kv: -kv[1]))
        out.append(TraineeOverview(summary, tuple(faults), slips))
    return out


class PracticeRounds:
    """One trainee's rounds at a time: pick, play, debrief (kept), progress, reopen."""

    def __init__(self, store: Store, knowledge: KnowledgeBase, seeds: Callable[[], int] | None = None,
                 clock: Callable[[], datetime] | None = None) -> None:
        self.store, self.knowledge = store, knowledge
        self._seeds = seeds or (lambda: random.SystemRandom().randrange(1 << 30))
        # The shop keeps times in UTC: the curriculum's days and the attempts' dates agree.
        self.clock = clock or (lambda: datetime.now(UTC).replace(tzinfo=None))
        self.trainee_id: int | None = None
        self.round: PracticeRound | None = None
        self.chosen_why: str | None = None  # why the curriculum chose the unit in play
        self.debrief: Debrief | None = None
        self.attempt_id: int | None = None

    # --- picking -----------------------------------------------------------------------------------

    def trainees(self) -> list[tuple[int, str]]:
        return [(t.id, t.name) for t in people.technicians(self.store, role="trainee") if t.active]

    def families(self) -> list[Family]:
        return sorted(self.knowledge.families.values(), key=lambda f: f.title)

    def levels(self):
        return list(LEVELS.values())

    def past_cases(self) -> list[PastCase]:
        return past_cases(self.store, self.knowledge)

    def replay_choices(self) -> list[ReplayChoice]:
        return replay_choices(self.knowledge, self.past_cases())

    def start(self, family_id: str, level_id: str) -> PracticeRound:
        family = self.knowledge.family(family_id)
        return self._begin(family, draw_scenario(family, level(level_id), self._seeds()))

    def next_for_trainee(self, level_id: str) -> NextUnit:
        """The unit the curriculum draws where this trainee is weakest (anyone: a fault not yet
        practised), started."""
        families = sorted(self.knowledge.families.values(), key=lambda f: f.id)
        chosen = next_unit(families, self.attempts(), level(level_id), self.clock().date().toordinal(), self._seeds())
        self._begin(self.knowledge.family(chosen.scenario.family_id), chosen.scenario, chosen.words)
        return chosen

    def replay(self, case: PastCase, level_id: str) -> PracticeRound:
        family = self.knowledge.family(case.family_id)
        return self._begin(family, replay_scenario(family, case, level(level_id), self._seeds()))

    def _begin(self, family: Family, scenario: Scenario, why: str | None = None) -> PracticeRound:
        self.round = PracticeRound(family, scenario)
        self.chosen_why = why
        self.debrief, self.attempt_id = None, None
        return self.round

    # --- the round ---------------------------------------------------------------------------------

    def fault_choices(self) -> list[FaultChoice]:
        family = self.round.family
        choices = [FaultChoice(f.id, f"{f.part}: {f.title}", f.part) for f in family.faults]
        return choices + [FaultChoice(NO_FAULT, fault_title(family, NO_FAULT), None)]

    def commit(self, fault_id: str, parts: set[str]) -> None:
        self.round.commit(fault_id, parts)

    def debrief_work(self) -> Callable[[], Debrief]:
        """The engine's path on the same unit and the debrief against it, as work for a background
        thread (together they take longer than a screen should wait)."""
        practice = self.round
        return lambda: debrief_round(practice, engine_path(practice.family, practice.scenario))

    def finish(self, debrief: Debrief) -> Debrief:
        """Keep the attempt for the trainee playing."""
        self.debrief = debrief
        if self.trainee_id is not None:
            self.attempt_id = people.add_practice_attempt(
                self.store, trainee_id=self.trainee_id, attempted_at=self.clock(),
                **attempt_fields(self.round, self.debrief))
        return self.debrief

    # --- progress ----------------------------------------------------------------------------------

    def progress(self) -> Progress | None:
        if self.trainee_id is None:
            return None
        return progress_of(self.attempts())

    def attempts(self) -> list[AttemptRecord]:
        """The trainee's kept attempts, oldest first (none when no trainee is chosen)."""
        return [] if self.trainee_id is None else kept_attempts(self.store, self.trainee_id)

    def reopen_work(self, attempt_id: int) -> Callable[[], ReopenedRound]:
        """Work for a background thread: a kept round played again from its record and debriefed.
        Raises RecordError when the round was kept without a record this build can read."""
        store, knowledge = self.store, self.knowledge

        def work() -> ReopenedRound:
            record = practice_cases.attempt_record(store, attempt_id)
            if record is None:
                raise RecordError("this round was kept before debriefs were, so it cannot be opened again")
            family_id = scenario_of(record).family_id
            if family_id not in knowledge.families:
                raise RecordError("this round's supply family is no longer in the knowledge base")
            return reopen(knowledge.family(family_id), record)
        return work

    def unlock_owner(self, passphrase: str) -> Callable[[], list[TraineeOverview]]:
        """Work for a background thread: check the owner's passphrase (slow by design), then sum up
        every trainee's rounds. Raises OwnerRequired on a wrong passphrase."""
        store, knowledge = self.store, self.knowledge

        def work() -> list[TraineeOverview]:
            owner.require_owner(store, passphrase)
            return trainee_overviews(store, knowledge)
        return work
