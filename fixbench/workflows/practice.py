"""The practice screen's controller: rounds from the practice package, attempts kept in the store.

Plain Python (no widgets), so the screen's logic is tested without a window. The one impure choice
here is the seed of a new round, drawn from the operating system unless a test gives one.
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
from fixbench.practice.progress import Progress, attempt_fields, progress_of
from fixbench.practice.round import PracticeRound
from fixbench.practice.scenario import PastCase, draw_scenario, replay_scenario
from fixbench.store import owner, people
from fixbench.store.practice_cases import (TraineeSummary, attempts_of, replayable_cases,
                                           trainee_summaries)
from fixbench.ui.context import AppContext


@dataclass(frozen=True)
class FaultChoice:
    fault_id: str
    title: str
    part: str | None


class PracticeController:
    def __init__(self, context: AppContext, seeds: Callable[[], int] | None = None) -> None:
        self.context = context
        self._seeds = seeds or (lambda: random.SystemRandom().randrange(1 << 30))
        self.trainee_id: int | None = None
        self.round: PracticeRound | None = None
        self.debrief: Debrief | None = None
        self.attempt_id: int | None = None

    # --- picking -----------------------------------------------------------------------------------

    def trainees(self) -> list[tuple[int, str]]:
        return [(t.id, t.name) for t in people.technicians(self.context.store, role="trainee") if t.active]

    def families(self) -> list[Family]:
        return sorted(self.context.knowledge.families.values(), key=lambda f: f.title)

    def levels(self):
        return list(LEVELS.values())

    def past_cases(self) -> list[PastCase]:
        known = set(self.context.knowledge.families)
        cases = replayable_cases(self.context.store, known)
        return [c for c in cases if c.confirmed_fault == NO_FAULT
                or c.confirmed_fault in {f.id for f in self.context.knowledge.family(c.family_id).faults}]

    def start(self, family_id: str, level_id: str) -> PracticeRound:
        family = self.context.knowledge.family(family_id)
        return self._begin(family, draw_scenario(family, level(level_id), self._seeds()))

    def replay(self, case: PastCase, level_id: str) -> PracticeRound:
        family = self.context.knowledge.family(case.family_id)
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
                self.context.store, trainee_id=self.trainee_id, **attempt_fields(self.round, self.debrief))
        return self.debrief

    # --- progress ----------------------------------------------------------------------------------

    def progress(self) -> Progress | None:
        if self.trainee_id is None:
            return None
        return progress_of(attempts_of(self.context.store, self.trainee_id))

    def unlock_owner(self, passphrase: str) -> Callable[[], list[TraineeSummary]]:
        """Work for a background thread: check the owner's passphrase (slow by design), then sum up
        every trainee's rounds. Raises OwnerRequired on a wrong passphrase."""
        store = self.context.store

        def work() -> list[TraineeSummary]:
            owner.require_owner(store, passphrase)
            return trainee_summaries(store)
        return work
