"""The Figures screen: numbers shown equal numbers counted by hand from the raw rows, and a click
on a bar lists those cases on the History screen."""

from __future__ import annotations

import math
from collections import Counter
from datetime import date, datetime, timedelta

import pytest
from PySide6.QtCore import QDate, QPointF, Qt

from fixbench.store import open_store
from fixbench.store.cases import (RankedSuspect, add_reading, add_verification, close_case,
                                  open_case)
from fixbench.store.people import add_device, add_practice_attempt, add_technician
from fixbench.ui.context import AppContext
from fixbench.ui.review.figures_screen import FiguresScreen
from fixbench.ui.review.history import HistoryScreen

from .helpers import settle

RATINGS = {"mains": "230 V", "frequency": "50 Hz", "output": "5 V", "current": "2 A"}
# ticket, technician, device, month, day, outcome, minutes, confirmed fault, engine's first
# suspect, first verification failed
PLAN = [
    ("A1", 0, 0, 3, 4, "repaired", 30, "Q1.short", "Q1.short", False),
    ("A2", 0, 1, 3, 6, "repaired", 45, "Q1.short", "C1.dried", False),
    ("A3", 1, 2, 3, 9, "repaired", 20, "C1.dried", "C1.dried", True),
    ("A4", 1, 3, 3, 12, "no_fault_found", 15, None, "Q1.short", False),
    ("A5", 2, 4, 3, 20, "repaired", 60, "R1.open", "R1.open", False),
    ("A6", 0, 0, 4, 2, "repaired", 25, "F1.open", "Q1.short", False),  # device 0 again: A1 came back
    ("A7", 2, 5, 4, 8, "not_economical", 10, None, "C1.dried", False),
    ("A8", 1, 6, 4, 15, "repaired", 35, "Q1.short", "Q1.short", False),
    ("A9", 2, 7, 4, 22, "repaired", 50, "C1.dried", "Q1.short", False),
]
PEOPLE = ("Hanne Loring", "Ivo Brask", "Jolanda Mirr")


@pytest.fixture
def hand_shop(tmp_path, knowledge):
    store = open_store(tmp_path / "hand.sqlite")
    people = [add_technician(store, name) for name in PEOPLE]
    devices = [add_device(store, make="Quorra", model=f"QD-{i % 2}", kind="charger",
                          label_ratings=RATINGS) for i in range(8)]
    family = knowledge.family("pwm_flyback")
    for ticket, who, unit, month, day, outcome, minutes, fault, first, failed in PLAN:
        opened = datetime(2024, month, day, 10)
        case = open_case(store, ticket_ref=ticket, device_id=devices[unit],
                         technician_id=people[who], family_id="pwm_flyback", ratings=RATINGS,
                         opened_at=opened)
        add_reading(store, case, check_id="fuse_resistance", typed="0.2 ohm", value=0.2,
                    unit="ohm", outcome=None, entered_at=opened + timedelta(minutes=5),
                    suspects=[RankedSuspect(first, 0.6), RankedSuspect("U1.dead", 0.2)])
        if failed:
            add_verification(store, case, check_id="output_board", typed="0 V", value=0.0,
                             unit="V", outcome=None, passed=False, entered_at=opened)
        close_case(store, case, outcome=outcome, bench_minutes=minutes, confirmed_fault=fault,
                   confirmed_part=fault and family.fault(fault).part,
                   closed_at=opened + timedelta(hours=3))
    yield store
    store.close()


