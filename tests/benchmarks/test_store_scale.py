"""The scale benchmark runs end to end on a small shop and reports what the CLI promises."""

from __future__ import annotations

import json

import pytest

from fixbench.benchmarks import store_scale
from fixbench.benchmarks.store_scale import print_store_benchmark, run_store_benchmark
from fixbench.store.owner_figures import OWNER_FIGURES

pytestmark = pytest.mark.slow


@pytest.fixture(scope="module")
def small_run():
    """One run on 300 cases, shared by the tests below (a run fills and times a whole shop)."""
    return run_store_benchmark(cases=300, seed=2)


def test_small_benchmark_reports_rates_query_times_and_size(small_run, capsys):
    result = small_run
    assert result["cases"] == 300
    assert set(result["owner_query_ms"]) == set(OWNER_FIGURES)
    assert result["owner_query_ms_max"] == max(result["owner_query_ms"].values()) > 0
    assert result["sorted_page_ms"] > 0 and result["api_readings_per_s"] > 0
    assert 500 < result["bytes_per_case"] < 50_000
    print_store_benchmark(result, as_json=True)
    assert json.loads(capsys.readouterr().out)["cases"] == 300


def test_store_benchmark_command_prints_the_table_with_targets(small_run, capsys, monkeypatch):
    from fixbench.cli import main

    asked = []
    monkeypatch.setattr(store_scale, "run_store_benchmark",
                        lambda cases, seed: asked.append((cases, seed)) or small_run)
    assert main(["benchmark", "store", "--cases", "300", "--seed", "2"]) == 0
    assert asked == [(300, 2)]
    out = capsys.readouterr().out
    assert "cases: 300" in out
    assert all(name in out for name in OWNER_FIGURES)
    assert "(target 200)" in out and "(target 50)" in out
