"""Builds the demo shop database: the planned history, with readings produced by the engine.

The plan (people, devices, dates, faults, outcomes, comebacks, bench minutes) comes from
:mod:`fixbench.store.demo_plan`. Each case's readings and its ranked suspects after each reading
come from :func:`engine_bench_session`, the engine run against the engine's own simulated readings
for the case's true fault, so every case in the demo is one the engine could really have produced.
Everything is written through the same store functions the bench uses.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from datetime import timedelta

from fixbench.store.cases import (RankedSuspect, add_reading, add_repair_action,
                                  add_verification, close_case, open_case)
from fixbench.store.database import Store
from fixbench.store.demo_plan import (TECHNICIANS, TRAINEES, DemoCase, catalogue_from_knowledge,
                                      plan_practice, plan_shop)
from fixbench.store.people import add_device, add_practice_attempt, add_technician


@dataclass(frozen=True)
class BenchStep:
    """One reading the engine asked for, what the meter showed, and the suspects after it."""

    check_id: str
    typed: str
    value: float | None
    unit: str | None
    outcome: str | None
    suspects: tuple[RankedSuspect, ...]


# (family id, ratings, true fault id, seed) -> the steps of a guided diagnosis
BenchSession = Callable[[str, dict, str, int], list[BenchStep]]


def engine_bench_session(family_id: str, ratings: dict, fault_id: str, seed: int) -> list[BenchStep]:
    """Run the engine's guided diagnosis against its own simulated readings for ``fault_id``.

    NOT FINISHED: waits for ``fixbench.engine.start_diagnosis`` and ``simulate_readings``. The
    intended body: simulate readings for the fault, then follow ``state.next_check`` taking each
    simulated reading, recording ``state.suspects`` after each, until ``state.conclusion``.
    """
    try:
        from fixbench.engine import simulate_readings, start_diagnosis  # noqa: F401
    except ImportError as err:
        raise NotImplementedError(
            "the demo shop needs the diagnosis engine (fixbench.engine.start_diagnosis and "
            "simulate_readings), which is not in this build yet") from err
    raise NotImplementedError("engine_bench_session is not wired to the engine yet")


def build_demo_shop(store: Store, seed: int = 1, bench_session: BenchSession | None = None,
                    kb=None) -> int:
    """Fill an empty store with the demo shop for ``seed``; returns the number of cases."""
    if kb is None:
        from fixbench.knowledge import load_knowledge

        kb = load_knowledge()
    run = bench_session or engine_bench_session
    catalogue = catalogue_from_knowledge(kb)
    people = {name: add_technician(store, name) for name, _ in TECHNICIANS}
    people.update({name: add_technician(store, name, role="trainee") for name in TRAINEES})
    devices: dict[int, int] = {}
    cases = plan_shop(seed, catalogue)
    for number, planned in enumerate(cases):
        device = planned.device
        if device.number not in devices:
            devices[device.number] = add_device(store, make=device.make, model=device.model,
                                                kind=device.kind,
                                                label_ratings=device.label_ratings,
                                                serial=f"SN{seed:02d}{device.number:05d}")
        _write_case(store, planned, people[planned.technician], devices[device.number],
                    run(planned.fault.family_id, device.label_ratings, planned.fault.fault_id,
                        seed * 100_003 + number))
    for practice in plan_practice(seed, catalogue):
        add_practice_attempt(store, trainee_id=people[practice.trainee],
                             scenario=practice.scenario, checks_used=practice.checks_used,
                             minutes=practice.minutes, score=practice.score,
                             safety_slips=practice.safety_slips,
                             attempted_at=practice.attempted_at)
    return len(cases)


def _write_case(store: Store, planned: DemoCase, technician_id: int, device_id: int,
                steps: list[BenchStep]) -> None:
    fault = planned.fault
    case_id = open_case(store, ticket_ref=planned.ticket, device_id=device_id,
                        technician_id=technician_id, family_id=fault.family_id,
                        ratings=planned.device.label_ratings, opened_at=planned.opened_at,
                        notes="" if planned.comeback_of is None
                        else f"Back again after {planned.comeback_of}.")
    # Spread the readings over the first two thirds of the bench time, the repair over the rest.
    started = planned.opened_at + timedelta(minutes=20)
    gap = planned.bench_minutes * 2 / 3 / max(1, len(steps))
    for i, step in enumerate(steps):
        add_reading(store, case_id, check_id=step.check_id, typed=step.typed, value=step.value,
                    unit=step.unit, outcome=step.outcome, suspects=step.suspects,
                    entered_at=started + timedelta(minutes=gap * (i + 1)))
    done = started + timedelta(minutes=planned.bench_minutes)
    repaired = planned.outcome == "repaired"
    if repaired:
        add_repair_action(store, case_id, part_id=fault.part_id, fault_id=fault.fault_id,
                          action="replaced", parts_cost_cents=fault.part_cost_cents,
                          done_at=done - timedelta(minutes=5))
        add_verification(store, case_id, check_id="output_voltage",
                         typed=planned.device.label_ratings["output"], value=None, unit=None,
                         outcome=None, passed=True, entered_at=done)
    close_case(store, case_id, outcome=planned.outcome, bench_minutes=planned.bench_minutes,
               confirmed_fault=fault.fault_id if repaired else None,
               confirmed_part=fault.part_id if repaired else None,
               confirmed_stage=fault.stage_id if repaired else None,
               closed_at=done + timedelta(hours=2))
