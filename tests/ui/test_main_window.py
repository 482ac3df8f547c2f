"""The main window: opens before the shop's records are loaded, one tab per screen, a placeholder
for a screen not installed, the demo shop offered to an empty shop."""

from __future__ import annotations

import pytest
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QApplication, QLabel

from fixbench.store import open_store
from fixbench.store.people import add_technician
from fixbench.ui import main_window
from fixbench.ui.context import AppContext
from fixbench.ui.main_window import MainWindow, open_context


@pytest.fixture
def store(tmp_path):
    opened = open_store(tmp_path / "shop.sqlite")
    yield opened
    opened.close()


def test_screen_whose_module_is_missing_shows_a_placeholder(qtbot, store, monkeypatch):
    monkeypatch.setattr(main_window, "SCREENS", main_window.SCREENS[:1] + (
        ("Later", "fixbench.ui.not_built_yet.screen:LaterScreen", "not there yet"),))
    window = MainWindow(AppContext(store))
    qtbot.addWidget(window)
    placeholder = window.screens["Later"]
    assert isinstance(placeholder, QLabel) and "not available" in placeholder.text()
    assert window.tabs.count() == 2 and window.tabs.tabText(0) == "Bench"


def test_screen_module_missing_its_own_import_fails_loudly(qtbot, store, monkeypatch, tmp_path):
    (tmp_path / "broken_screen_mod.py").write_text("import no_such_dependency_xyz\n")
    monkeypatch.syspath_prepend(str(tmp_path))
    monkeypatch.setattr(main_window, "SCREENS", (("Broken", "broken_screen_mod:Screen", ""),))
    with pytest.raises(ModuleNotFoundError):
        MainWindow(AppContext(store))


def test_tabs_switch_with_ctrl_and_number(qtbot, store):
    window = MainWindow(AppContext(store))
    qtbot.addWidget(window)
    window.resize(1366, 768)
    window.show()
    qtbot.waitExposed(window)
    window.activateWindow()
    qtbot.waitUntil(lambda: QApplication.activeWindow() is window)
    table = window.screens["Bench"].panels["cases"].table  # where the keyboard is on start
    qtbot.keyClick(table, Qt.Key.Key_2, Qt.KeyboardModifier.ControlModifier)
    assert window.tabs.currentIndex() == 1
    qtbot.keyClick(window.tabs.currentWidget(), Qt.Key.Key_1, Qt.KeyboardModifier.ControlModifier)
    assert window.tabs.currentIndex() == 0
    assert "Ctrl+1" in window.tabs.tabToolTip(0)


def test_window_shows_before_the_store_is_open_then_attaches(qtbot, tmp_path):
    window = MainWindow()
    qtbot.addWidget(window)
    window.show()
    assert window.centralWidget() is window.opening
    assert "Opening the shop" in window.opening.text()
    context = open_context(str(tmp_path / "new.sqlite"))
    window.attach(context)
    assert window.centralWidget() is window.tabs
    assert window.windowTitle() == "fixbench \u2014 new.sqlite"
    context.store.close()


def test_empty_shop_is_offered_the_demo_and_a_shop_with_cases_is_not(qtbot, store):
    window = MainWindow(AppContext(store))
    qtbot.addWidget(window)
    window.show()
    bench = window.screens["Bench"]
    assert bench.panels["cases"].empty_offer.isVisible()
    assert "Open the demo shop" in bench.demo_button.text()
    from fixbench.store.cases import open_case
    from fixbench.store.people import add_device

    tech = add_technician(store, "Rowan Vell")
    device = add_device(store, make="Quillon", model="QX-5", kind="phone charger", label_ratings={})
    open_case(store, ticket_ref="T-1", device_id=device, technician_id=tech, family_id="pwm_flyback",
              ratings={"mains": "230 V", "output": "5 V", "current": "2 A"})
    again = MainWindow(AppContext(store))
    qtbot.addWidget(again)
    again.show()
    assert not again.screens["Bench"].panels["cases"].empty_offer.isVisible()


def test_demo_shop_missing_is_said_on_the_status_line(qtbot, store, monkeypatch, tmp_path):
    from fixbench.store import location

    monkeypatch.setattr(location, "demo_database_path", lambda: tmp_path / "no-demo.sqlite", raising=False)
    window = MainWindow(AppContext(store))
    qtbot.addWidget(window)
    window.show()
    bench = window.screens["Bench"]
    bench.demo_button.click()
    assert "not installed" in bench.status.text()
    assert window.context.store is store


def test_demo_shop_opens_a_copy_and_leaves_the_shipped_file_alone(qtbot, store, monkeypatch, tmp_path):
    import hashlib

    from fixbench.store import location

    shipped = location.demo_database_path()
    if shipped is None:
        pytest.skip("no demo database in this checkout")
    before = hashlib.sha256(shipped.read_bytes()).hexdigest()
    monkeypatch.setattr(location, "data_folder", lambda: tmp_path / "data")
    window = MainWindow(AppContext(store))
    qtbot.addWidget(window)
    window.show()
    window.screens["Bench"].demo_button.click()
    qtbot.waitUntil(lambda: window.context.store is not store, timeout=10000)
    opened = window.context.store.path
    assert opened.parent == tmp_path / "data" / "demo-shop"
    window.context.store.close()
    assert hashlib.sha256(shipped.read_bytes()).hexdigest() == before
    assert not shipped.with_name(shipped.name + "-wal").exists()
