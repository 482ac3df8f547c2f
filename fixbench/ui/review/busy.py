"""A small strip that says what the screen is doing: a moving bar while work runs, and a message
in words (never a traceback) when something went wrong or a file was written."""

from __future__ import annotations

from PySide6.QtWidgets import QHBoxLayout, QLabel, QProgressBar, QWidget


class BusyStrip(QWidget):
    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self.bar = QProgressBar(maximumWidth=120, textVisible=False)
        self.bar.setRange(0, 0)  # no known end: the bar moves back and forth
        self.bar.setMaximumHeight(12)
        self.bar.hide()
        self.message = QLabel(wordWrap=True)
        self.message.setTextInteractionFlags(self.message.textInteractionFlags()
                                             | self.message.textInteractionFlags().TextSelectableByMouse)
        layout = QHBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(self.bar)
        layout.addWidget(self.message, 1)

    def set_busy(self, busy: bool) -> None:
        self.bar.setVisible(busy)

    def tell(self, text: str) -> None:
        self.message.setStyleSheet("")
        self.message.setText(text)

    def warn(self, text: str) -> None:
        self.message.setStyleSheet("color: #9a2a1c; font-weight: 600;")
        self.message.setText(text)
