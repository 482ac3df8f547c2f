"""Recording a case as it happens at the bench: open, readings with suspects, undo, a check that
cannot be made, the cautions acknowledged, repairs, verification, close.

Every function here is one transaction that commits before it returns, so a reading is kept the
moment it is entered and a killed process loses nothing already returned. A closed case refuses
all of these; corrections go through :mod:`fixbench.store.amendments`. Each write takes its case
through :func:`case_for_writing`, the one way a case is opened for writing.

Status moves forward through intake -> diagnosing -> repairing -> verifying -> closed; a failed
verification may send it back to repairing, and a case may be closed from any open status (a
unit returned unrepaired never reaches repairing).
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from datetime import UTC, datetime

from sqlalchemy import func, select
from sqlalchemy.orm import Session

from fixbench.store.case_flags import COMEBACK_DAYS, original_job, refresh_came_back
from fixbench.store.database import Store
from fixbench.store.errors import ClosedCaseError, StoreInputError, checked_text
from fixbench.store.models import (OUTCOMES, REPAIR_KINDS, Case, CautionAcknowledgement, ReadingRow,
                                   RepairAction, SkippedCheck, SuspectRow, Verification,
                                   WithdrawnReading)

# status -> statuses it may move to (besides "closed", which close_case does).
NEXT_STATUS: dict[str, tuple[str, ...]] = {
    "intake": ("diagnosing",),
    "diagnosing": ("repairing",),
    "repairing": ("verifying",),
    "verifying": ("repairing",),
    "closed": (),
}


@dataclass(frozen=True)
class RankedSuspect:
    """One entry of the engine's ranked list after a reading."""

    fault_id: str
    probability: float
    part_id: str | None = None
    stage_id: str | None = None

    @classmethod
    def from_engine(cls, suspect: object) -> RankedSuspect:
        """From an engine suspect (``.fault``, ``.part``, ``.stage``, ``.probability``)."""

        def ident(thing: object) -> str | None:
            return None if thing is None else str(getattr(thing, "id", thing))

        return cls(fault_id=ident(suspect.fault), probability=float(suspect.probability),
                   part_id=ident(getattr(suspect, "part", None)),
                   stage_id=ident(getattr(suspect, "stage", None)))


def utc_now() -> datetime:
    return datetime.now(UTC).replace(tzinfo=None)


def _cents(value: int | None, what: str) -> int | None:
    if value is not None and value < 0:
        raise StoreInputError(f"{what} cannot be negative")
    return value


def open_case(store: Store, *, ticket_ref: str, device_id: int, technician_id: int,
              family_id: str, ratings: Mapping[str, str], customer_id: int | None = None,
              quoted_cents: int | None = None, notes: str = "",
              opened_at: datetime | None = None, comeback_days: int = COMEBACK_DAYS) -> int:
    """Start a case at intake and return its id. A unit back within ``comeback_days`` of a repair
    is linked to that job as its warranty return (:func:`fixbench.store.case_flags.original_job`)."""
    opened_at = opened_at or utc_now()
    case = Case(ticket_ref=checked_text(ticket_ref, "ticket reference"),
                customer_id=customer_id, device_id=device_id, technician_id=technician_id,
                family_id=checked_text(family_id, "supply family"),
                ratings={checked_text(k, "rating name"): checked_text(v, "rating")
                         for k, v in ratings.items()},
                status="intake", notes=checked_text(notes, "notes"), opened_at=opened_at,
                quoted_cents=_cents(quoted_cents, "a quoted price"))
    with store.session() as session:
        original = original_job(session, device_id=device_id, customer_id=customer_id,
                                opened_at=opened_at, window_days=comeback_days)
        case.comeback_of_id = None if original is None else original.id
        session.add(case)
        session.flush()
        refresh_came_back(session, [case.comeback_of_id])
        return case.id


def locked_case(session: Session, case_id: int) -> Case:
    """The case row, locked for the rest of the transaction where the database locks rows
    (PostgreSQL: SELECT ... FOR UPDATE, so two benches writing one case take turns; SQLite's
    BEGIN IMMEDIATE already holds the whole file)."""
    case = session.get(Case, case_id, with_for_update=session.bind.dialect.name != "sqlite")
    if case is None:
        raise StoreInputError(f"there is no case {case_id}")
    return case


