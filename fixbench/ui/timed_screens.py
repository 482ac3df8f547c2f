"""The window driven offscreen and timed, for `fixbench benchmark ui` (which builds the shops, reads
the results and prints them; see :mod:`fixbench.benchmarks.window_speed`).

- :func:`time_reading_updates`: the real main window on a given shop; simulated units of the
  largest family (most checks) are diagnosed through the step card, and each reading is timed
  from the Enter key to the moment the suspects and the next step are on screen and the reading
  is committed to the database.
- :func:`time_owner_screens`: on a filled shop, the time until the History tab shows its first
  page and count, until a filter by technician and fault has been counted and shown, until the
  Figures tab has counted and drawn every chart and table of its pages, and until a Figures tab
  opened on its Money page has drawn that page's charts and table. Each is measured from the
  action to the moment the result is on screen, background work included.
"""

from __future__ import annotations

import statistics
import sys
import time

from PySide6.QtCore import Qt, QThreadPool
from PySide6.QtTest import QTest
from PySide6.QtWidgets import QApplication

from fixbench.ui.context import AppContext

TIMEOUT_S = 120.0
READING_RATINGS = {"mains": "230 V", "output": "5 V", "current": "2 A"}


def _wait(app, done) -> None:
    limit = time.perf_counter() + TIMEOUT_S
    while not done():
        if time.perf_counter() > limit:
            raise TimeoutError("the screen did not finish within the benchmark's time limit")
        app.processEvents()
        time.sleep(0.001)


def _largest_family(knowledge):
    return max(knowledge.families.values(), key=lambda f: (len(f.checks), len(f.faults)))


def time_reading_updates(store, readings: int) -> dict:
    """Take ``readings`` readings through the bench's step card on ``store`` (which has a
    technician) and time each from Enter to the updated screen."""
    from fixbench.engine import simulate_readings
    from fixbench.physics.ratings import parse_ratings
    from fixbench.ui.main_window import MainWindow
    from fixbench.workflows.intake import IntakeForm

    app = QApplication.instance() or QApplication(sys.argv[:1])
    window = MainWindow(AppContext(store))
    window.resize(1366, 768)
    window.show()
    bench = window.screens["Bench"]
    family = _largest_family(bench.context.knowledge)
    faults = [f.id for f in family.faults]
    times: list[float] = []
    case = 0

    def wait(condition) -> None:
        deadline = time.perf_counter() + TIMEOUT_S
        while not condition():
            app.processEvents()
            if time.perf_counter() > deadline:
                raise RuntimeError("the bench did not answer in time")

    while len(times) < readings:
        fault = faults[case % len(faults)]
        unit = simulate_readings(family, parse_ratings(READING_RATINGS), fault, seed=case,
                                 noise=True)
        bench.controller.open_case(IntakeForm(f"UI-BENCH-{case}", "Benchmark", "B-1", "",
                                              "phone charger", family.id, READING_RATINGS, ()))
        wait(lambda: not bench.controller.busy)
        bench.controller.acknowledge_cautions()
        wait(lambda: not bench.controller.busy and bench.page == "guided")
        card = bench.panels["guided"].card
        while card.field.isEnabled() and len(times) < readings:
            check_id = bench.controller.current_check_id()
            card.field.edit.setText(unit[check_id])
            kept = len(bench.controller.view.state.readings)
            start = time.perf_counter()
            QTest.keyClick(card.field.edit, Qt.Key.Key_Return)
            wait(lambda kept=kept: not bench.controller.busy
                 and len(bench.controller.view.state.readings) == kept + 1)
            app.processEvents()  # the repaint of the suspects, the picture and the next card
            times.append(time.perf_counter() - start)
        bench.controller.back_to_cases()
        case += 1
    window.close()
    ms = sorted(t * 1000 for t in times)
    return {"reading_update_ms_median": round(statistics.median(ms), 2),
            "reading_update_ms_p90": round(ms[int(0.9 * (len(ms) - 1))], 2),
            "reading_update_ms_max": round(ms[-1], 2), "reading_update_samples": len(ms),
            "reading_update_family": family.id}


def time_owner_screens(store) -> dict:
    """Open the History and Figures screens on a filled ``store`` and time them."""
    from fixbench.ui.review.figure_pages import PAGES
    from fixbench.ui.review.figures_screen import FiguresScreen
    from fixbench.ui.review.history import HistoryScreen
    from fixbench.workflows.review import CaseFilter

    app = QApplication.instance() or QApplication([])
    context = AppContext(store)
    began = time.perf_counter()
    history = HistoryScreen(context)
    history.resize(1366, 768)
    history.show()
    _wait(app, lambda: history.model.rows and not history.controller.loading)
    history_open = (time.perf_counter() - began) * 1000

    first = next((row for row in history.model.rows if row.fault), history.model.rows[0])
    fault = ((first.family, first.fault or "Q1.short"),)
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

    money_page = [title.replace("&", "") for title in PAGES].index("Money")
    began = time.perf_counter()
    money = FiguresScreen(context, first_page=money_page)
    money.resize(1366, 768)
    money.show()
    _wait(app, lambda: MONEY_FIGURES <= money.drawn)
    money.repaint()
    money_ms = (time.perf_counter() - began) * 1000
    _wait(app, lambda: money.snapshot is not None and money.choices is not None)
    QThreadPool.globalInstance().waitForDone()
    app.processEvents()
    for screen in (history, figures, money):
        screen.close()
        screen.deleteLater()
    app.processEvents()
    return {"history_open_ms": history_open, "filter_ms": filter_ms, "filter_matched": matched,
            "figures_ms": figures_ms, "money_figures_ms": money_ms}


# What the Money page draws: money by month, by model and by technician.
MONEY_FIGURES = {"money_by_month", "money_by_model", "money_by_technician"}
