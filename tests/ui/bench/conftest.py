"""Fixtures for the bench's GUI tests: a fresh SQLite shop per test, the real main window at
1366x768 offscreen, and helpers that type through the real widgets the way a technician would."""

from __future__ import annotations

import pytest
from PySide6.QtCore import Qt

from fixbench.store import open_store
from fixbench.store.people import add_technician
from fixbench.ui.context import AppContext
from fixbench.ui.main_window import MainWindow

WAIT_MS = 5000


@pytest.fixture
def store(tmp_path):
    opened = open_store(tmp_path / "shop.sqlite")
    add_technician(opened, "Rowan Vell")
    yield opened
    opened.close()


@pytest.fixture
def window(qtbot, store):
    win = MainWindow(AppContext(store))
    qtbot.addWidget(win)
    win.resize(1366, 768)
    win.show()
    qtbot.waitExposed(win)
    return win


@pytest.fixture
def bench(window):
    return window.screens["Bench"]


def settle(qtbot, bench) -> None:
    """Wait until every queued bench job (engine update + store write) has been delivered."""
    qtbot.waitUntil(lambda: not bench.controller.busy, timeout=WAIT_MS)


def type_into(qtbot, line_edit, text: str, enter: bool = True) -> None:
    line_edit.setFocus()
    line_edit.selectAll()
    qtbot.keyClick(line_edit, Qt.Key.Key_Backspace)
    if text:
        qtbot.keyClicks(line_edit, text)
    if enter:
        qtbot.keyClick(line_edit, Qt.Key.Key_Return)


def shoot(widget, folder, name: str):
    """Render a screen to PNG under the test's folder; returns the path."""
    from PySide6.QtWidgets import QApplication

    path = folder / f"{name}.png"
    QApplication.processEvents()  # children added to a visible layout are shown on the next turn
    assert widget.grab().save(str(path))
    return path


def fill_intake(qtbot, bench, *, ticket, make, model, family, ratings, symptoms=(), serial=""):
    """Type an intake the keyboard way: each field, Enter to the next, Ctrl+Enter to open."""
    qtbot.keyClick(bench.panels["cases"].table, Qt.Key.Key_N, Qt.KeyboardModifier.ControlModifier)
    assert bench.page == "intake"
    intake = bench.panels["intake"]
    type_into(qtbot, intake.ticket.edit, ticket)
    type_into(qtbot, intake.make.edit, make)
    type_into(qtbot, intake.model.edit, model)
    type_into(qtbot, intake.serial.edit, serial)
    intake.family.select(family)
    for key, text in ratings.items():
        type_into(qtbot, intake.ratings[key].edit, text, enter=False)
    for check_id in symptoms:
        intake.symptoms[check_id].setChecked(True)
    return intake


def open_intake(qtbot, bench, intake) -> None:
    qtbot.keyClick(intake.ticket.edit, Qt.Key.Key_Return, Qt.KeyboardModifier.ControlModifier)
    settle(qtbot, bench)


def acknowledge(qtbot, bench) -> None:
    panel = bench.panels["cautions"]
    assert bench.page == "cautions"
    qtbot.keyClick(panel.confirm, Qt.Key.Key_Space)
    qtbot.keyClick(panel.confirm, Qt.Key.Key_Return)
    settle(qtbot, bench)
    assert bench.page == "guided"


def type_reading(qtbot, bench, text: str) -> None:
    card = bench.panels["guided"].card
    type_into(qtbot, card.field.edit, text)
    settle(qtbot, bench)
