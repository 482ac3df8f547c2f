"""A benchmark shop filled in bulk: six people, a unit for every five cases' four, a customer for
every three cases, and N cases with their prices, parts, readings, suspects and verifications,
written straight as rows (the store benchmark and the owner's screens' benchmark measure on it);
the warranty returns are then linked by the store's own rule. The same seed gives the same shop."""

from __future__ import annotations

import random
from datetime import datetime, timedelta

from sqlalchemy import insert

from fixbench.store.case_flags import link_unit_returns, recompute_all_flags
from fixbench.store.models import (Case, Customer, Device, ReadingRow, SuspectRow, Technician,
                                   Verification)

READINGS_PER_CASE = 6
SUSPECTS_PER_READING = 5
CHUNK = 2_000
FAULTS = [f"{part}.{mode}" for part in ("Q1", "U1", "R3", "D5", "C1", "C5", "F1", "BR1", "ZD1")
          for mode in ("short", "open")]
OUTCOMES = ["repaired"] * 8 + ["not_economical", "no_fault_found", "returned_unrepaired"]
FAMILIES = ["pwm_flyback", "self_oscillating", "primary_side"]
STATUSES_OPEN = ["diagnosing", "repairing", "verifying"]
FAILED_VERIFICATION_CHANCE = 0.05  # a repaired case whose first verification failed
START = datetime(2020, 1, 1)
LABOUR_RATE_CENTS = 3600
CUSTOMER_SHARE = 0.7  # cases with a customer's name kept


def customers_for(cases: int) -> int:
    return max(1, cases // 3)


def fake_case(rng: random.Random, number: int, n_devices: int,
              n_customers: int = 1) -> tuple[dict, list]:
    opened = START + timedelta(minutes=number * 7 + rng.randrange(5))
    fault = rng.choice(FAULTS)
    closed = rng.random() > 0.02
    outcome = rng.choice(OUTCOMES) if closed else None
    repaired = outcome == "repaired"
    case = dict(id=number, ticket_ref=f"BM-{number:07d}", device_id=rng.randrange(1, n_devices + 1),
                technician_id=rng.randrange(1, 7), family_id=rng.choice(FAMILIES),
                ratings={"mains": "230 V", "output": "12 V"},
                status="closed" if closed else rng.choice(STATUSES_OPEN), outcome=outcome,
                opened_at=opened, closed_at=opened + timedelta(hours=rng.uniform(1, 72))
                if closed else None, bench_minutes=int(rng.lognormvariate(3.4, 0.5))
                if closed else None, confirmed_fault=fault if repaired else None,
                confirmed_part=fault.split(".")[0] if repaired else None,
                confirmed_stage="stage_" + fault[0] if repaired else None, notes="",
                top_suspect_fault=fault if rng.random() < 0.7 else rng.choice(FAULTS),
                customer_id=rng.randrange(1, n_customers + 1) if rng.random() < CUSTOMER_SHARE
                else None,
                quoted_cents=rng.choice([2500, 3500, 4500, 6500]),
                parts_cents=rng.randrange(0, 900) if repaired else 0,
                labour_rate_cents=LABOUR_RATE_CENTS if closed else None)
    case["price_cents"] = case["quoted_cents"] if closed else None
    readings = [(seq, opened + timedelta(minutes=3 * seq),
                 rng.sample(FAULTS, SUSPECTS_PER_READING)) for seq in range(1, READINGS_PER_CASE + 1)]
    # Verification results in order: repaired cases end on a pass, some after a failed first try.
    case["verified"] = (([False] if rng.random() < FAILED_VERIFICATION_CHANCE else []) + [True]
                        if repaired else [])
    return case, readings


def verification_row(passed: bool, at: datetime) -> dict:
    return dict(check_id="output_voltage", typed="12.1 V" if passed else "0 V",
                value=12.1 if passed else 0.0, unit="V", outcome=None, passed=passed, entered_at=at)


def bulk_fill(store, rng: random.Random, first: int, last: int, n_devices: int,
              n_customers: int = 1) -> None:
    reading_id = (first - 1) * READINGS_PER_CASE + 1_000_000
    for chunk_start in range(first, last + 1, CHUNK):
        cases, readings, suspects, verifications = [], [], [], []
        for number in range(chunk_start, min(chunk_start + CHUNK, last + 1)):
            case, steps = fake_case(rng, number, n_devices, n_customers)
            verifications.extend(dict(case_id=number, **verification_row(passed, steps[-1][1]))
                                 for passed in case.pop("verified"))
            cases.append(case)
            for seq, at, faults in steps:
                reading_id += 1
                readings.append(dict(id=reading_id, case_id=number, seq=seq, check_id=f"check_{seq}",
                                     typed="12.1 V", value=12.1, unit="V", outcome=None,
                                     entered_at=at))
                suspects.extend(dict(reading_id=reading_id, rank=rank, fault_id=f, part_id=None,
                                     stage_id=None, probability=0.5 / rank)
                                for rank, f in enumerate(faults, 1))
        with store.engine.begin() as connection:
            connection.execute(insert(Case), cases)
            connection.execute(insert(ReadingRow), readings)
            connection.execute(insert(SuspectRow), suspects)
            if verifications:
                connection.execute(insert(Verification), verifications)
    # Rows inserted in bulk skip intake and the bench functions that link returns and keep the
    # flags; link and set them by the store's rules.
    with store.engine.begin() as connection:
        link_unit_returns(connection)
        recompute_all_flags(connection)


def add_bench_people_and_units(store, cases: int) -> int:
    """The benchmark shop's six people, its customers (one for every three cases) and its units
    (four for every five cases); returns the number of units."""
    n_devices = max(1, int(cases * 0.8))
    with store.engine.begin() as connection:
        connection.execute(insert(Technician), [dict(id=i, name=f"Bench person {i}",
                                                     role="technician", active=True)
                                                for i in range(1, 7)])
        connection.execute(insert(Device), [dict(id=i, make=f"Make {i % 40}",
                                                 model=f"Model {i % 400}", kind="usb adapter",
                                                 label_ratings={}, serial=None)
                                            for i in range(1, n_devices + 1)])
        connection.execute(insert(Customer), [dict(id=i, name=f"Customer {i}",
                                                   contact=f"0100 {i:06d}", added_at=START)
                                              for i in range(1, customers_for(cases) + 1)])
    return n_devices


def fill_bench_shop(store, cases: int, seed: int = 1) -> None:
    """A benchmark shop of ``cases`` cases, written in bulk (for the screens' benchmarks)."""
    n_devices = add_bench_people_and_units(store, cases)
    bulk_fill(store, random.Random(seed), 1, cases, n_devices, customers_for(cases))