def case_for_writing(session: Session, case_id: int) -> Case:
    """An open case, locked, for a bench write; a closed case is refused (amend it instead)."""
    case = locked_case(session, case_id)
    if case.status == "closed":
        raise ClosedCaseError(f"case {case.ticket_ref} is closed; record an amendment instead")
    return case


def add_reading(store: Store, case_id: int, *, check_id: str, typed: str, value: float | None,
                unit: str | None, outcome: str | None, suspects: Sequence[RankedSuspect],
                entered_at: datetime | None = None) -> int:
    """Keep one reading (as typed and as parsed) with the suspects ranked after it."""
    with store.session() as session:
        case = case_for_writing(session, case_id)
        last = session.scalar(select(func.max(ReadingRow.seq)).where(ReadingRow.case_id == case_id))
        reading = ReadingRow(case_id=case_id, seq=(last or 0) + 1,
                          check_id=checked_text(check_id, "check"),
                          typed=checked_text(typed, "reading"), value=value,
                          unit=None if unit is None else checked_text(unit, "unit"),
                          outcome=None if outcome is None else checked_text(outcome, "outcome"),
                          entered_at=entered_at or utc_now())
        reading.suspects = [
            SuspectRow(rank=rank, fault_id=checked_text(s.fault_id, "fault"), part_id=s.part_id,
                    stage_id=s.stage_id, probability=s.probability)
            for rank, s in enumerate(suspects, start=1)]
        session.add(reading)
        if case.status == "intake":
            case.status = "diagnosing"
        case.top_suspect_fault = reading.suspects[0].fault_id if reading.suspects else None
        session.flush()
        return reading.id


def withdraw_last_reading(store: Store, case_id: int, at: datetime | None = None) -> int | None:
    """Take back the newest reading still standing ("undo"); its id, or None if there was none.
    The case's first suspect is set again from the newest reading still standing."""
    withdrawn = select(WithdrawnReading.reading_id)
    with store.session() as session:
        case = case_for_writing(session, case_id)
        standing = list(session.scalars(select(ReadingRow)
                                        .where(ReadingRow.case_id == case_id,
                                               ReadingRow.id.not_in(withdrawn))
                                        .order_by(ReadingRow.seq)))
        if not standing:
            return None
        last = standing[-1]
        session.add(WithdrawnReading(reading_id=last.id, withdrawn_at=at or utc_now()))
        before = standing[-2] if len(standing) > 1 else None
        top = None
        if before is not None:
            top = session.scalar(select(SuspectRow.fault_id)
                                 .where(SuspectRow.reading_id == before.id, SuspectRow.rank == 1))
        case.top_suspect_fault = top
        return last.id


def skip_check(store: Store, case_id: int, check_id: str, at: datetime | None = None) -> int:
    """Keep a check the technician could not make on this unit ("cannot measure")."""
    with store.session() as session:
        case_for_writing(session, case_id)
        row = SkippedCheck(case_id=case_id, check_id=checked_text(check_id, "check"),
                           skipped_at=at or utc_now())
        session.add(row)
        session.flush()
        return row.id


def acknowledge_cautions(store: Store, case_id: int, technician_id: int,
                         at: datetime | None = None) -> None:
    """Keep that the cautions of this case were read; a second acknowledgement keeps the first."""
    with store.session() as session:
        case_for_writing(session, case_id)
        if session.get(CautionAcknowledgement, case_id) is None:
            session.add(CautionAcknowledgement(case_id=case_id, technician_id=technician_id,
                                               acknowledged_at=at or utc_now()))


def move_case(store: Store, case_id: int, status: str) -> None:
    """Move an open case to the next status it may take."""
    with store.session() as session:
        case = case_for_writing(session, case_id)
        if status not in NEXT_STATUS[case.status]:
            raise StoreInputError(f"a case in {case.status} cannot move to {status}")
        case.status = status


