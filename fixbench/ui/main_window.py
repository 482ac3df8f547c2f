"""The main window: one tab per screen, and the start-up that opens the shop's database.

The window shows first, with one line saying the shop is being opened; the store (migrations,
backups) and the knowledge base are opened off the GUI thread, then the first screen (the bench) is
built; each other screen is built when its tab is first opened. So the window appears about as
fast as a bare Qt window, whatever the size of the shop's records, and is usable without waiting
for the owner's and the trainee's screens (their imports, charts and first queries).
"""

from __future__ import annotations

import importlib
import sys
from collections.abc import Callable

from PySide6.QtCore import Qt, QTimer
from PySide6.QtGui import QKeySequence, QShortcut
from PySide6.QtWidgets import QApplication, QLabel, QMainWindow, QPushButton, QTabWidget, QWidget

from fixbench.ui.context import AppContext
from fixbench.ui.screens import SCREENS

WINDOW_TITLE = "fixbench"
START_SIZE = (1366, 768)


def _load_screen(path: str, context: AppContext) -> QWidget:
    """Build one screen; a screen whose module is not there yet shows a plain placeholder."""
    module_name, class_name = path.split(":")
    try:
        module = importlib.import_module(module_name)
    except ModuleNotFoundError as err:
        if err.name is None or not module_name.startswith(err.name):
            raise  # a module the screen itself needs is missing: that is a real fault
        label = QLabel(f"This screen is not available in this version of fixbench ({module_name}).")
        label.setAlignment(Qt.AlignmentFlag.AlignCenter)
        label.setObjectName("placeholder")
        return label
    return getattr(module, class_name)(context)


class MainWindow(QMainWindow):
    def __init__(self, context: AppContext | None = None) -> None:
        super().__init__()
        self.context: AppContext | None = None
        self.setWindowTitle(WINDOW_TITLE)
        self.tabs = QTabWidget()
        self.tabs.setDocumentMode(True)
        self.screens: dict[str, QWidget] = {}
        self.opening = QLabel("Opening the shop's records\u2026")
        self.opening.setAlignment(Qt.AlignmentFlag.AlignCenter)
        self.setCentralWidget(self.opening)
        for i in range(len(SCREENS)):
            QShortcut(QKeySequence(f"Ctrl+{i + 1}"), self, activated=lambda i=i: self.tabs.setCurrentIndex(i))
        QShortcut(QKeySequence("Ctrl+,"), self, activated=self.open_shop_settings)
        self.resize(*START_SIZE)
        if context is not None:
            self.attach(context)

    def attach(self, context: AppContext) -> None:
        """Build the first screen over an open store (again, when the store is switched); the
        others are built when their tab is first opened or a screen asks for them."""
        self.context = context
        self.tabs = QTabWidget()
        self.tabs.setDocumentMode(True)
        self.screens = _Screens(self)
        for i, (title, path, tip) in enumerate(SCREENS):
            if i == 0:
                page = self.screens.build(title, path)
            else:
                page = QWidget()
                page.setObjectName("not_built_yet")
            self.tabs.addTab(page, title)
            self.tabs.setTabToolTip(i, tip)
        self.tabs.currentChanged.connect(self._tab_opened)
        settings = QPushButton("Shop settings\u2026")
        settings.setToolTip("Report footer and the owner's passphrase (Ctrl+,)")
        settings.clicked.connect(self.open_shop_settings)
        self.tabs.setCornerWidget(settings, Qt.Corner.TopRightCorner)
        self.settings_button = settings
        bench = self.screens.get("Bench")
        if bench is not None and hasattr(bench, "demo_wanted"):
            bench.demo_wanted.connect(self.open_demo_shop)
        self.setCentralWidget(self.tabs)
        self.setWindowTitle(_title(context))
        if bench is not None:
            bench.setFocus()

    def _tab_opened(self, index: int) -> None:
        if 0 <= index < len(SCREENS):
            self.screens.get(SCREENS[index][0])

    def _put_in_tab(self, title: str, screen: QWidget) -> None:
        """Swap a tab's empty page for its built screen, keeping the tab that is open."""
        index = [t for t, _, _ in SCREENS].index(title)
        tabs = self.tabs
        current = tabs.currentIndex()
        tip = tabs.tabToolTip(index)
        blocked = tabs.blockSignals(True)  # the swap is not the user changing tabs
        try:
            old = tabs.widget(index)
            tabs.removeTab(index)
            tabs.insertTab(index, screen, title)
            tabs.setTabToolTip(index, tip)
            tabs.setCurrentIndex(current)
        finally:
            tabs.blockSignals(blocked)
        if old is not None and old is not screen:
            old.deleteLater()

    def show_problem(self, text: str) -> None:
        self.opening.setText(text)
        self.opening.setWordWrap(True)
        self.opening.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)

    def open_shop_settings(self) -> None:
        if self.context is None:
            return
        from fixbench.ui.shop_settings import ShopSettingsDialog

        ShopSettingsDialog(self.context, self).exec()

    def open_demo_shop(self) -> None:
        from fixbench.store.errors import StoreError
        from fixbench.workflows.shop import open_demo_shop

        # A fresh copy in the user data folder: the shipped file stays as built, and every visit to
        # the demo starts from the same history.
        bench = self.screens.get("Bench")
        try:
            store = open_demo_shop()
        except StoreError as err:
            if bench is not None:
                bench.status.setText(f"\u26a0 {err}")
            return
        if store is None:
            if bench is not None:
                bench.status.setText("\u26a0 The demo shop is not installed with this copy of fixbench.")
            return
        old = self.context
        self.attach(AppContext(store, old.knowledge))
        old.store.close()


