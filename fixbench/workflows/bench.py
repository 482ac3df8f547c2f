"""The bench's work on an open case against the engine and the store: resume it, take a reading,
skip or undo one, acknowledge the cautions, repair, verify, close.

The bench controller runs each of these off the GUI thread. Each one that writes keeps its step in
one committed transaction before it returns, and computes what the screen will show next
(suspects, stage chances, next step, conclusion) so the GUI thread only reads cached results.
Opening a new case at intake is :mod:`fixbench.workflows.intake`.
"""

from __future__ import annotations

import sys
import traceback
from dataclasses import dataclass, replace
from datetime import datetime

from fixbench.engine import DiagnosisState, start_diagnosis
from fixbench.engine.readings import Reading, read
from fixbench.engine.replay import replay_readings
from fixbench.knowledge import Family, KnowledgeBase
from fixbench.physics.ratings import parse_ratings
from fixbench.quantities import ReadingError
from fixbench.store import StoreError, cases, priors
from fixbench.store.case_record import CaseRecord, KeptRepair, KeptVerification, load_case_record
from fixbench.store.cases import RankedSuspect
from fixbench.store.database import Store
from fixbench.store.shop_terms import shop_terms
from fixbench.workflows.board_profiles import (KeptPhoto, PartEntry, board_of_model, board_photos,
                                               family_on_board, keep_entry)


@dataclass(frozen=True)
class CaseInView:
    id: int
    ticket: str
    make: str
    model: str
    family_id: str
    family_title: str
    ratings: dict[str, str]
    status: str
    opened_at: datetime
    cautions_acknowledged: bool
    technician_id: int  # who opened the case
    customer: str | None = None
    quoted_cents: int | None = None  # the price quoted at intake
    return_of: str | None = None  # the ticket this job is a warranty return of

    @property
    def heading(self) -> str:
        return f"{self.ticket}  \u00b7  {self.make} {self.model}  \u00b7  {self.family_title}"

    @property
    def expected_price(self) -> int | None:
        """What to charge, as far as intake knew: nothing for a warranty return, else the quote."""
        return 0 if self.return_of is not None else self.quoted_cents


@dataclass(frozen=True)
class Loaded:
    case: CaseInView
    state: DiagnosisState
    repairs: tuple[KeptRepair, ...] = ()
    verifications: tuple[KeptVerification, ...] = ()
    notice: str = ""
    photos: tuple[KeptPhoto, ...] = ()  # of the model's board, with their marked test points


def person_message(err: Exception) -> str:
    """A short line for the person; an unexpected error is also printed in full for the developer."""
    if isinstance(err, (StoreError, ReadingError)):
        return str(err)
    if isinstance(err, OSError):
        return f"could not reach the database: {err}"
    traceback.print_exception(err, file=sys.stderr)
    return f"something went wrong ({type(err).__name__}: {err}); the last saved step is kept"


def warm(state: DiagnosisState) -> DiagnosisState:
    """Compute what the screen reads, here (off the GUI thread) rather than on first access."""
    _ = state.suspects, state.stage_chances, state.next_check, state.conclusion
    return state


def keep(store: Store, case_id: int, reading: Reading, state: DiagnosisState) -> None:
    """Keep a reading as typed and parsed, with the engine's suspects after it."""
    cases.add_reading(store, case_id, check_id=reading.check, typed=reading.text,
                      value=reading.value, unit=reading.unit, outcome=reading.outcome,
                      suspects=[RankedSuspect.from_engine(s) for s in state.suspects])


def case_view(record: CaseRecord, family: Family) -> CaseInView:
    return CaseInView(record.id, record.ticket, record.make, record.model, family.id, family.title,
                      record.ratings, record.status, record.opened_at, record.cautions_acknowledged,
                      record.technician_id, record.customer_name, record.quoted_cents,
                      None if record.return_of is None else record.return_of.ticket)


class RatingsToCorrect(ReadingError):
    """A kept case whose label ratings the family cannot describe (kept before they were checked
    against it, or by an older fixbench): it opens once they are put right."""

    def __init__(self, case_id: int, ticket: str, ratings: dict[str, str], problem: str):
        self.case_id, self.ticket, self.ratings, self.problem = case_id, ticket, ratings, problem
        super().__init__(f"case {ticket} cannot be resumed as kept: {problem}. Put its label ratings "
                         "right to open it")


