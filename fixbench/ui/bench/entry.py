"""A field a person types into, with its message right beside it instead of a dialog.

The owner of the field gives a ``check`` function: it returns a value or raises ``ValueError``
(ReadingError is one) whose text is shown under the field. Nothing typed is cleared on a refusal.
"""

from __future__ import annotations

from collections.abc import Callable

from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QPalette
from PySide6.QtWidgets import QLabel, QLineEdit, QVBoxLayout, QWidget

from fixbench.ui.bench.look import SUSPECT_HUE, blend, scaled_font


class CheckedField(QWidget):
    """A line edit plus a one-line message under it. ``accepted`` carries the checked value."""

    accepted = Signal(object)
    escaped = Signal()

    def __init__(self, placeholder: str = "", check: Callable[[str], object] | None = None,
                 big: float = 1.0, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.check = check or (lambda text: text)
        self.edit = QLineEdit()
        self.edit.setPlaceholderText(placeholder)
        self.edit.setClearButtonEnabled(True)
        if big != 1.0:
            self.edit.setFont(scaled_font(self.edit, big, bold=True))
        self.message = QLabel()
        self.message.setWordWrap(True)
        self.message.setVisible(False)
        self.message.setForegroundRole(QPalette.ColorRole.WindowText)
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.setSpacing(2)
        layout.addWidget(self.edit)
        layout.addWidget(self.message)
        self.setFocusProxy(self.edit)
        self.edit.returnPressed.connect(self.submit)
        self.edit.textEdited.connect(lambda _text: self.clear_message())

    def text(self) -> str:
        return self.edit.text()

    def set_text(self, text: str) -> None:
        self.edit.setText(text)
        self.clear_message()

    def value(self) -> object:
        """The checked value; on a refusal the message is shown and ValueError is raised again."""
        try:
            return self.check(self.edit.text())
        except ValueError as err:
            self.show_message(str(err))
            raise

    def submit(self) -> None:
        try:
            value = self.value()
        except ValueError:
            return
        self.accepted.emit(value)

    def show_message(self, text: str) -> None:
        self.message.setText(f"\u26a0 {text}")
        palette = self.message.palette()
        text_colour = palette.color(QPalette.ColorRole.WindowText)
        palette.setColor(QPalette.ColorRole.WindowText, blend(text_colour, SUSPECT_HUE, 0.75))
        self.message.setPalette(palette)
        self.message.setVisible(True)

    def clear_message(self) -> None:
        self.message.clear()
        self.message.setVisible(False)

    @property
    def message_text(self) -> str:
        return self.message.text() if self.message.isVisible() else ""

    def keyPressEvent(self, event) -> None:  # noqa: N802 (Qt name)
        if event.key() == Qt.Key.Key_Escape:
            self.escaped.emit()
            return
        super().keyPressEvent(event)
