"""`fixbench benchmark ui`: how fast the window appears and how fast the bench answers a reading.

- Start-up: each run is a fresh ``python -c`` subprocess, timed by this process from launch to the
  lines the child prints when its window is first shown (with its "opening the shop" line) and
  when it is usable (the shop opened off the GUI thread and the bench drawn in the window).
  fixbench's usable window is compared with a bare PySide6 window shown the same way; runs
  alternate between the two so a busy machine slows both alike. Medians are reported; the target is
  a ratio of at most 2.0, usable window to bare window.
- Reading update: the real main window, offscreen, on a fresh temporary database; a simulated unit
  of the largest family (most checks) is diagnosed through the step card, and each reading is
  timed from the Enter key to the moment the suspects and the next step are on screen and the
  reading is committed to the database. Target: median at most 100 ms.
- The owner's screens on a temporary shop of N cases (the store benchmark's bulk filler, with
  customers, prices and warranty returns): the History tab's first page, a filter, the Figures
  tab drawn (every page), the Figures tab opened on its Money page. Target at 100,000 cases: 1 s
  each.

The window is driven by :mod:`fixbench.ui.timed_screens`; this module builds the shops, runs the
start-up processes and prints.
"""

from __future__ import annotations

import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

from fixbench.app import display_available
from fixbench.benchmarks.filled_shop import fill_bench_shop
from fixbench.store import open_store
from fixbench.store.people import add_technician

STARTUP_RUNS = 5
READINGS = 30
STARTUP_TARGET = 2.0
READING_TARGET_MS = 100.0
TIMEOUT_S = 120
REVIEW_TARGET_MS = 1000.0  # each, with 100,000 cases

BARE = """
import os, sys
from PySide6.QtCore import QTimer
from PySide6.QtWidgets import QApplication, QMainWindow
app = QApplication(sys.argv[:1])
window = QMainWindow()
window.resize(1366, 768)
window.show()
QTimer.singleShot(0, lambda: (print("shown", flush=True), os._exit(0)))
app.exec()
"""
FIXBENCH = """
import os, sys
from fixbench.ui.main_window import run_app
run_app(sys.argv[1], on_shown=lambda window: print("shown", flush=True),
        on_ready=lambda window: (print("usable", flush=True), os._exit(0)))
"""


def _environment() -> dict[str, str]:
    env = dict(os.environ)
    if not display_available():
        env["QT_QPA_PLATFORM"] = "offscreen"
    return env


def _times_to_window(code: str, args: list[str], env: dict[str, str]) -> dict[str, float]:
    """Seconds from launch to each line the child prints ("shown", and "usable" for fixbench), up
    to the last one its code prints."""
    start = time.perf_counter()
    child = subprocess.Popen([sys.executable, "-c", code, *args], stdout=subprocess.PIPE,
                             stderr=subprocess.PIPE, text=True, env=env)
    last = "usable" if "usable" in code else "shown"
    seen: dict[str, float] = {}
    try:
        for line in child.stdout:
            seen[line.strip()] = time.perf_counter() - start
            if line.strip() == last:
                return seen
        raise RuntimeError(f"the window did not become {last}: {child.stderr.read()[-2000:]}")
    finally:
        child.kill()
        child.wait(TIMEOUT_S)


def measure_startup(database: Path, runs: int = STARTUP_RUNS) -> dict:
    env = _environment()
    _times_to_window(BARE, [], env)  # warm the disk cache for both alike
    _times_to_window(FIXBENCH, [str(database)], env)
    bare, shown, usable = [], [], []
    for _ in range(runs):
        bare.append(_times_to_window(BARE, [], env)["shown"])
        ours = _times_to_window(FIXBENCH, [str(database)], env)
        shown.append(ours["shown"])
        usable.append(ours["usable"])
    bare_ms = statistics.median(bare) * 1000
    shown_ms, usable_ms = statistics.median(shown) * 1000, statistics.median(usable) * 1000
    return {"startup_bare_ms_median": round(bare_ms, 1),
            "startup_fixbench_first_paint_ms_median": round(shown_ms, 1),
            "startup_fixbench_ms_median": round(usable_ms, 1),
            "startup_ratio": round(usable_ms / bare_ms, 3), "startup_runs": runs,
            "qt_platform": env.get("QT_QPA_PLATFORM", "default")}


