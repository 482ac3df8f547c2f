"""The shop's technicians and trainees, the devices that come in, and trainees' practice rounds."""

from __future__ import annotations

from collections.abc import Mapping
from datetime import datetime

from sqlalchemy import select

from fixbench.store.cases import utc_now
from fixbench.store.database import Store
from fixbench.store.errors import StoreInputError, checked_text
from fixbench.store.models import ROLES, Device, PracticeAttempt, Technician


def add_technician(store: Store, name: str, role: str = "technician") -> int:
    """Add a technician or trainee and return the id."""
    if role not in ROLES:
        raise StoreInputError(f"a role is one of {', '.join(ROLES)}")
    if not name.strip():
        raise StoreInputError("a technician needs a name")
    with store.session() as session:
        person = Technician(name=checked_text(name, "name"), role=role, active=True)
        session.add(person)
        session.flush()
        return person.id


def technicians(store: Store, role: str | None = None) -> list[Technician]:
    """Everyone on the bench (optionally only one role), by name."""
    query = select(Technician).order_by(Technician.name)
    if role is not None:
        query = query.where(Technician.role == role)
    with store.reading() as session:
        return list(session.scalars(query))


def add_device(store: Store, *, make: str, model: str, kind: str,
               label_ratings: Mapping[str, str], serial: str | None = None) -> int:
    """Add one physical unit (a comeback is the same unit returning) and return its id."""
    device = Device(make=checked_text(make, "make"), model=checked_text(model, "model"),
                    kind=checked_text(kind, "kind"),
                    label_ratings={checked_text(k, "rating name"): checked_text(v, "rating")
                                   for k, v in label_ratings.items()},
                    serial=None if serial is None else checked_text(serial, "serial"))
    with store.session() as session:
        session.add(device)
        session.flush()
        return device.id


def add_practice_attempt(store: Store, *, trainee_id: int, scenario: str, checks_used: int,
                         minutes: float, score: float, safety_slips: int,
                         attempted_at: datetime | None = None, coach_used: bool = False,
                         fuse_blown: bool = False, fault_right: bool | None = None,
                         slip_kinds: str | None = None, checks_wasted: int | None = None,
                         record: Mapping | None = None) -> int:
    """Keep one practice round a trainee played: scenario id, effort, score, safety slips, whether
    the coach was asked and whether the trainee blew the fuse; and what it taught (the verdict
    right, the kinds of slip, checks wasted) with the round's record for opening it again."""
    if checks_used < 0 or minutes < 0 or safety_slips < 0 or (checks_wasted or 0) < 0:
        raise StoreInputError("checks, minutes and safety slips cannot be negative")
    with store.session() as session:
        trainee = session.get(Technician, trainee_id)
        if trainee is None:
            raise StoreInputError(f"there is no technician {trainee_id}")
        attempt = PracticeAttempt(trainee_id=trainee_id, scenario=checked_text(scenario, "scenario"),
                                  checks_used=checks_used, minutes=minutes, score=score,
                                  safety_slips=safety_slips, attempted_at=attempted_at or utc_now(),
                                  coach_used=bool(coach_used), fuse_blown=bool(fuse_blown),
                                  fault_right=fault_right, slip_kinds=slip_kinds,
                                  checks_wasted=checks_wasted,
                                  record=dict(record) if record is not None else None)
        session.add(attempt)
        session.flush()
        return attempt.id