class _Screens(dict):
    """The window's screens by tab title, each built the first time it is asked for (opening its
    tab, or ``screens["History"]``): the window is usable once the first screen is drawn, without
    waiting for the imports and the first queries of the others."""

    def __init__(self, window: MainWindow) -> None:
        super().__init__()
        self.window = window

    def build(self, title: str, path: str) -> QWidget:
        screen = _load_screen(path, self.window.context)
        super().__setitem__(title, screen)
        return screen

    def __missing__(self, title: str) -> QWidget:
        paths = {t: path for t, path, _ in SCREENS}
        if title not in paths:
            raise KeyError(title)
        screen = self.build(title, paths[title])
        self.window._put_in_tab(title, screen)
        return screen

    def get(self, title: str, default=None):
        try:
            return self[title]
        except KeyError:
            return default


def _title(context: AppContext) -> str:
    path = getattr(context.store, "path", None)
    return f"{WINDOW_TITLE} \u2014 {path.name}" if path is not None else WINDOW_TITLE


def open_context(db: str | None) -> AppContext:
    """Back up the file if due, open and migrate the store, load the knowledge (off the GUI thread)."""
    from fixbench.workflows.shop import open_shop

    context = AppContext(open_shop(db))
    importlib.import_module("fixbench.ui.bench.screen")  # the import work, not the widgets
    return context


def run_app(db: str | None, on_shown: Callable[[MainWindow], None] | None = None,
            on_ready: Callable[[MainWindow], None] | None = None) -> int:
    """Show the window at once, open the shop off the GUI thread, then put the bench in it.
    ``on_shown`` runs after the first paint (the window with its "opening" line), ``on_ready`` once
    the shop is open and the bench drawn: the window can be used (the ui benchmark times both)."""
    app = QApplication.instance() or QApplication(sys.argv[:1])
    app.setApplicationName("fixbench")
    from fixbench.ui.workers import collect_garbage_on_gui_thread

    collect_garbage_on_gui_thread(app)
    window = MainWindow()
    window.show()
    if on_shown is not None:
        QTimer.singleShot(0, lambda: on_shown(window))

    def opened(context: AppContext) -> None:
        window.attach(context)
        if on_ready is not None:
            QTimer.singleShot(0, lambda: on_ready(window))

    def failed(err: Exception) -> None:
        from fixbench.store.errors import StoreError

        if isinstance(err, StoreError):
            window.show_problem(f"The shop's database was not opened.\n\n{err}")
        else:
            window.show_problem(f"fixbench could not start: {type(err).__name__}: {err}")
            raise err

    from fixbench.ui.workers import run_in_background

    # Queued after the first paint, so the heavy imports do not compete with showing the window.
    QTimer.singleShot(0, lambda: run_in_background(lambda: open_context(db), opened, failed))
    return app.exec()
