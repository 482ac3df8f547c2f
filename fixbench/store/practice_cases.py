"""What practice needs from the shop's memory: closed cases to replay, stripped of who and whose,
and the trainees' kept attempts, one trainee's in order and every trainee's summed up.

Plain rows only: turning them into practice's own values is the practice workflow's job, so the
store and the practice package never import each other."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime

from sqlalchemy import case, func, select

from fixbench.store.database import Store
from fixbench.store.models import Case, PracticeAttempt, Technician

REPLAY_LIMIT = 200  # the most recent closed cases offered for replay
ATTEMPTS_LIMIT = 500  # a trainee's most recent attempts shown


@dataclass(frozen=True)
class ClosedCaseFacts:
    """A closed case with a confirmed fault, without customer, ticket, device or technician."""

    family_id: str
    ratings: dict[str, str]
    confirmed_fault: str
    closed: str  # "YYYY-MM"


@dataclass(frozen=True)
class KeptAttempt:
    scenario: str
    checks_used: int
    minutes: float
    score: float
    safety_slips: int
    coach_used: bool
    fuse_blown: bool


@dataclass(frozen=True)
class TraineeSummary:
    trainee_id: int
    name: str
    rounds: int
    mean_score: float | None
    rounds_with_slips: int
    last_attempt: datetime | None


def replayable_cases(store: Store, family_ids: set[str] | None = None,
                     limit: int = REPLAY_LIMIT) -> list[ClosedCaseFacts]:
    """Closed cases with a confirmed fault, newest first: only family, ratings, fault and month."""
    query = (select(Case.family_id, Case.ratings, Case.confirmed_fault, Case.closed_at)
             .where(Case.status == "closed", Case.confirmed_fault.is_not(None))
             .order_by(Case.closed_at.desc(), Case.id.desc()).limit(limit))
    if family_ids is not None:
        query = query.where(Case.family_id.in_(sorted(family_ids)))
    with store.reading() as session:
        rows = session.execute(query).all()
    return [ClosedCaseFacts(family, dict(ratings or {}), fault,
                            closed.strftime("%Y-%m") if closed else "")
            for family, ratings, fault, closed in rows]


def attempts_of(store: Store, trainee_id: int, limit: int = ATTEMPTS_LIMIT) -> list[KeptAttempt]:
    """One trainee's most recent attempts, oldest first."""
    query = (select(PracticeAttempt.scenario, PracticeAttempt.checks_used, PracticeAttempt.minutes,
                    PracticeAttempt.score, PracticeAttempt.safety_slips,
                    PracticeAttempt.coach_used, PracticeAttempt.fuse_blown)
             .where(PracticeAttempt.trainee_id == trainee_id)
             .order_by(PracticeAttempt.attempted_at.desc(), PracticeAttempt.id.desc()).limit(limit))
    with store.reading() as session:
        rows = session.execute(query).all()
    return [KeptAttempt(*row) for row in reversed(rows)]


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

