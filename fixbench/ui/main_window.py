"""The main window: one tab per screen, and the start-up that opens the shop's database."""

from __future__ import annotations

import importlib
import sys

from PySide6.QtGui import QKeySequence, QShortcut
from PySide6.QtWidgets import QApplication, QLabel, QMainWindow, QMessageBox, QTabWidget, QWidget

from fixbench.ui.context import AppContext
from fixbench.ui.screens import SCREENS

WINDOW_TITLE = "fixbench"


def _load_screen(path: str, context: AppContext) -> QWidget:
    module_name, class_name = path.split(":")
    return getattr(importlib.import_module(module_name), class_name)(context)


class MainWindow(QMainWindow):
    def __init__(self, context: AppContext) -> None:
        super().__init__()
        self.context = context
        self.setWindowTitle(WINDOW_TITLE)
        self.tabs = QTabWidget()
        self.tabs.setDocumentMode(True)
        self.screens: dict[str, QWidget] = {}
        for i, (title, path, tip) in enumerate(SCREENS):
            screen = _load_screen(path, context)
            self.screens[title] = screen
            self.tabs.addTab(screen, title)
            self.tabs.setTabToolTip(i, tip)
            QShortcut(QKeySequence(f"Ctrl+{i + 1}"), self, activated=lambda i=i: self.tabs.setCurrentIndex(i))
        self.setCentralWidget(self.tabs)
        self.resize(1280, 760)


def run_app(db: str | None) -> int:
    app = QApplication.instance() or QApplication(sys.argv[:1])
    app.setApplicationName("fixbench")
    from fixbench.store import StoreFileError, open_store

    try:
        store = open_store(db)
    except StoreFileError as err:
        QMessageBox.critical(None, "fixbench: database not opened", str(err))
        return 2
    window = MainWindow(AppContext(store))
    window.show()
    return app.exec()
