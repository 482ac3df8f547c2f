"""`fixbench benchmark ui --json` prints the figures scripts track (no timing is asserted here:
speed lives in the benchmark's own output, not in tests)."""

import json
import os
import subprocess
import sys


def test_ui_benchmark_prints_its_keys_as_json():
    env = dict(os.environ, QT_QPA_PLATFORM="offscreen")
    result = subprocess.run([sys.executable, "-m", "fixbench", "benchmark", "ui", "--json", "--cases", "300"],
                            env=env, capture_output=True, text=True, timeout=600)
    assert result.returncode == 0, result.stderr[-2000:]
    figures = json.loads(result.stdout)
    for key in ("startup_ratio", "reading_update_ms_median", "history_open_ms", "filter_ms", "figures_ms"):
        assert isinstance(figures[key], (int, float)) and figures[key] > 0, key
    assert figures["review"]["review_cases"] == 300
