"""Scale benchmark for the store: fill a temporary SQLite shop with N cases and time the figures.

Write rate is measured two ways: through the bench API (one committed transaction per reading,
synchronous=FULL, as a technician's entries are kept) on a sample of cases, and as the bulk fill
that builds the rest. Then each owner figure, one sorted page of 200 cases per sortable column
(first page and a middle page), and the file's bytes per case. Times are the best of three runs,
so one disk hiccup does not stand for the query. Targets at 100,000 cases: figures <= 200 ms,
a sorted page <= 50 ms.
"""

from __future__ import annotations

import json
import random
import tempfile
import time
from pathlib import Path

from fixbench.benchmarks.filled_shop import (READINGS_PER_CASE, SUSPECTS_PER_READING,
                                             add_bench_people_and_units, bulk_fill, customers_for,
                                             fake_case, verification_row)
from fixbench.store.case_list import SORTABLE, case_page
from fixbench.store.cases import (RankedSuspect, add_reading, add_verification, close_case,
                                  open_case)
from fixbench.store.database import open_store
from fixbench.store.owner_figures import OWNER_FIGURES

API_SAMPLE_CASES = 100


def _best_ms(action, repeats: int = 3) -> float:
    best = float("inf")
    for _ in range(repeats):
        began = time.perf_counter()
        action()
        best = min(best, (time.perf_counter() - began) * 1000)
    return best


def _api_sample(store, rng: random.Random, first: int, count: int, n_devices: int) -> int:
    readings = 0
    for number in range(first, first + count):
        case, steps = fake_case(rng, number, n_devices)
        case_id = open_case(store, ticket_ref=case["ticket_ref"], device_id=case["device_id"],
                            technician_id=case["technician_id"], family_id=case["family_id"],
                            ratings=case["ratings"], opened_at=case["opened_at"])
        for seq, at, faults in steps:
            add_reading(store, case_id, check_id=f"check_{seq}", typed="12.1 V", value=12.1,
                        unit="V", outcome=None, entered_at=at,
                        suspects=[RankedSuspect(f, 0.5 / rank) for rank, f in enumerate(faults, 1)])
            readings += 1
        for passed in case.pop("verified") or [True]:
            add_verification(store, case_id, **verification_row(passed, steps[-1][1]))
        close_case(store, case_id, outcome="repaired", bench_minutes=case["bench_minutes"] or 30,
                   confirmed_fault=case["confirmed_fault"] or "Q1.short", closed_at=case["closed_at"])
    return readings


def run_store_benchmark(cases: int = 100_000, seed: int = 1) -> dict:
    """Fill a temporary SQLite shop with ``cases`` cases and return the measurements."""
    rng = random.Random(seed)
    with tempfile.TemporaryDirectory(prefix="fixbench-bench-") as folder:
        path = Path(folder) / "bench.sqlite"
        store = open_store(path)
        n_devices = add_bench_people_and_units(store, cases)
        sample = min(API_SAMPLE_CASES, cases)
        began = time.perf_counter()
        api_readings = _api_sample(store, rng, 1, sample, n_devices)
        api_seconds = time.perf_counter() - began
        began = time.perf_counter()
        bulk_fill(store, rng, sample + 1, cases, n_devices, customers_for(cases))
        bulk_seconds = time.perf_counter() - began
        with store.engine.begin() as connection:
            connection.exec_driver_sql("ANALYZE")
        figure_ms = {name: _best_ms(lambda f=figure: f(store)) for name, figure in
                     OWNER_FIGURES.items()}
        page_ms = {}
        for column in SORTABLE:
            for descending in (False, True):
                for offset in (0, cases // 2):
                    key = f"{column} {'desc' if descending else 'asc'} @{offset}"
                    page_ms[key] = _best_ms(lambda c=column, d=descending, o=offset:
                                            case_page(store, c, d, o))
        store.close()  # the last connection to close checkpoints the WAL into the file
        size = sum(p.stat().st_size for p in Path(folder).iterdir() if p.name.startswith(path.name))
    bulk_cases = cases - sample
    return {
        "cases": cases,
        "api_readings_per_s": api_readings / api_seconds if api_seconds else None,
        "api_cases_per_s": sample / api_seconds if api_seconds else None,
        "bulk_cases_per_s": bulk_cases / bulk_seconds if bulk_cases and bulk_seconds else None,
        "owner_query_ms": figure_ms,
        "owner_query_ms_max": max(figure_ms.values()),
        "sorted_page_ms_by_column": page_ms,
        "sorted_page_ms": max(page_ms.values()),
        "bytes_per_case": size / cases if cases else None,
        "readings_per_case": READINGS_PER_CASE,
        "suspects_per_reading": SUSPECTS_PER_READING,
    }


def print_store_benchmark(result: dict, as_json: bool = False) -> None:
    """Print a benchmark result as one JSON object or as the human table."""
    if as_json:
        print(json.dumps(result, indent=2))
        return
    print_store_report(result)


def print_store_report(result: dict) -> None:
    """Print a benchmark result as the short table a person reads."""
    print(f"cases: {result['cases']:,} ({result['readings_per_case']} readings, "
          f"{result['suspects_per_reading']} suspects each)")
    print(f"write, one commit per reading: {result['api_readings_per_s']:.0f} readings/s")
    if result["bulk_cases_per_s"]:
        print(f"write, bulk fill: {result['bulk_cases_per_s']:.0f} cases/s")
    for name, ms in result["owner_query_ms"].items():
        print(f"  {name:<22} {ms:8.1f} ms")
    print(f"owner figure, slowest: {result['owner_query_ms_max']:.1f} ms (target 200)")
    print(f"sorted page of 200, slowest: {result['sorted_page_ms']:.1f} ms (target 50)")
    print(f"bytes per case: {result['bytes_per_case']:.0f}")
