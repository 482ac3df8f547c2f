"""What practice needs from the shop's memory: closed cases to replay, stripped of who and whose
(with what the customer said, for telling them apart), and the trainees' kept attempts: one
trainee's in order, one attempt's record to open its debrief again, every trainee's summed up, and
what every trainee's rounds taught (for the owner's view of weak faults and slips).

Plain rows only: turning them into practice's own values is the practice workflow's job, so the
store and the practice package never import each other."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime

from sqlalchemy import case, func, select

from fixbench.store.database import Store
from fixbench.store.models import Case, PracticeAttempt, ReadingRow, Technician

REPLAY_LIMIT = 200  # the most recent closed cases offered for replay
ATTEMPTS_LIMIT = 500  # a trainee's most recent attempts shown


@dataclass(frozen=True)
class ClosedCaseFacts:
    """A closed case with a confirmed fault, without customer, ticket, device or technician."""

    family_id: str
    ratings: dict[str, str]
    confirmed_fault: str
    closed: str  # "YYYY-MM"
    told: tuple[tuple[str, str], ...] = ()  # (check id, typed) of the readings asked for, first each


@dataclass(frozen=True)
class KeptAttempt:
    scenario: str
    checks_used: int
    minutes: float
    score: float
    safety_slips: int
    coach_used: bool
    fuse_blown: bool
    attempt_id: int | None = None
    attempted_at: datetime | None = None
    fault_right: bool | None = None
    slip_kinds: str | None = None
    checks_wasted: int | None = None
    has_record: bool = False


@dataclass(frozen=True)
class TraineeSummary:
    trainee_id: int
    name: str
    rounds: int
    mean_score: float | None
    rounds_with_slips: int
    last_attempt: datetime | None


def replayable_cases(store: Store, family_ids: set[str] | None = None, limit: int = REPLAY_LIMIT,
                     told_checks: set[str] = frozenset()) -> list[ClosedCaseFacts]:
    """Closed cases with a confirmed fault, newest first: only family, ratings, fault, month, and
    the first reading of each check in ``told_checks`` (what the customer said, say)."""
    query = (select(Case.id, Case.family_id, Case.ratings, Case.confirmed_fault, Case.closed_at)
             .where(Case.status == "closed", Case.confirmed_fault.is_not(None))
             .order_by(Case.closed_at.desc(), Case.id.desc()).limit(limit))
    if family_ids is not None:
        query = query.where(Case.family_id.in_(sorted(family_ids)))
    with store.reading() as session:
        rows = session.execute(query).all()
        told: dict[int, dict[str, str]] = {}
        if told_checks and rows:
            readings = session.execute(
                select(ReadingRow.case_id, ReadingRow.check_id, ReadingRow.typed)
                .where(ReadingRow.case_id.in_([r[0] for r in rows]),
                       ReadingRow.check_id.in_(sorted(told_checks)))
                .order_by(ReadingRow.case_id, ReadingRow.seq)).all()
            for case_id, check_id, typed in readings:
                told.setdefault(case_id, {}).setdefault(check_id, typed)
    return [ClosedCaseFacts(family, dict(ratings or {}), fault, closed.strftime("%Y-%m") if closed else "",
                            tuple(told.get(case_id, {}).items()))
            for case_id, family, ratings, fault, closed in rows]


def attempts_of(store: Store, trainee_id: int, limit: int = ATTEMPTS_LIMIT) -> list[KeptAttempt]:
    """One trainee's most recent attempts, oldest first."""
    query = (select(*_ATTEMPT_COLUMNS)
             .where(PracticeAttempt.trainee_id == trainee_id)
             .order_by(PracticeAttempt.attempted_at.desc(), PracticeAttempt.id.desc()).limit(limit))
    with store.reading() as session:
        rows = session.execute(query).all()
    return [_kept(row) for row in reversed(rows)]


def attempt_record(store: Store, attempt_id: int) -> dict | None:
    """The record kept with one attempt (None for an attempt kept before records were)."""
    with store.reading() as session:
        return session.execute(select(PracticeAttempt.record)
                               .where(PracticeAttempt.id == attempt_id)).scalar_one_or_none()


def every_trainees_attempts(store: Store, limit_each: int = ATTEMPTS_LIMIT) -> dict[int, list[KeptAttempt]]:
    """Every trainee's most recent attempts, oldest first, by trainee id (for the owner's view)."""
    ranked = (select(PracticeAttempt.trainee_id.label("trainee_id"), PracticeAttempt.id.label("id"),
                     func.row_number().over(partition_by=PracticeAttempt.trainee_id,
                                            order_by=(PracticeAttempt.attempted_at.desc(),
                                                      PracticeAttempt.id.desc())).label("recent"))
              .subquery())
    query = (select(PracticeAttempt.trainee_id, *_ATTEMPT_COLUMNS)
             .join(ranked, ranked.c.id == PracticeAttempt.id)
             .where(ranked.c.recent <= limit_each)
             .order_by(PracticeAttempt.trainee_id, PracticeAttempt.attempted_at, PracticeAttempt.id))
    out: dict[int, list[KeptAttempt]] = {}
    with store.reading() as session:
        for row in session.execute(query).all():
            out.setdefault(row[0], []).append(_kept(row[1:]))
    return out


_ATTEMPT_COLUMNS = (PracticeAttempt.scenario, PracticeAttempt.checks_used, PracticeAttempt.minutes,
                    PracticeAttempt.score, PracticeAttempt.safety_slips, PracticeAttempt.coach_used,
                    PracticeAttempt.fuse_blown, PracticeAttempt.id, PracticeAttempt.attempted_at,
                    PracticeAttempt.fault_right, PracticeAttempt.slip_kinds, PracticeAttempt.checks_wasted,
                    PracticeAttempt.record.is_not(None))


def _kept(row) -> KeptAttempt:
    *first, has_record = row
    return KeptAttempt(*first, has_record=bool(has_record))


def trainee_summaries(store: Store) -> list[TraineeSummary]:
    """Every trainee with their rounds, mean score, rounds with a slip and last round, by name."""
    slipped = func.sum(case((PracticeAttempt.safety_slips > 0, 1), else_=0))
    query = (select(Technician.id, Technician.name, func.count(PracticeAttempt.id),
                    func.avg(PracticeAttempt.score), slipped, func.max(PracticeAttempt.attempted_at))
             .outerjoin(PracticeAttempt, PracticeAttempt.trainee_id == Technician.id)
             .where(Technician.role == "trainee")
             .group_by(Technician.id, Technician.name)
             .order_by(Technician.name, Technician.id))
    with store.reading() as session:
        rows = session.execute(query).all()
    return [TraineeSummary(tid, name, count, None if mean is None else float(mean), int(slips or 0), last)
            for tid, name, count, mean, slips, last in rows]

