"""Every test under tests/ui gets a QApplication, also those that only render documents or charts
(QTextDocument, QPdfWriter and fonts need one even with no window)."""

import pytest


@pytest.fixture(autouse=True)
def _application(qapp):
    return qapp
