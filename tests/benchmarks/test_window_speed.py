"""`fixbench benchmark ui --json` prints the figures scripts track (no timing is asserted here:
speed lives in the benchmark's own output, not in tests)."""

import json
import os
import subprocess
import sys

import pytest


@pytest.mark.slow
def test_ui_benchmark_prints_its_keys_as_json():
    # One start-up run each: the keys are what is checked here, not the figures.
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    result = subprocess.run([sys.executable, "-m", "fixbench", "benchmark", "ui", "--json", "--cases", "300",
                             "--runs", "1"],
                            env=env, capture_output=True, text=True, timeout=600)
    assert result.returncode == 0, result.stderr[-2000:]
    figures = json.loads(result.stdout)
    for key in ("startup_ratio", "startup_fixbench_first_paint_ms_median", "startup_fixbench_ms_median",
                "reading_update_ms_median", "history_open_ms", "filter_ms", "figures_ms",
                "money_figures_ms"):
        assert isinstance(figures[key], (int, float)) and figures[key] > 0, key
    assert figures["review"]["review_cases"] == 300 and figures["startup_runs"] == 1
    # Usable means the shop opened and the bench drawn, after the window's first paint.
    assert figures["startup_fixbench_ms_median"] > figures["startup_fixbench_first_paint_ms_median"]