def correct_ratings(store: Store, case_id: int, ratings: Mapping[str, str]) -> None:
    """Put right the label ratings of an open case (typed wrong at intake); a closed case's are
    changed by an amendment instead."""
    with store.session() as session:
        case = case_for_writing(session, case_id)
        case.ratings = {checked_text(k, "rating"): checked_text(v, "rating") for k, v in ratings.items()}


def add_repair_action(store: Store, case_id: int, *, part_id: str, action: str,
                      fault_id: str | None = None, parts_cost_cents: int = 0, note: str = "",
                      value_fitted: str | None = None, test_passed: bool | None = None,
                      done_at: datetime | None = None) -> int:
    """Keep a part replaced (with the value fitted, if written down) or tested before power-up
    (with its result, passed or failed); moves a diagnosing case to repairing."""
    if action not in REPAIR_KINDS:
        raise StoreInputError(f"a repair action is one of {', '.join(REPAIR_KINDS)}")
    if parts_cost_cents < 0:
        raise StoreInputError("parts cost cannot be negative")
    if value_fitted is not None:
        value_fitted = checked_text(value_fitted, "value fitted").strip() or None
    if action == "tested":
        if test_passed is None:
            raise StoreInputError("a tested part needs its result: passed or failed")
        if value_fitted is not None:
            raise StoreInputError("nothing is fitted when a part is only tested; keep the "
                                  "replacement as its own line")
    elif test_passed is not None:
        raise StoreInputError("a replaced part has no test result; keep the test as its own "
                              "'tested' line")
    with store.session() as session:
        case = case_for_writing(session, case_id)
        if case.status in ("intake", "diagnosing", "verifying"):
            case.status = "repairing"
        repair = RepairAction(case_id=case_id, part_id=checked_text(part_id, "part"),
                              fault_id=fault_id, action=action, parts_cost_cents=parts_cost_cents,
                              note=checked_text(note, "note"), value_fitted=value_fitted,
                              test_passed=None if test_passed is None else bool(test_passed),
                              done_at=done_at or utc_now())
        session.add(repair)
        case.parts_cents = (case.parts_cents or 0) + parts_cost_cents
        session.flush()
        return repair.id


def add_verification(store: Store, case_id: int, *, check_id: str, typed: str,
                     value: float | None, unit: str | None, outcome: str | None, passed: bool,
                     entered_at: datetime | None = None) -> int:
    """Keep a reading taken after the repair; moves the case to verifying."""
    with store.session() as session:
        case = case_for_writing(session, case_id)
        case.status = "verifying"
        if not passed:
            case.failed_verification = True
        row = Verification(case_id=case_id, check_id=checked_text(check_id, "check"),
                           typed=checked_text(typed, "reading"), value=value, unit=unit,
                           outcome=outcome, passed=bool(passed), entered_at=entered_at or utc_now())
        session.add(row)
        session.flush()
        return row.id


def close_case(store: Store, case_id: int, *, outcome: str, bench_minutes: int,
               confirmed_fault: str | None = None, confirmed_part: str | None = None,
               confirmed_stage: str | None = None, closed_at: datetime | None = None,
               price_cents: int | None = None, labour_rate_cents: int | None = None) -> None:
    """Close a case with its outcome, its final price and the labour rate it was worked at;
    after this it changes only by amendment."""
    if outcome not in OUTCOMES:
        raise StoreInputError(f"an outcome is one of {', '.join(OUTCOMES)}")
    if bench_minutes < 0:
        raise StoreInputError("bench minutes cannot be negative")
    _cents(price_cents, "a price")
    _cents(labour_rate_cents, "a labour rate")
    with store.session() as session:
        case = case_for_writing(session, case_id)
        case.status = "closed"
        case.outcome = outcome
        case.bench_minutes = bench_minutes
        case.confirmed_fault = confirmed_fault
        case.confirmed_part = confirmed_part
        case.confirmed_stage = confirmed_stage
        case.closed_at = closed_at or utc_now()
        case.price_cents = price_cents
        case.labour_rate_cents = labour_rate_cents
        session.flush()
        refresh_came_back(session, [case.id])
