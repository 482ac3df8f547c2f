"""The scale benchmark runs end to end on a small shop and reports what the CLI promises."""

from __future__ import annotations

import json

from fixbench.store.benchmark import print_store_benchmark, run_store_benchmark
from fixbench.store.figures import OWNER_FIGURES


def test_small_benchmark_reports_rates_query_times_and_size(capsys):
    result = run_store_benchmark(cases=300, seed=2)
    assert result["cases"] == 300
    assert set(result["owner_query_ms"]) == set(OWNER_FIGURES)
    assert result["owner_query_ms_max"] == max(result["owner_query_ms"].values()) > 0
    assert result["sorted_page_ms"] > 0 and result["api_readings_per_s"] > 0
    assert 500 < result["bytes_per_case"] < 50_000
    print_store_benchmark(result, as_json=True)
    assert json.loads(capsys.readouterr().out)["cases"] == 300