def _median(values):
    s = sorted(values)
    n = len(s)
    return (s[(n + 1) // 2 - 1] + s[(n + 2) // 2 - 1]) / 2


def _nearest_rank(values, p):
    # Hyndman & Fan definition 2 family, as the store documents: rank = ceil(p * n)
    s = sorted(values)
    return s[math.ceil(p * len(s)) - 1]


@pytest.fixture
def figures(qtbot, hand_shop, knowledge):
    screen = FiguresScreen(AppContext(hand_shop, knowledge))
    qtbot.addWidget(screen)
    screen.resize(1366, 768)
    screen.show()
    settle(qtbot, lambda: screen.snapshot is not None and screen.choices is not None)
    screen.since.setDate(QDate(2024, 1, 1))
    screen.until.setDate(QDate(2024, 12, 31))
    qtbot.mouseClick(screen.show_button, Qt.MouseButton.LeftButton)
    settle(qtbot, lambda: screen.snapshot.scope.since == date(2024, 1, 1))
    return screen


def test_figures_equal_the_hand_count(figures, knowledge):
    repaired = [p for p in PLAN if p[5] == "repaired"]
    # A1 came back: its device was opened again (A6) within 90 days of closing.
    came_back = {"A1"}
    first_time = [p for p in repaired if not p[9] and p[0] not in came_back]
    minutes = [p[6] for p in PLAN]
    confirmed = [p for p in PLAN if p[7]]
    hits = sum(1 for p in confirmed if p[7] == p[8])
    head = figures.snapshot.headline()
    assert head["closed"] == len(PLAN)
    assert head["repaired"] == len(repaired)
    assert head["first_time_fix_rate"] == pytest.approx(len(first_time) / len(repaired))
    assert head["comeback_rate"] == pytest.approx(len(came_back) / len(repaired))
    assert head["median_minutes"] == _median(minutes)
    assert head["p25_minutes"] == _nearest_rank(minutes, 0.25)
    assert head["p75_minutes"] == _nearest_rank(minutes, 0.75)
    assert head["first_suspect_rate"] == pytest.approx(hits / len(confirmed))
    text = figures.headline.text()
    assert f"<b>{len(PLAN)}</b> closed cases" in text
    assert f"First-time fix <b>{len(first_time) / len(repaired):.0%}</b>" in text
    assert f"median <b>{_median(minutes):g} min</b>" in text
    faults = Counter(knowledge.family("pwm_flyback").fault(p[7]).title for p in confirmed)
    shown = dict(zip([r[0] for r in figures.snapshot.faults.rows], figures.charts.faults.values))
    assert shown == dict(faults)
    per_month = Counter(p[3] for p in PLAN)
    closed_line = next(item for item in figures.charts.volume.listDataItems()
                       if item.name() == "closed")
    assert list(closed_line.getData()[1]) == [per_month[3], per_month[4]]
    # The technician chart shows each one's median bench minutes (the table beside it already
    # counts their cases).
    minutes = {name: _median([p[6] for p in PLAN if PEOPLE[p[1]] == name]) for name in PEOPLE}
    assert dict(zip([r[0] for r in figures.charts.people.rows], figures.charts.people.values)) \
        == minutes


def test_clicking_a_fault_bar_lists_those_cases(qtbot, figures, hand_shop, knowledge):
    history = HistoryScreen(AppContext(hand_shop, knowledge))
    qtbot.addWidget(history)
    figures.filter_requested.connect(history.apply_filter)
    figures.pages.setCurrentIndex(1)
    qtbot.wait(50)
    top_fault = figures.snapshot.faults.rows[0][-1]
    with qtbot.waitSignal(figures.filter_requested, timeout=3000) as signal:
        qtbot.mouseClick(figures.charts.faults.viewport(), Qt.MouseButton.LeftButton,
                         pos=figures.charts.faults.bar_centre(0))
    assert signal.args[0]["fault"] == top_fault
    assert signal.args[0]["since"] == date(2024, 1, 1)
    settle(qtbot, lambda: history.controller.case_filter.fault == top_fault
           and not history.controller.loading)
    assert history.model.total == sum(1 for p in PLAN if ("pwm_flyback", p[7]) in top_fault)
    assert history.filters.fault.currentText() == figures.snapshot.faults.rows[0][0]


def test_clicking_beside_the_bars_does_nothing(qtbot, figures):
    figures.pages.setCurrentIndex(1)
    qtbot.wait(50)
    emitted = []
    figures.filter_requested.connect(emitted.append)
    corner = figures.charts.faults.viewport().rect().topRight()
    qtbot.mouseClick(figures.charts.faults.viewport(), Qt.MouseButton.LeftButton, pos=corner)
    assert emitted == []


def test_device_model_scope_counts_only_that_model(qtbot, figures):
    figures.device.setCurrentIndex(figures.device.findText("Quorra QD-0"))
    qtbot.mouseClick(figures.show_button, Qt.MouseButton.LeftButton)
    settle(qtbot, lambda: figures.snapshot.scope.model == "QD-0")
    on_model = [p for p in PLAN if p[2] % 2 == 0]
    assert figures.snapshot.headline()["closed"] == len(on_model)
    family = figures.context.knowledge.family("pwm_flyback")
    faults = Counter(family.fault(p[7]).title for p in on_model if p[7])
    assert dict(zip([r[0] for r in figures.snapshot.faults.rows], figures.charts.faults.values)) \
        == dict(faults)


def _view_range(chart):
    return chart.getPlotItem().vb.viewRange()


def test_value_axes_start_at_zero_and_fit_a_small_rate(figures):
    """The comeback rate (one in six repairs here, a few % in a shop) is drawn on an axis that fits
    it, not flat on 0-100 %; case volume counts from zero (issue: neither did)."""
    charts = figures.charts
    (_x, (low, high)) = _view_range(charts.came_back)
    rates = [row[4] * 100 for row in figures.snapshot.rates_by_month.rows if row[4] is not None]
    assert low == 0 and max(rates) < high <= 2 * max(rates)
    (_x, (low, high)) = _view_range(charts.volume)
    assert low == 0 and high >= max(row[1] for row in figures.snapshot.rates_by_month.rows)


def test_the_legend_covers_no_point(qtbot, figures):
    charts = figures.charts
    for chart in (charts.volume, charts.money_months, charts.practice):
        chart.resize(600, 300)
        qtbot.wait(20)
        if not chart.points:
            continue
        legend = chart.legend.sceneBoundingRect()
        view = chart.getPlotItem().vb
        for x, y in chart.points:
            assert not legend.contains(view.mapViewToScene(QPointF(x, y))), chart
    assert charts.first_time.legend is None and charts.came_back.legend is None  # one line each


def test_practice_scores_are_drawn_out_of_100(qtbot, hand_shop, knowledge):
    """Practice scores are out of 100; drawn as fractions times 100 they read about 7000 %
    (issue: the People chart showed nothing)."""
    trainee = add_technician(hand_shop, "Kestrel Vane", role="trainee")
    for week, score in enumerate((62.0, 71.5, 87.2)):
        add_practice_attempt(hand_shop, trainee_id=trainee, scenario="drawn:normal:pwm_flyback:"
                             "Q1.short:s1", checks_used=7, minutes=20.0, score=score,
                             safety_slips=0, attempted_at=datetime(2024, 2 + week, 10, 16))
    screen = FiguresScreen(AppContext(hand_shop, knowledge))
    qtbot.addWidget(screen)
    screen.show()
    settle(qtbot, lambda: screen.snapshot is not None)
    line = screen.charts.practice.listDataItems()[0]
    assert list(line.getData()[1]) == [62.0, 71.5, 87.2]
    (_x, (low, high)) = _view_range(screen.charts.practice)
    assert low == 0 and 87.2 < high <= 200
