"""Every test under tests/ui gets a QApplication, also those that only render documents or charts
(QTextDocument, QPdfWriter and fonts need one even with no window), and Python's cyclic garbage
collection runs on the GUI thread only, as in the app (see fixbench.ui.workers)."""

import pytest

from fixbench.ui.workers import collect_garbage_on_gui_thread


@pytest.fixture(autouse=True)
def _application(qapp):
    collect_garbage_on_gui_thread(qapp)
    return qapp
