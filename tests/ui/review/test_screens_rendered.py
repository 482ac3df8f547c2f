"""The owner's screens rendered to PNG at 1366x768 on the test shop, for a person to look at."""

from __future__ import annotations

from PySide6.QtWidgets import QApplication

from fixbench.ui.main_window import MainWindow

from .helpers import settle


def _shoot(widget, folder, name):
    QApplication.processEvents()
    path = folder / f"{name}.png"
    assert widget.grab().save(str(path))
    assert path.stat().st_size > 10_000  # a drawn screen, not an empty frame
    return path


def test_history_case_story_and_figures_render(qtbot, demo_context, tmp_path):
    window = MainWindow(demo_context)
    qtbot.addWidget(window)
    window.resize(1366, 768)
    window.show()
    history = window.screens["History"]
    window.tabs.setCurrentWidget(history)
    settle(qtbot, lambda: history.model.rows and not history.controller.loading)
    assert history.model.rowCount() > 0
    _shoot(window, tmp_path, "history")
    story = history.open_case(0)
    settle(qtbot, lambda: story.story is not None)
    story.resize(1366, 768)
    assert "Read " in story.timeline.toPlainText()
    _shoot(story, tmp_path, "case-story")
    figures = window.screens["Figures"]
    window.tabs.setCurrentWidget(figures)
    settle(qtbot, lambda: getattr(figures, "snapshot", None) is not None, timeout=20000)
    _shoot(window, tmp_path, "figures")
