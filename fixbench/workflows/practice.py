"""Practice, as the trainee and the owner use it: rounds from the practice package (drawn, or
replayed from the shop's closed cases), the engine's par path, the debrief kept as an attempt,
a trainee's progress and every trainee's summary for the owner.

The one impure choice here is the seed of a new round, drawn from the operating system unless a
test gives one. The store's plain rows become practice's own values here, so the store and the
practice package never import each other.
"""

from __future__ import annotations

import random
from collections.abc import Callable
from dataclasses import dataclass

from fixbench.engine.hypotheses import NO_FAULT
from fixbench.knowledge.model import Family
from fixbench.practice.debrief import Debrief, debrief_round, fault_title
from fixbench.practice.engine_path import EnginePath, engine_path
from fixbench.practice.levels import LEVELS, level
from fixbench.knowledge import KnowledgeBase
from fixbench.practice.progress import AttemptRecord, Progress, attempt_fields, progress_of
from fixbench.practice.round import PracticeRound
from fixbench.practice.scenario import PastCase, draw_scenario, replay_scenario
from fixbench.store import owner, people, practice_cases
from fixbench.store.database import Store
from fixbench.store.practice_cases import TraineeSummary, trainee_summaries


@dataclass(frozen=True)
class FaultChoice:
    fault_id: str
    title: str
    part: str | None


def kept_attempts(store: Store, trainee_id: int) -> list[AttemptRecord]:
    """One trainee's kept attempts, oldest first, as practice reads them (with band and level)."""
    return [AttemptRecord(a.scenario, a.checks_used, a.minutes, a.score, a.safety_slips,
                          a.coach_used, a.fuse_blown)
            for a in practice_cases.attempts_of(store, trainee_id)]


def past_cases(store: Store, knowledge: KnowledgeBase) -> list[PastCase]:
    """The shop's closed cases a round can replay: families and faults this build still knows."""
    known = set(knowledge.families)
    cases = [PastCase(c.family_id, c.ratings, c.confirmed_fault, c.closed)
             for c in practice_cases.replayable_cases(store, known)]
    return [c for c in cases if c.confirmed_fault == NO_FAULT
            or c.confirmed_fault in {f.id for f in knowledge.family(c.family_id).faults}]


class PracticeRounds:
    """One trainee's rounds at a time: pick, play, debrief (kept), progress."""

    def __init__(self, store: Store, knowledge: KnowledgeBase,
                 seeds: Callable[[], int] | None = None) -> None:
        self.store, self.knowledge = store, knowledge
        self._seeds = seeds or (lambda: random.SystemRandom().randrange(1 << 30))
        self.trainee_id: int | None = None
        self.round: PracticeRound | None = None
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

    def start(self, family_id: str, level_id: str) -> PracticeRound:
        family = self.knowledge.family(family_id)
        return self._begin(family, draw_scenario(family, level(level_id), self._seeds()))

    def replay(self, case: PastCase, level_id: str) -> PracticeRound:
        family = self.knowledge.family(case.family_id)
        return self._begin(family, replay_scenario(family, case, level(level_id), self._seeds()))

    def _begin(self, family: Family, scenario) -> PracticeRound:
        self.round = PracticeRound(family, scenario)
        self.debrief, self.attempt_id = None, None
        return self.round

    # --- the round ---------------------------------------------------------------------------------

    def fault_choices(self) -> list[FaultChoice]:
        family = self.round.family
        choices = [FaultChoice(NO_FAULT, fault_title(family, NO_FAULT), None)]
        choices += [FaultChoice(f.id, f"{f.part}: {f.title}", f.part) for f in family.faults]
        return choices

    def commit(self, fault_id: str, parts: set[str]) -> None:
        self.round.commit(fault_id, parts)

    def engine_path_work(self) -> Callable[[], EnginePath]:
        """The engine's path on the same unit, as work for a background thread."""
        family, scenario = self.round.family, self.round.scenario
        return lambda: engine_path(family, scenario)

    def finish(self, path: EnginePath) -> Debrief:
        """The debrief, and the attempt kept for the trainee playing."""
        self.debrief = debrief_round(self.round, path)
        if self.trainee_id is not None:
            self.attempt_id = people.add_practice_attempt(
                self.store, trainee_id=self.trainee_id, **attempt_fields(self.round, self.debrief))
        return self.debrief

    # --- progress ----------------------------------------------------------------------------------

    def progress(self) -> Progress | None:
        if self.trainee_id is None:
            return None
        return progress_of(self.attempts())

    def attempts(self) -> list[AttemptRecord]:
        """The trainee's kept attempts, oldest first (none when no trainee is chosen)."""
        return [] if self.trainee_id is None else kept_attempts(self.store, self.trainee_id)

    def unlock_owner(self, passphrase: str) -> Callable[[], list[TraineeSummary]]:
        """Work for a background thread: check the owner's passphrase (slow by design), then sum up
        every trainee's rounds. Raises OwnerRequired on a wrong passphrase."""
        store = self.store

        def work() -> list[TraineeSummary]:
            owner.require_owner(store, passphrase)
            return trainee_summaries(store)
        return work
