"""Builds the demo shop database: the planned history, each case played at the bench by the engine.

The plan (people, devices, dates, faults, outcomes, comebacks, each technician's pace) comes from
:mod:`fixbench.demo.plan`; each case's readings, suspects after every reading, repairs and
verification readings come from :func:`fixbench.demo.bench_play.engine_bench_session`, so every
case in the demo is one the engine really produced. Everything is written through the same store
functions the bench uses, with times laid out as the bench would have taken them. The same seed
gives the same rows.
"""

from __future__ import annotations

from collections.abc import Callable
from datetime import datetime, timedelta

from fixbench.engine.hypotheses import NO_FAULT
from fixbench.knowledge.model import Family
from fixbench.store.cases import (add_reading, add_repair_action, add_verification, close_case,
                                  open_case)
from fixbench.store.database import Store
from fixbench.demo.bench_play import BenchSession, engine_bench_session
from fixbench.demo.plan import (SHOP_DAYS, TECHNICIANS, TRAINEES, DemoCase,
                                      catalogue_from_knowledge, plan_practice, plan_shop)
from fixbench.store.people import add_device, add_practice_attempt, add_technician

HANDLING_MINUTES = 6.0  # unpack, open the case, close it up again [practice]
PICKUP_DELAY = timedelta(hours=2)  # from the last bench minute to the case closed at the counter

# (family, bench ratings, true fault id, seed, repair=...) -> what happened at the bench
PlayCase = Callable[..., BenchSession]


def build_demo_shop(store: Store, seed: int = 1, *, days: int = SHOP_DAYS, kb=None,
                    play: PlayCase = engine_bench_session) -> int:
    """Fill an empty store with the demo shop for ``seed``; returns the number of cases."""
    if kb is None:
        from fixbench.knowledge import load_knowledge

        kb = load_knowledge()
    catalogue = catalogue_from_knowledge(kb)
    people = {name: add_technician(store, name) for name, _ in TECHNICIANS}
    people.update({name: add_technician(store, name, role="trainee") for name in TRAINEES})
    devices: dict[int, int] = {}
    cases = plan_shop(seed, catalogue, days=days)
    for number, planned in enumerate(cases):
        device = planned.device
        if device.number not in devices:
            devices[device.number] = add_device(store, make=device.make, model=device.model,
                                                kind=device.kind,
                                                label_ratings=device.label_ratings,
                                                serial=f"SN{seed:02d}{device.number:05d}")
        # The supply is fine in a "no fault found" case: the engine meets a healthy unit.
        fault = NO_FAULT if planned.outcome == "no_fault_found" else planned.fault.fault_id
        session = play(kb.families[device.family_id], device.bench_ratings, fault,
                       seed * 100_003 + number, repair=planned.outcome == "repaired")
        _write_case(store, kb.families[device.family_id], planned, people[planned.technician],
                    devices[device.number], session)
    start = cases[0].opened_at if cases else None
    for practice in plan_practice(seed, catalogue):
        if start is not None and practice.attempted_at < start:
            continue
        add_practice_attempt(store, trainee_id=people[practice.trainee],
                             scenario=practice.scenario, checks_used=practice.checks_used,
                             minutes=practice.minutes, score=practice.score,
                             safety_slips=practice.safety_slips,
                             attempted_at=practice.attempted_at,
                             coach_used=practice.coach_used, fuse_blown=practice.fuse_blown)
    return len(cases)


def _write_case(store: Store, family: Family, planned: DemoCase, technician_id: int,
                device_id: int, session: BenchSession) -> None:
    device = planned.device
    case_id = open_case(store, ticket_ref=planned.ticket, device_id=device_id,
                        technician_id=technician_id, family_id=device.family_id,
                        ratings=device.bench_ratings, opened_at=planned.opened_at,
                        notes="" if planned.comeback_of is None
                        else f"Back again after {planned.comeback_of}.")
    clock = _BenchClock(planned.opened_at + timedelta(minutes=planned.wait_minutes), planned.pace)
    steps = session.steps
    if planned.outcome == "returned_unrepaired":  # the customer took it back mid-diagnosis
        steps = steps[: max(1, len(steps) // 2)]
    for step in steps:
        add_reading(store, case_id, check_id=step.check_id, typed=step.typed, value=step.value,
                    unit=step.unit, outcome=step.outcome, suspects=step.suspects,
                    entered_at=clock.spend(step.minutes))
    outcome = planned.outcome
    if outcome == "repaired" and session.confirmed_fault is None:
        outcome = "no_fault_found"  # nothing to replace and the unit proved healthy
    for repair in session.rounds:
        for work in repair.work:
            add_repair_action(store, case_id, part_id=work.part_id, fault_id=work.fault_id,
                              action=work.action, parts_cost_cents=work.cost_cents,
                              note=work.note, value_fitted=work.value_fitted,
                              test_passed=work.test_passed, done_at=clock.spend(work.minutes))
        for check in repair.verification:
            add_verification(store, case_id, check_id=check.check_id, typed=check.typed,
                             value=check.value, unit=check.unit, outcome=check.outcome,
                             passed=check.passed, entered_at=clock.spend(check.minutes))
    clock.spend(HANDLING_MINUTES)
    fault = session.confirmed_fault if outcome == "repaired" else None
    part = None if fault is None else family.fault(fault).part
    close_case(store, case_id, outcome=outcome, bench_minutes=round(clock.bench_minutes),
               confirmed_fault=fault, confirmed_part=part,
               confirmed_stage=None if part is None else family.part(part).stage,
               closed_at=clock.now + PICKUP_DELAY)


class _BenchClock:
    """Bench time as the technician spends it: book minutes times their pace for this case."""

    def __init__(self, start: datetime, pace: float):
        self.now, self.pace, self.bench_minutes = start, pace, 0.0

    def spend(self, book_minutes: float) -> datetime:
        minutes = book_minutes * self.pace
        self.bench_minutes += minutes
        self.now += timedelta(seconds=round(minutes * 60))
        return self.now

