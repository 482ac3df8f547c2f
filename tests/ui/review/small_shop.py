"""A small fictional repair shop for the review tests, written through the store's bench functions.

About 150 cases over eight months: four technicians and two trainees (invented names), three
invented makes, faults drawn by the knowledge base's weights, readings and ranked suspects from
the engine run on its own simulated readings, repairs with part costs, verifications (a few fail
first), units that come back, open cases, two amendments and weekly practice rounds.
"""

from __future__ import annotations

import random
from datetime import datetime, timedelta

from fixbench.store.customers import find_or_add_customer
from fixbench.engine import simulate_readings, start_diagnosis
from fixbench.physics.ratings import parse_ratings
from fixbench.store.amendments import amend_closed_case
from fixbench.store.cases import (RankedSuspect, add_reading, add_repair_action, add_verification,
                                  close_case, open_case)
from fixbench.store.owner import set_owner_passphrase
from fixbench.store.people import add_device, add_practice_attempt, add_technician

PASSPHRASE = "workbench-owner-7"
TECHNICIANS = ("Adela Strom", "Bertil Quane", "Cosima Reyd", "Dario Fenwick")
TRAINEES = ("Ezra Lowmoor", "Fenna Tolk")
MODELS = (("Ostrel", "OS-12", "wall adapter", {"output": "12 V", "current": "1 A"}),
          ("Brindle", "BR-5", "phone charger", {"output": "5 V", "current": "2 A"}),
          ("Corvane", "CV-19", "laptop adapter", {"output": "19 V", "current": "3.42 A"}))
MAINS = {"mains": "230 V", "frequency": "50 Hz"}
START = datetime(2024, 1, 8, 9, 0)
CASES = 150
MAX_READINGS = 8


def _readings(kb, family_id: str, ratings: dict, fault_id: str, seed: int):
    family, unit = kb.family(family_id), parse_ratings(ratings)
    shown = simulate_readings(family, unit, fault_id, seed=seed)
    state, steps = start_diagnosis(family, unit), []
    while state.next_check is not None and len(steps) < MAX_READINGS:
        check = state.next_check.check.id
        state = state.with_reading(check, shown[check])
        reading = state.readings[-1]
        steps.append((check, shown[check], reading.value, reading.unit, reading.outcome,
                      [RankedSuspect.from_engine(s) for s in state.suspects[:5]]))
    return steps


def build_small_shop(store, kb, seed: int = 7) -> int:
    rng = random.Random(seed)
    people = [add_technician(store, name) for name in TECHNICIANS]
    trainees = [add_technician(store, name, role="trainee") for name in TRAINEES]
    set_owner_passphrase(store, PASSPHRASE)
    families = sorted(kb.families)
    repaired_units: list[tuple[int, str, str, dict, datetime]] = []
    closed_ids = []
    for number in range(1, CASES + 1):
        opened = START + timedelta(days=number * 35 // 22, hours=rng.randrange(8))
        if repaired_units and rng.random() < 0.07:
            device_id, family_id, fault_id, ratings, _ = repaired_units.pop(rng.randrange(len(repaired_units)))
        else:
            make, model, kind, label = rng.choice(MODELS)
            ratings = {**MAINS, **label}
            device_id = add_device(store, make=make, model=model, kind=kind, label_ratings=ratings,
                                   serial=f"T{seed}{number:04d}")
            family_id = rng.choice(families)
            faults = kb.family(family_id).faults
            fault_id = rng.choices([f.id for f in faults], [f.weight for f in faults])[0]
        case_id = open_case(store, ticket_ref=f"T-{number:04d}", device_id=device_id,
                            technician_id=rng.choice(people), family_id=family_id, ratings=ratings,
                            customer_id=find_or_add_customer(store, f"Customer {rng.randrange(1000, 9999)}"),
                            notes=rng.choice(["", "dropped on the floor", "smells burnt",
                                              "works when warm"]), opened_at=opened)
        at = opened
        for check, typed, value, unit, outcome, suspects in _readings(kb, family_id, ratings,
                                                                     fault_id, seed * 1000 + number):
            at += timedelta(minutes=4)
            add_reading(store, case_id, check_id=check, typed=typed, value=value, unit=unit,
                        outcome=outcome, suspects=suspects, entered_at=at)
        if number > CASES - 5:
            continue  # still on the bench
        outcome = rng.choices(["repaired", "not_economical", "no_fault_found",
                               "returned_unrepaired"], [80, 8, 6, 6])[0]
        family = kb.family(family_id)
        part = family.part(family.fault(fault_id).part)
        if outcome == "repaired":
            at += timedelta(minutes=15)
            add_repair_action(store, case_id, part_id=part.id, fault_id=fault_id,
                              action="replaced", parts_cost_cents=round(part.cost * 100),
                              done_at=at)
            if rng.random() < 0.08:
                add_verification(store, case_id, check_id="output_board", typed="0 V", value=0.0,
                                 unit="V", outcome=None, passed=False, entered_at=at)
            add_verification(store, case_id, check_id="output_board", typed=ratings["output"],
                             value=None, unit=None, outcome=None, passed=True,
                             entered_at=at + timedelta(minutes=5))
            repaired_units.append((device_id, family_id, fault_id, ratings, opened))
        repaired = outcome == "repaired"
        close_case(store, case_id, outcome=outcome,
                   bench_minutes=max(5, round(rng.lognormvariate(3.4, 0.45))),
                   confirmed_fault=fault_id if repaired else None,
                   confirmed_part=part.id if repaired else None,
                   confirmed_stage=part.stage if repaired else None,
                   closed_at=at + timedelta(hours=2))
        closed_ids.append(case_id)
    for case_id in closed_ids[3:5]:
        amend_closed_case(store, case_id, {"bench_minutes": 55}, by="Shop owner",
                          reason="timer left running over lunch", passphrase=PASSPHRASE)
    for week in range(34):
        for k, trainee in enumerate(trainees):
            progress = week / 34
            add_practice_attempt(store, trainee_id=trainee, scenario="pwm_flyback:Q1.short",
                                 checks_used=max(2, round(9 - 4 * progress + rng.gauss(0, 1))),
                                 minutes=round(30 - 12 * progress + rng.gauss(0, 2), 1),
                                 score=round(min(1.0, 0.4 + 0.5 * progress + rng.gauss(0, 0.05)), 2),
                                 safety_slips=max(0, round(1.5 - 1.4 * progress + rng.gauss(0, 0.4))),
                                 attempted_at=START + timedelta(weeks=week, days=4, hours=k))
    return CASES
