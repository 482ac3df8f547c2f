"""Small helpers shared by the review screen tests."""

from __future__ import annotations

from PySide6.QtCore import QThreadPool


def settle(qtbot, screen_is_idle, timeout: int = 20_000) -> None:
    """Wait until background work has been delivered and the screen says it is idle."""
    qtbot.waitUntil(lambda: QThreadPool.globalInstance().activeThreadCount() == 0
                    and bool(screen_is_idle()), timeout=timeout)
