"""The owner's screens driven and timed on a small filled shop: the three times the UI benchmark
merges are there (their speed is judged by `fixbench benchmark ui`, not here)."""

from __future__ import annotations

import pytest

from fixbench.benchmarks.filled_shop import fill_bench_shop
from fixbench.benchmarks.window_speed import measure_review
from fixbench.store import open_store
from fixbench.ui.timed_screens import time_owner_screens


@pytest.mark.slow
def test_owner_screens_report_the_three_times(qapp, tmp_path):
    store = open_store(tmp_path / "filled.sqlite")
    fill_bench_shop(store, 600)
    try:
        result = time_owner_screens(store)
    finally:
        store.close()
    for key in ("history_open_ms", "filter_ms", "figures_ms"):
        assert result[key] > 0
    assert 0 < result["filter_matched"] < 600


@pytest.mark.slow
def test_measure_review_prefixes_what_the_ui_benchmark_merges(qapp):
    result = measure_review(600)
    assert result["review_cases"] == 600
    assert result["review_target_ms"] == 1000.0
    assert "cases" not in result and "target_ms" not in result
    for key in ("history_open_ms", "filter_ms", "figures_ms"):
        assert result[key] > 0