def _offscreen_unless_displayed() -> None:
    # Set before Qt is first imported in this process.
    if not display_available():
        os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")


def measure_reading_update(folder: Path, readings: int = READINGS) -> dict:
    _offscreen_unless_displayed()
    from fixbench.ui.timed_screens import time_reading_updates

    store = open_store(folder / "bench.sqlite")
    add_technician(store, "Bench Timer")
    try:
        return time_reading_updates(store, readings)
    finally:
        store.close()


def measure_review(cases: int) -> dict:
    """Fill a temporary shop with ``cases`` cases and time the owner's screens offscreen."""
    os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
    from fixbench.ui.timed_screens import time_owner_screens

    with tempfile.TemporaryDirectory(prefix="fixbench-review-") as folder:
        store = open_store(Path(folder) / "review.sqlite")
        try:
            fill_bench_shop(store, cases)
            with store.engine.begin() as connection:
                connection.exec_driver_sql("ANALYZE")
            timed = time_owner_screens(store)
        finally:
            store.close()
    # Prefixed where the UI benchmark, which merges these into its own result, has the same name.
    return {"review_cases": cases, **timed, "review_target_ms": REVIEW_TARGET_MS}


def _startup_database(folder: Path) -> Path:
    path = folder / "startup.sqlite"
    store = open_store(path)
    add_technician(store, "Bench Timer")
    store.close()
    return path


REVIEW_KEYS = ("history_open_ms", "filter_ms", "figures_ms", "money_figures_ms")


def run_ui_benchmark(cases: int, startup_runs: int = STARTUP_RUNS) -> dict:
    with tempfile.TemporaryDirectory(prefix="fixbench-ui-") as temp:
        folder = Path(temp)
        result = {"targets": {"startup_ratio": STARTUP_TARGET, "reading_update_ms_median": READING_TARGET_MS}}
        result.update(measure_startup(_startup_database(folder), runs=startup_runs))
        result.update(measure_reading_update(folder))
    review = measure_review(cases)
    result["review"] = review
    # The owner's screens' figures, at the top level where scripts look for them.
    for key in REVIEW_KEYS:
        result[key] = review[key]
    result["targets"].update({key: REVIEW_TARGET_MS for key in REVIEW_KEYS})
    return result


def print_ui_report(result: dict) -> None:
    ok = lambda good: "ok" if good else "OVER TARGET"
    print(f"Start-up (median of {result['startup_runs']} fresh processes each, Qt platform "
          f"{result['qt_platform']}):")
    print(f"  bare PySide6 window shown                 {result['startup_bare_ms_median']:8.1f} ms")
    print(f"  fixbench window shown (opening the shop)  "
          f"{result['startup_fixbench_first_paint_ms_median']:8.1f} ms")
    print(f"  fixbench window usable (shop open, bench) {result['startup_fixbench_ms_median']:8.1f} ms")
    print(f"  ratio, usable to bare                     {result['startup_ratio']:8.2f}   "
          f"(target <= {STARTUP_TARGET:g}: {ok(result['startup_ratio'] <= STARTUP_TARGET)})")
    print(f"Enter on a reading to updated suspects and next step ({result['reading_update_family']}, "
          f"{result['reading_update_samples']} readings, saved to SQLite each time):")
    print(f"  median {result['reading_update_ms_median']:.1f} ms, 90th percentile "
          f"{result['reading_update_ms_p90']:.1f} ms, worst {result['reading_update_ms_max']:.1f} ms   "
          f"(target median <= {READING_TARGET_MS:g} ms: "
          f"{ok(result['reading_update_ms_median'] <= READING_TARGET_MS)})")
    print(f"Owner's screens with {result['review']['review_cases']:,} cases:")
    for key, title in zip(REVIEW_KEYS, ("history tab with its first page", "a filter applied",
                                        "figures tab drawn, every page",
                                        "figures opened on the money page")):
        print(f"  {title:34s} {result[key]:8.1f} ms   (target <= {REVIEW_TARGET_MS:g} ms: "
              f"{ok(result[key] <= REVIEW_TARGET_MS)})")
