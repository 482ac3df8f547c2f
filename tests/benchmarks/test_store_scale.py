"""The scale benchmark runs end to end on a small shop and reports what the CLI promises."""

from __future__ import annotations

import json

from fixbench.benchmarks.store_scale import print_store_benchmark, run_store_benchmark
from fixbench.store.owner_figures import OWNER_FIGURES


def test_small_benchmark_reports_rates_query_times_and_size(capsys):
    result = run_store_benchmark(cases=300, seed=2)
    assert result["cases"] == 300
    assert set(result["owner_query_ms"]) == set(OWNER_FIGURES)
    assert result["owner_query_ms_max"] == max(result["owner_query_ms"].values()) > 0
    assert result["sorted_page_ms"] > 0 and result["api_readings_per_s"] > 0
    assert 500 < result["bytes_per_case"] < 50_000
    print_store_benchmark(result, as_json=True)
    assert json.loads(capsys.readouterr().out)["cases"] == 300


def test_store_benchmark_command_prints_the_table_with_targets(capsys):
    from fixbench.cli import main

    assert main(["benchmark", "store", "--cases", "300", "--seed", "1"]) == 0
    out = capsys.readouterr().out
    assert "cases: 300" in out
    assert all(name in out for name in OWNER_FIGURES)
    assert "(target 200)" in out and "(target 50)" in out
