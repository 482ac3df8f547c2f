"""What the bench keeps beyond the readings themselves, and what it reads back to resume a case.

- a reading taken back with "undo" is marked withdrawn (kept in the record, left out of the
  diagnosis), and the case's first suspect is set again from the newest reading still standing;
- a check the technician could not make ("cannot measure") is kept as skipped;
- the safety cautions are acknowledged once per case, by whom and when;
- shop settings are short key/value texts (the owner's reports read their footer from here).

Every write is one committed transaction, like :mod:`fixbench.store.cases`, so a closed window or
a power cut loses nothing already shown as saved. :func:`load_case` gives back everything needed
to rebuild the bench where it was left.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime

from sqlalchemy import func, select
from sqlalchemy.orm import Session

from fixbench.store.cases import utc_now
from fixbench.store.database import Store
from fixbench.store.errors import ClosedCaseError, StoreInputError, checked_text
from fixbench.store.models import (Case, CautionAcknowledgement, Device, ReadingRow, RepairAction,
                                   ShopSetting, SkippedCheck, SuspectRow, Technician, Verification,
                                   WithdrawnReading)

SETTING_KEY_MAX = 64
OPEN_STATUSES = ("intake", "diagnosing", "repairing", "verifying")


# --- shop settings -------------------------------------------------------------------------------

def get_setting(store: Store, key: str, default: str | None = None) -> str | None:
    with store.session() as session:
        row = session.get(ShopSetting, key)
        return default if row is None else row.value


def set_setting(store: Store, key: str, value: str) -> None:
    key = checked_text(key, "setting name").strip()
    if not key or len(key) > SETTING_KEY_MAX:
        raise StoreInputError(f"a setting name is 1 to {SETTING_KEY_MAX} characters")
    value = checked_text(value, "setting")
    with store.session() as session:
        row = session.get(ShopSetting, key)
        if row is None:
            session.add(ShopSetting(key=key, value=value))
        else:
            row.value = value


# --- writing at the bench ------------------------------------------------------------------------

def _open(session: Session, case_id: int) -> Case:
    case = session.get(Case, case_id)
    if case is None:
        raise StoreInputError(f"there is no case {case_id}")
    if case.status == "closed":
        raise ClosedCaseError(f"case {case.ticket_ref} is closed; record an amendment instead")
    return case


def acknowledge_cautions(store: Store, case_id: int, technician_id: int,
                         at: datetime | None = None) -> None:
    """Keep that the cautions of this case were read; a second acknowledgement keeps the first."""
    with store.session() as session:
        _open(session, case_id)
        if session.get(CautionAcknowledgement, case_id) is None:
            session.add(CautionAcknowledgement(case_id=case_id, technician_id=technician_id,
                                               acknowledged_at=at or utc_now()))


def skip_check(store: Store, case_id: int, check_id: str, at: datetime | None = None) -> int:
    with store.session() as session:
        _open(session, case_id)
        row = SkippedCheck(case_id=case_id, check_id=checked_text(check_id, "check"),
                           skipped_at=at or utc_now())
        session.add(row)
        session.flush()
        return row.id


def _standing_readings(case_id: int):
    withdrawn = select(WithdrawnReading.reading_id)
    return (select(ReadingRow).where(ReadingRow.case_id == case_id, ReadingRow.id.not_in(withdrawn))
            .order_by(ReadingRow.seq))


def withdraw_last_reading(store: Store, case_id: int, at: datetime | None = None) -> int | None:
    """Take back the newest reading still standing; its id, or None if there was none."""
    with store.session() as session:
        case = _open(session, case_id)
        standing = list(session.scalars(_standing_readings(case_id)))
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


# --- reading back ----------------------------------------------------------------------------------

@dataclass(frozen=True)
class LoggedReading:
    seq: int
    check_id: str
    typed: str


@dataclass(frozen=True)
class LoggedRepair:
    part_id: str
    action: str
    cost_cents: int
    value_fitted: str | None  # a replaced part's new value, as written
    test_passed: bool | None  # a tested part's result (None for a replaced part)
    note: str


@dataclass(frozen=True)
class LoggedVerification:
    check_id: str
    typed: str
    passed: bool


@dataclass(frozen=True)
class CaseRecord:
    """A case as the bench resumes it."""

    id: int
    ticket: str
    status: str
    family_id: str
    ratings: dict[str, str]
    make: str
    model: str
    technician_id: int
    opened_at: datetime
    notes: str
    readings: tuple[LoggedReading, ...]  # standing readings, oldest first
    skipped: tuple[str, ...]
    cautions_acknowledged: bool
    repairs: tuple[LoggedRepair, ...]
    verifications: tuple[LoggedVerification, ...]


def load_case(store: Store, case_id: int) -> CaseRecord:
    with store.session() as session:
        case = session.get(Case, case_id)
        if case is None:
            raise StoreInputError(f"there is no case {case_id}")
        device = session.get(Device, case.device_id)
        readings = tuple(LoggedReading(r.seq, r.check_id, r.typed)
                         for r in session.scalars(_standing_readings(case_id)))
        skipped = tuple(session.scalars(select(SkippedCheck.check_id)
                                        .where(SkippedCheck.case_id == case_id)
                                        .order_by(SkippedCheck.id)))
        repairs = tuple(LoggedRepair(r.part_id, r.action, r.parts_cost_cents, r.value_fitted,
                                     r.test_passed, r.note)
                        for r in session.scalars(select(RepairAction)
                                                 .where(RepairAction.case_id == case_id)
                                                 .order_by(RepairAction.id)))
        verifications = tuple(LoggedVerification(v.check_id, v.typed, v.passed)
                              for v in session.scalars(select(Verification)
                                                       .where(Verification.case_id == case_id)
                                                       .order_by(Verification.id)))
        return CaseRecord(
            id=case.id, ticket=case.ticket_ref, status=case.status, family_id=case.family_id,
            ratings=dict(case.ratings), make=device.make, model=device.model,
            technician_id=case.technician_id, opened_at=case.opened_at, notes=case.notes,
            readings=readings, skipped=skipped,
            cautions_acknowledged=session.get(CautionAcknowledgement, case_id) is not None,
            repairs=repairs, verifications=verifications)


@dataclass(frozen=True)
class OpenCaseRow:
    id: int
    ticket: str
    make: str
    model: str
    family_id: str
    status: str
    technician: str
    opened_at: datetime
    readings: int


def open_case_count(store: Store) -> int:
    with store.session() as session:
        return session.scalar(select(func.count()).select_from(Case)
                              .where(Case.status.in_(OPEN_STATUSES)))


def open_cases(store: Store, offset: int = 0, limit: int = 200) -> list[OpenCaseRow]:
    """Cases not yet closed, newest first (an index walk on status, then the page's names)."""
    counts = (select(ReadingRow.case_id, func.count().label("n")).group_by(ReadingRow.case_id)
              .subquery())
    query = (select(Case.id, Case.ticket_ref, Device.make, Device.model, Case.family_id,
                    Case.status, Technician.name, Case.opened_at, func.coalesce(counts.c.n, 0))
             .join(Device, Device.id == Case.device_id)
             .join(Technician, Technician.id == Case.technician_id)
             .outerjoin(counts, counts.c.case_id == Case.id)
             .where(Case.status.in_(OPEN_STATUSES))
             .order_by(Case.opened_at.desc(), Case.id.desc()).offset(offset).limit(limit))
    with store.read_connection() as connection:
        return [OpenCaseRow(*row) for row in connection.execute(query)]


@dataclass(frozen=True)
class KnownModel:
    """A make and model the shop has seen, with the family and ratings of its newest case."""

    make: str
    model: str
    kind: str
    family_id: str
    ratings: dict[str, str]

    @property
    def label(self) -> str:
        return f"{self.make} {self.model}"


def known_models(store: Store, newest_cases: int = 2000) -> list[KnownModel]:
    """Makes and models from the newest cases (for completing the intake form), by label."""
    query = (select(Device.make, Device.model, Device.kind, Case.family_id, Case.ratings)
             .join(Case, Case.device_id == Device.id)
             .order_by(Case.opened_at.desc(), Case.id.desc()).limit(newest_cases))
    seen: dict[tuple[str, str], KnownModel] = {}
    with store.read_connection() as connection:
        for make, model, kind, family_id, ratings in connection.execute(query):
            seen.setdefault((make.lower(), model.lower()),
                            KnownModel(make, model, kind, family_id, dict(ratings or {})))
    return sorted(seen.values(), key=lambda m: m.label.lower())


def find_device(store: Store, make: str, model: str, serial: str) -> int | None:
    """The unit with this make, model and serial if it came in before (a comeback), else None."""
    if not serial.strip():
        return None
    query = (select(Device.id).where(func.lower(Device.make) == make.strip().lower(),
                                     func.lower(Device.model) == model.strip().lower(),
                                     Device.serial == serial.strip())
             .order_by(Device.id.desc()).limit(1))
    with store.session() as session:
        return session.scalar(query)


def ticket_taken(store: Store, ticket: str) -> bool:
    with store.session() as session:
        return session.scalar(select(func.count()).select_from(Case)
                              .where(Case.ticket_ref == ticket.strip())) > 0