def resume_case(store: Store, knowledge: KnowledgeBase, case_id: int) -> Loaded:
    """The case where it was left: its standing readings replayed, its skips, repairs and
    verifications; a reading this build can no longer take is named in the notice. Ratings the
    family cannot describe raise :class:`RatingsToCorrect`."""
    record = load_case_record(store, case_id)
    try:
        family, ratings = family_on_board(knowledge.family(record.family_id), parse_ratings(record.ratings),
                                          board_of_model(store, record.model, record.family_id))
        start = start_diagnosis(family, ratings, priors.confirmed_fault_counts(store, family.id))
    except ReadingError as err:
        raise RatingsToCorrect(record.id, record.ticket, dict(record.ratings), str(err)) from None
    replayed = replay_readings(start, ((r.check_id, r.typed) for r in record.standing_readings))
    state = replayed.state
    for skipped in record.skipped:
        if family.has_check(skipped.check_id):
            state = state.skip(skipped.check_id)
    notice = f"Resumed with {len(state.readings)} readings."
    if replayed.refused:  # the knowledge base changed since they were typed
        notice += (" Not re-read (the checks changed): "
                   f"{', '.join(r.typed for r in replayed.refused)}.")
    if family.parts != knowledge.family(record.family_id).parts:
        notice += f" Board profile of {record.model}: {sum(p.marked or bool(p.designator) for p in family.parts)} parts."
    return Loaded(case_view(record, family), warm(state), record.repairs, record.verifications,
                  notice, board_photos(store, record.model, family.id))


def keep_board_marking(store: Store, knowledge: KnowledgeBase, case_id: int, entry: PartEntry) -> Loaded:
    """Keep what this board's part is called and marked with, for the case's model (the next unit
    of it arrives with it), and resume the case with every expected reading recomputed for it."""
    record = load_case_record(store, case_id)
    keep_entry(store, knowledge.family(record.family_id), record.model, entry)
    loaded = resume_case(store, knowledge, case_id)
    part = loaded.state.family.part(entry.part)
    said = f"marked {part.marking}" if part.marking else "its marking left out"
    return replace(loaded, notice=f"Kept for every {record.model}: {part.title} is {part.label}, {said}. "
                                  "Expected readings recomputed.")


def correct_ratings(store: Store, knowledge: KnowledgeBase, case_id: int,
                    ratings: dict[str, str]) -> Loaded:
    """Keep corrected label ratings for an open case, once the family can describe them, and
    resume it."""
    record = load_case_record(store, case_id)
    start_diagnosis(knowledge.family(record.family_id), parse_ratings(ratings))  # ReadingError if not
    cases.correct_ratings(store, case_id, ratings)
    return resume_case(store, knowledge, case_id)


def page_for(loaded: Loaded) -> str:
    if not loaded.case.cautions_acknowledged:
        return "cautions"
    return {"repairing": "repair", "verifying": "verify"}.get(loaded.case.status, "guided")


def acknowledge(store: Store, case: CaseInView, technician_id: int | None) -> CaseInView:
    """Keep that the cautions were read, by whoever is at the bench (else whoever opened it)."""
    who = technician_id if technician_id is not None else case.technician_id
    cases.acknowledge_cautions(store, case.id, who)
    return replace(case, cautions_acknowledged=True)


def keep_reading(store: Store, case: CaseInView, state: DiagnosisState) -> DiagnosisState:
    state = warm(state)
    keep(store, case.id, state.readings[-1], state)
    return state


def keep_skip(store: Store, case: CaseInView, state: DiagnosisState,
              check_id: str) -> DiagnosisState:
    cases.skip_check(store, case.id, check_id)
    return warm(state)


def keep_undo(store: Store, case: CaseInView, state: DiagnosisState) -> DiagnosisState:
    cases.withdraw_last_reading(store, case.id)
    return warm(state)


def keep_repair(store: Store, case: CaseInView, part_id: str, action: str, value_text: str,
                test_passed: bool | None, cost_cents: int) -> tuple[KeptRepair, ...]:
    """Keep a repair line: a replaced part with its value fitted, a tested part with its result."""
    cases.add_repair_action(store, case.id, part_id=part_id, action=action,
                            parts_cost_cents=cost_cents, value_fitted=value_text.strip() or None,
                            test_passed=test_passed)
    return load_case_record(store, case.id).repairs


def verification_reading(state: DiagnosisState, check_id: str, text: str) -> Reading:
    """A verification reading read against the healthy band (ReadingError at once if mistyped)."""
    model = state.model
    return read(model.checks[model.check_index(check_id)], text)


def keep_verification(store: Store, case: CaseInView,
                      reading: Reading) -> tuple[KeptVerification, ...]:
    cases.add_verification(store, case.id, check_id=reading.check, typed=reading.text,
                           value=reading.value, unit=reading.unit, outcome=reading.outcome,
                           passed=reading.in_band)
    return load_case_record(store, case.id).verifications


def keep_close(store: Store, case: CaseInView, state: DiagnosisState, outcome: str, minutes: int,
               fault_id: str | None, price_cents: int | None = None) -> None:
    """Close the case with its outcome, bench minutes, confirmed fault, the final price charged
    and the shop's labour rate now (kept with the job, so a later change of rate does not
    change what the job cost)."""
    part = stage = None
    family = state.family
    if fault_id is not None and fault_id in {f.id for f in family.faults}:
        part = family.fault(fault_id).part
        stage = family.part(part).stage
    elif fault_id is not None:
        fault_id = None  # "no fault in the supply" is not a part to count
    cases.close_case(store, case.id, outcome=outcome, bench_minutes=minutes,
                     confirmed_fault=fault_id, confirmed_part=part, confirmed_stage=stage,
                     price_cents=price_cents,
                     labour_rate_cents=shop_terms(store).labour_rate_cents)
