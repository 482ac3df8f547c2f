"""One case as it stands in the record, read back whole: the one way every caller loads a case.

The bench resumes from it, the case window tells its story from it, the customer's job report and
the case export are written from it. It is read through :meth:`Store.reading` (a plain read
transaction: it never waits for or takes the write lock) and returned as frozen values, so nothing
outside the store holds a session.

The one rule for readings taken back with "undo": a reading is withdrawn when it has a row in
``withdrawn_readings``. Withdrawn readings stay in the record (with when they were taken back) and
are left out of :attr:`CaseRecord.standing_readings`, which is what the engine is given.
"""

from __future__ import annotations

import json
from dataclasses import dataclass
from datetime import datetime
from typing import Any

from sqlalchemy import select
from sqlalchemy.orm import selectinload

from fixbench.store.cases import RankedSuspect
from fixbench.store.database import Store
from fixbench.store.errors import CaseNotFound
from fixbench.store.models import (Amendment, Case, CautionAcknowledgement, ReadingRow,
                                   RepairAction, SkippedCheck, Verification, WithdrawnReading)


@dataclass(frozen=True)
class KeptReading:
    """A reading as the bench kept it: as typed, as parsed, and the suspects ranked after it."""

    id: int
    seq: int
    check_id: str
    typed: str
    value: float | None
    unit: str | None
    outcome: str | None
    entered_at: datetime
    suspects: tuple[RankedSuspect, ...]  # the engine's ranked list after it, first suspect first
    withdrawn_at: datetime | None  # taken back with "undo" at this moment; None while it stands

    @property
    def standing(self) -> bool:
        return self.withdrawn_at is None


@dataclass(frozen=True)
class KeptRepair:
    part_id: str
    fault_id: str | None
    action: str  # "replaced" or "tested"
    cost_cents: int
    value_fitted: str | None  # a replaced part's new value, as written
    test_passed: bool | None  # a tested part's result (None for a replaced part)
    note: str
    done_at: datetime


@dataclass(frozen=True)
class KeptVerification:
    check_id: str
    typed: str
    passed: bool
    entered_at: datetime


@dataclass(frozen=True)
class KeptSkip:
    check_id: str
    skipped_at: datetime


@dataclass(frozen=True)
class KeptAmendment:
    field: str
    old_value: Any  # decoded from the JSON text kept
    new_value: Any
    amended_by: str
    amended_at: datetime
    reason: str


@dataclass(frozen=True)
class LinkedJob:
    """A job linked to this one as its warranty return, or the job this one is a return of."""

    id: int
    ticket: str
    opened_at: datetime
    closed_at: datetime | None
    outcome: str | None
    notes: str  # the customer's words at intake: why it came back
    confirmed_fault: str | None
    family_id: str


@dataclass(frozen=True)
class CaseRecord:
    """Everything recorded under one case, oldest first within each list."""

    id: int
    ticket: str
    customer_id: int | None
    customer_name: str | None
    customer_contact: str | None
    status: str
    outcome: str | None
    family_id: str
    ratings: dict[str, str]
    notes: str
    opened_at: datetime
    closed_at: datetime | None
    bench_minutes: int | None
    confirmed_fault: str | None
    confirmed_part: str | None
    confirmed_stage: str | None
    top_suspect_fault: str | None  # the engine's first suspect after the last standing reading
    make: str
    model: str
    kind: str
    serial: str | None
    technician_id: int
    technician: str  # the technician's name
    readings: tuple[KeptReading, ...]  # every reading taken, withdrawn ones included, by seq
    skipped: tuple[KeptSkip, ...]
    repairs: tuple[KeptRepair, ...]
    verifications: tuple[KeptVerification, ...]
    amendments: tuple[KeptAmendment, ...]
    cautions_acknowledged: bool
    quoted_cents: int | None = None
    price_cents: int | None = None
    parts_cents: int = 0
    labour_rate_cents: int | None = None  # per hour, as closed
    return_of: LinkedJob | None = None  # this job is a warranty return of that one
    returns: tuple[LinkedJob, ...] = ()  # the warranty returns of this job, oldest first

    @property
    def standing_readings(self) -> tuple[KeptReading, ...]:
        """The readings the diagnosis rests on: every one not taken back, in the order taken."""
        return tuple(r for r in self.readings if r.standing)

    @property
    def withdrawn_readings(self) -> tuple[KeptReading, ...]:
        return tuple(r for r in self.readings if not r.standing)

    def as_closed(self, field: str) -> Any:
        """The value a field had when the case was closed: the old value of its first amendment,
        or the value it has now if it was never amended."""
        first = next((a for a in self.amendments if a.field == field), None)
        return getattr(self, field) if first is None else first.old_value


