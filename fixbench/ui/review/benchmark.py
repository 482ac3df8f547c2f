"""How quickly the owner's screens answer on a big history: a temporary shop of N cases (filled by
the store benchmark's bulk filler), then, in an offscreen window, the time until

- the History tab shows its first page and count (``history_open_ms``),
- a filter by technician and fault has been counted and shown (``filter_ms``),
- the Figures tab has counted and drawn every chart (``figures_ms``).

Each is measured from the action to the moment the result is on screen, background work included.
Target at 100,000 cases: 1 s each. Run by ``fixbench benchmark ui``.
"""

from __future__ import annotations

import os
import tempfile
import time
from pathlib import Path


TARGET_MS = 1000.0
TIMEOUT_S = 120.0


def _fill(path: Path, cases: int):
    from fixbench.store.benchmark import fill_bench_shop
    from fixbench.store.database import open_store

    store = open_store(path)
    fill_bench_shop(store, cases)
    with store.engine.begin() as connection:
        connection.exec_driver_sql("ANALYZE")
    return store


def _wait(app, done) -> None:
    limit = time.perf_counter() + TIMEOUT_S
    while not done():
        if time.perf_counter() > limit:
            raise TimeoutError("the screen did not finish within the benchmark's time limit")
        app.processEvents()
        time.sleep(0.001)


def measure_review(cases: int) -> dict:
    """Fill a temporary shop with ``cases`` cases and time the review screens offscreen."""
    os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
    from PySide6.QtCore import QThreadPool
    from PySide6.QtWidgets import QApplication

    from fixbench.store.case_filters import CaseFilter
    from fixbench.ui.context import AppContext
    from fixbench.ui.review.figures import FiguresScreen
    from fixbench.ui.review.history import HistoryScreen

    app = QApplication.instance() or QApplication([])
    with tempfile.TemporaryDirectory(prefix="fixbench-review-") as folder:
        store = _fill(Path(folder) / "review.sqlite", cases)
        context = AppContext(store)
        began = time.perf_counter()
        history = HistoryScreen(context)
        history.resize(1366, 768)
        history.show()
        _wait(app, lambda: history.model.rows and not history.controller.loading)
        history_open = (time.perf_counter() - began) * 1000

        fault = history.model.rows[0].fault or "Q1.short"
        began = time.perf_counter()
        history.apply_filter(CaseFilter(technician_id=2, fault=fault).as_dict())
        _wait(app, lambda: not history.controller.loading)
        filter_ms = (time.perf_counter() - began) * 1000
        matched = history.model.total

        began = time.perf_counter()
        figures = FiguresScreen(context)
        figures.resize(1366, 768)
        figures.show()
        _wait(app, lambda: figures.snapshot is not None)
        figures.repaint()
        figures_ms = (time.perf_counter() - began) * 1000
        # Let the work still running (the filter lists) finish before the database goes away.
        _wait(app, lambda: figures.choices is not None)
        QThreadPool.globalInstance().waitForDone()
        app.processEvents()
        for screen in (history, figures):
            screen.close()
            screen.deleteLater()
        app.processEvents()
        store.close()
    # Prefixed where the UI benchmark, which merges these into its own result, has the same name.
    return {"review_cases": cases, "history_open_ms": history_open, "filter_ms": filter_ms,
            "filter_matched": matched, "figures_ms": figures_ms, "review_target_ms": TARGET_MS}
