"""Builds the demo shop database: the planned history, each case played at the bench by the engine.

The plan (people, customers, devices, dates, faults, outcomes, prices, comebacks, each
technician's pace) comes from :mod:`fixbench.demo.plan`; each case's readings, suspects after
every reading, repairs and verification readings come from
:func:`fixbench.demo.bench_play.engine_bench_session`, so every case in the demo is one the engine
really produced; the trainees' rounds are played and scored by the practice package
(:mod:`fixbench.demo.practice_play`). Everything is written through the same store functions the
bench uses (a unit back within the comeback window is linked as a warranty return by the store's
own intake rule), with times laid out as the bench would have taken them. The same seed gives the
same rows.
"""

from __future__ import annotations

from collections.abc import Callable
from datetime import datetime, timedelta

from fixbench.engine.hypotheses import NO_FAULT
from fixbench.knowledge.model import Family
from fixbench.demo.bench_play import BenchSession, engine_bench_session
from fixbench.demo.plan import (CURRENCY, LABOUR_RATE_CENTS, SHOP_DAYS, TAX_WORDING, TECHNICIANS,
                                TRAINEES, DemoCase, catalogue_from_knowledge, plan_practice,
                                plan_shop, price_cents)
from fixbench.demo.practice_play import practice_attempts
from fixbench.store.cases import (add_reading, add_repair_action, add_verification, close_case,
                                  open_case)
from fixbench.store.customers import find_or_add_customer
from fixbench.store.database import Store
from fixbench.store.people import add_device, add_practice_attempt, add_technician
from fixbench.store.shop_terms import ShopTerms, set_shop_terms

HANDLING_MINUTES = 6.0  # unpack, open the case, close it up again [practice]

# (family, bench ratings, true fault id, seed, repair=...) -> what happened at the bench
PlayCase = Callable[..., BenchSession]


def build_demo_shop(store: Store, seed: int = 1, *, days: int = SHOP_DAYS, kb=None,
                    play: PlayCase = engine_bench_session) -> int:
    """Fill an empty store with the demo shop for ``seed``; returns the number of cases."""
    if kb is None:
        from fixbench.knowledge import load_knowledge

        kb = load_knowledge()
    catalogue = catalogue_from_knowledge(kb)
    set_shop_terms(store, ShopTerms(labour_rate_cents=LABOUR_RATE_CENTS, currency=CURRENCY,
                                    tax_wording=TAX_WORDING))
    people = {name: add_technician(store, name) for name, _ in TECHNICIANS}
    people.update({name: add_technician(store, name, role="trainee") for name in TRAINEES})
    devices: dict[int, int] = {}
    customers: dict[int, int] = {}
    cases = plan_shop(seed, catalogue, days=days)
    for number, planned in enumerate(cases):
        device = planned.device
        owner = device.owner
        if owner is not None and owner.number not in customers:
            customers[owner.number] = find_or_add_customer(store, owner.name, owner.contact,
                                                           at=planned.opened_at)
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
                    devices[device.number], session,
                    None if owner is None else customers[owner.number])
    start = cases[0].opened_at if cases else None
    planned_rounds = [p for p in plan_practice(seed)
                      if start is not None and p.attempted_at >= start]
    for planned, fields in zip(planned_rounds, practice_attempts(kb, planned_rounds)):
        add_practice_attempt(store, trainee_id=people[planned.trainee], **fields)
    return len(cases)


def _write_case(store: Store, family: Family, planned: DemoCase, technician_id: int,
                device_id: int, session: BenchSession, customer_id: int | None) -> None:
    device = planned.device
    case_id = open_case(store, ticket_ref=planned.ticket, device_id=device_id,
                        technician_id=technician_id, family_id=device.family_id,
                        ratings=device.bench_ratings, opened_at=planned.opened_at,
                        customer_id=customer_id, quoted_cents=planned.quote_cents,
                        notes=planned.complaint if planned.comeback_of is None
                        else f"Back again: {planned.complaint}.")
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
               closed_at=clock.now + timedelta(hours=planned.pickup_hours),
               price_cents=price_cents(planned, outcome), labour_rate_cents=LABOUR_RATE_CENTS)


class _BenchClock:
    """Bench time as the technician spends it: book minutes times their pace for this case."""

    def __init__(self, start: datetime, pace: float):
        self.now, self.pace, self.bench_minutes = start, pace, 0.0

    def spend(self, book_minutes: float) -> datetime:
        minutes = book_minutes * self.pace
        self.bench_minutes += minutes
        self.now += timedelta(seconds=round(minutes * 60))
        return self.now

