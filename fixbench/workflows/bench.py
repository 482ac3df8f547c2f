"""The bench's work against the engine and the store, as plain functions (no Qt).

The controller runs each of these off the GUI thread. Each one that writes keeps its step in one
committed transaction before it returns, and computes what the screen will show next (suspects,
stage chances, next step, conclusion) so the GUI thread only reads cached results.
"""

from __future__ import annotations

import sys
import traceback
from dataclasses import dataclass, replace
from datetime import datetime

from fixbench.engine import start_diagnosis
from fixbench.engine.readings import Reading, read
from fixbench.physics.ratings import parse_ratings
from fixbench.quantities import ReadingError
from fixbench.store import StoreError, bench_log, cases, people, priors
from fixbench.store.cases import RankedSuspect


@dataclass(frozen=True)
class IntakeForm:
    ticket: str
    make: str
    model: str
    serial: str
    kind: str
    family_id: str
    ratings: dict[str, str]
    symptoms: tuple[str, ...]  # checks answered "yes" at intake (reported or seen)
    notes: str = ""


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

    @property
    def heading(self) -> str:
        return f"{self.ticket}  \u00b7  {self.make} {self.model}  \u00b7  {self.family_title}"


@dataclass(frozen=True)
class Loaded:
    case: CaseInView
    state: object  # DiagnosisState
    repairs: tuple[bench_log.LoggedRepair, ...] = ()
    verifications: tuple[bench_log.LoggedVerification, ...] = ()
    notice: str = ""


def person_message(err: Exception) -> str:
    """A short line for the person; an unexpected error is also printed in full for the developer."""
    if isinstance(err, (StoreError, ReadingError)):
        return str(err)
    if isinstance(err, OSError):
        return f"could not reach the database: {err}"
    traceback.print_exception(err, file=sys.stderr)
    return f"something went wrong ({type(err).__name__}: {err}); the last saved step is kept"


def warm(state) -> object:
    """Compute what the screen reads, here (off the GUI thread) rather than on first access."""
    _ = state.suspects, state.stage_chances, state.next_check, state.conclusion
    return state


def _suspects(state) -> list[RankedSuspect]:
    return [RankedSuspect(s.fault, s.probability, s.part, s.stage) for s in state.suspects]


def _keep(store, case_id: int, reading: Reading, state) -> None:
    cases.add_reading(store, case_id, check_id=reading.check, typed=reading.text, value=reading.value,
                      unit=reading.unit, outcome=reading.outcome, suspects=_suspects(state))


def open_new_case(store, knowledge, technician_id: int, form: IntakeForm) -> Loaded:
    family = knowledge.family(form.family_id)
    ratings = parse_ratings(form.ratings)
    device_id = bench_log.find_device(store, form.make, form.model, form.serial)
    if device_id is None:
        device_id = people.add_device(store, make=form.make.strip(), model=form.model.strip(),
                                      kind=form.kind, label_ratings=form.ratings,
                                      serial=form.serial.strip() or None)
    case_id = cases.open_case(store, ticket_ref=form.ticket.strip(), device_id=device_id,
                              technician_id=technician_id, family_id=family.id,
                              ratings=form.ratings, notes=form.notes)
    state = start_diagnosis(family, ratings, priors.confirmed_fault_counts(store, family.id))
    for check_id in form.symptoms:
        state = warm(state.with_reading(check_id, "yes"))
        _keep(store, case_id, state.readings[-1], state)
    record = bench_log.load_case(store, case_id)
    return Loaded(_case_view(record, family), warm(state), notice="Case opened.")


def resume_case(store, knowledge, case_id: int) -> Loaded:
    record = bench_log.load_case(store, case_id)
    family = knowledge.family(record.family_id)
    state = start_diagnosis(family, parse_ratings(record.ratings),
                            priors.confirmed_fault_counts(store, family.id))
    unread = []
    for logged in record.readings:
        try:
            state = state.with_reading(logged.check_id, logged.typed)
        except (ReadingError, KeyError):
            unread.append(logged.typed)  # the knowledge base changed since it was typed
    for check_id in record.skipped:
        if family.has_check(check_id):
            state = state.skip(check_id)
    notice = f"Resumed with {len(state.readings)} readings."
    if unread:
        notice += f" Not re-read (the checks changed): {', '.join(unread)}."
    return Loaded(_case_view(record, family), warm(state), record.repairs, record.verifications, notice)


def _case_view(record: bench_log.CaseRecord, family) -> CaseInView:
    return CaseInView(record.id, record.ticket, record.make, record.model, family.id, family.title,
                      record.ratings, record.status, record.opened_at, record.cautions_acknowledged)


def page_for(loaded: Loaded) -> str:
    if not loaded.case.cautions_acknowledged:
        return "cautions"
    return {"repairing": "repair", "verifying": "verify"}.get(loaded.case.status, "guided")


def acknowledge(store, case: CaseInView, technician_id: int | None) -> CaseInView:
    who = technician_id if technician_id is not None else _owner_of(store, case)
    bench_log.acknowledge_cautions(store, case.id, who)
    return replace(case, cautions_acknowledged=True)


def _owner_of(store, case: CaseInView) -> int:
    from fixbench.store.models import Case

    with store.session() as session:
        return session.get(Case, case.id).technician_id


def keep_reading(store, case: CaseInView, state) -> object:
    state = warm(state)
    _keep(store, case.id, state.readings[-1], state)
    return state


def keep_skip(store, case: CaseInView, state, check_id: str) -> object:
    bench_log.skip_check(store, case.id, check_id)
    return warm(state)


def keep_undo(store, case: CaseInView, state) -> object:
    bench_log.withdraw_last_reading(store, case.id)
    return warm(state)


def keep_repair(store, case: CaseInView, part_id: str, action: str, value_text: str,
                test_passed: bool | None, cost_cents: int) -> tuple[bench_log.LoggedRepair, ...]:
    """Keep a repair line: a replaced part with its value fitted, a tested part with its result."""
    cases.add_repair_action(store, case.id, part_id=part_id, action=action,
                            parts_cost_cents=cost_cents, value_fitted=value_text.strip() or None,
                            test_passed=test_passed)
    return bench_log.load_case(store, case.id).repairs


def verification_reading(state, check_id: str, text: str) -> Reading:
    """A verification reading read against the healthy band (ReadingError at once if mistyped)."""
    model = state.model
    return read(model.checks[model.check_index(check_id)], text)


def keep_verification(store, case: CaseInView, reading: Reading) -> tuple[bench_log.LoggedVerification, ...]:
    cases.add_verification(store, case.id, check_id=reading.check, typed=reading.text,
                           value=reading.value, unit=reading.unit, outcome=reading.outcome,
                           passed=reading.in_band)
    return bench_log.load_case(store, case.id).verifications


def keep_close(store, case: CaseInView, state, outcome: str, minutes: int, fault_id: str | None) -> None:
    part = stage = None
    family = state.family
    if fault_id is not None and fault_id in {f.id for f in family.faults}:
        part = family.fault(fault_id).part
        stage = family.part(part).stage
    elif fault_id is not None:
        fault_id = None  # "no fault in the supply" is not a part to count
    cases.close_case(store, case.id, outcome=outcome, bench_minutes=minutes,
                     confirmed_fault=fault_id, confirmed_part=part, confirmed_stage=stage)