def load_case_record(store: Store, case_id: int | None = None, *,
                     ticket: str | None = None) -> CaseRecord:
    """The case with this id (or ticket reference), whole; CaseNotFound (a StoreInputError) if there is none."""
    if (case_id is None) == (ticket is None):
        raise ValueError("give a case id or a ticket reference")
    with store.reading() as session:
        if case_id is not None:
            case = session.get(Case, case_id)
        else:
            case = session.scalar(select(Case).where(Case.ticket_ref == ticket))
        if case is None:
            raise CaseNotFound(f"there is no case {case_id if ticket is None else ticket}")
        return _record(session, case)


def _record(session, case: Case) -> CaseRecord:
    rows = session.scalars(select(ReadingRow).where(ReadingRow.case_id == case.id)
                           .options(selectinload(ReadingRow.suspects))
                           .order_by(ReadingRow.seq)).all()
    withdrawn = dict(session.execute(
        select(WithdrawnReading.reading_id, WithdrawnReading.withdrawn_at)
        .join(ReadingRow, ReadingRow.id == WithdrawnReading.reading_id)
        .where(ReadingRow.case_id == case.id)).all())
    readings = tuple(
        KeptReading(r.id, r.seq, r.check_id, r.typed, r.value, r.unit, r.outcome, r.entered_at,
                    tuple(RankedSuspect(s.fault_id, s.probability, s.part_id, s.stage_id)
                          for s in r.suspects),
                    withdrawn.get(r.id))
        for r in rows)
    skipped = tuple(KeptSkip(s.check_id, s.skipped_at) for s in session.scalars(
        select(SkippedCheck).where(SkippedCheck.case_id == case.id).order_by(SkippedCheck.id)))
    repairs = tuple(KeptRepair(r.part_id, r.fault_id, r.action, r.parts_cost_cents,
                               r.value_fitted, r.test_passed, r.note, r.done_at)
                    for r in session.scalars(select(RepairAction)
                                             .where(RepairAction.case_id == case.id)
                                             .order_by(RepairAction.id)))
    verifications = tuple(KeptVerification(v.check_id, v.typed, v.passed, v.entered_at)
                          for v in session.scalars(select(Verification)
                                                   .where(Verification.case_id == case.id)
                                                   .order_by(Verification.id)))
    amendments = tuple(KeptAmendment(a.field, json.loads(a.old_value), json.loads(a.new_value),
                                     a.amended_by, a.amended_at, a.reason)
                       for a in session.scalars(select(Amendment)
                                                .where(Amendment.case_id == case.id)
                                                .order_by(Amendment.id)))
    device, person = case.device, case.customer
    original = None if case.comeback_of_id is None else session.get(Case, case.comeback_of_id)
    returns = session.scalars(select(Case).where(Case.comeback_of_id == case.id)
                              .order_by(Case.opened_at, Case.id)).all()
    return CaseRecord(
        id=case.id, ticket=case.ticket_ref, customer_id=case.customer_id,
        customer_name=None if person is None else person.name,
        customer_contact=None if person is None else person.contact, status=case.status,
        outcome=case.outcome, family_id=case.family_id, ratings=dict(case.ratings or {}),
        notes=case.notes, opened_at=case.opened_at, closed_at=case.closed_at,
        bench_minutes=case.bench_minutes, confirmed_fault=case.confirmed_fault,
        confirmed_part=case.confirmed_part, confirmed_stage=case.confirmed_stage,
        top_suspect_fault=case.top_suspect_fault, make=device.make, model=device.model,
        kind=device.kind, serial=device.serial, technician_id=case.technician_id,
        technician=case.technician.name, readings=readings, skipped=skipped, repairs=repairs,
        verifications=verifications, amendments=amendments,
        cautions_acknowledged=session.get(CautionAcknowledgement, case.id) is not None,
        quoted_cents=case.quoted_cents, price_cents=case.price_cents,
        parts_cents=case.parts_cents or 0, labour_rate_cents=case.labour_rate_cents,
        return_of=None if original is None else _linked(original),
        returns=tuple(_linked(later) for later in returns))


def _linked(case: Case) -> LinkedJob:
    return LinkedJob(case.id, case.ticket_ref, case.opened_at, case.closed_at, case.outcome,
                     case.notes, case.confirmed_fault, case.family_id)
