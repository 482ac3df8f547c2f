"""Any other check of the family, picked off a list filtered as you type.

Type words of the title, a test point or an instrument; Down moves into the list, Enter takes the
highlighted (or first shown) check, Esc closes without choosing.
"""

from __future__ import annotations

from PySide6.QtCore import Qt
from PySide6.QtWidgets import QDialog, QLabel, QLineEdit, QListWidget, QListWidgetItem, QVBoxLayout

from fixbench.workflows import step_wording as wording


class CheckFinder(QDialog):
    def __init__(self, state, parent=None) -> None:
        super().__init__(parent)
        self.setWindowTitle("Take another check")
        self.chosen: str | None = None
        self.filter = QLineEdit()
        self.filter.setPlaceholderText("type to search: fuse, Vcc, diode, ripple\u2026")
        self.list = QListWidget()
        done = {r.check for r in state.readings}
        family = state.family
        for check in family.checks:
            power = wording.POWER_SHORT[check.power]
            mark = "  \u2714 read" if check.id in done else ""
            item = QListWidgetItem(f"{check.title}   [{power}]{mark}")
            item.setData(Qt.ItemDataRole.UserRole, check.id)
            words = " ".join([check.title, check.instrument, check.power, check.how] +
                             [family.test_point(p).title for p in check.points]).lower()
            item.setData(Qt.ItemDataRole.UserRole + 1, words)
            self.list.addItem(item)
        self.count = QLabel()
        layout = QVBoxLayout(self)
        layout.addWidget(self.filter)
        layout.addWidget(self.list)
        layout.addWidget(self.count)
        self.filter.textChanged.connect(self._apply)
        self.filter.returnPressed.connect(self._take)
        self.list.itemActivated.connect(lambda _item: self._take())
        self.resize(620, 480)
        self._apply("")

    def _apply(self, text: str) -> None:
        words = text.lower().split()
        first = None
        shown = 0
        for i in range(self.list.count()):
            item = self.list.item(i)
            hide = not all(w in item.data(Qt.ItemDataRole.UserRole + 1) for w in words)
            item.setHidden(hide)
            if not hide:
                shown += 1
                first = first or item
        self.list.setCurrentItem(first)
        self.count.setText(f"{shown} checks shown  \u00b7  Enter takes the highlighted one, Esc closes")

    def keyPressEvent(self, event) -> None:  # noqa: N802 (Qt name)
        if event.key() in (Qt.Key.Key_Down, Qt.Key.Key_Up) and self.filter.hasFocus():
            self.list.setFocus()
            self.list.keyPressEvent(event)
            return
        super().keyPressEvent(event)

    def _take(self) -> None:
        item = self.list.currentItem()
        if item is None or item.isHidden():
            self.count.setText("No check matches: change the words, or Esc to close")
            return
        self.chosen = item.data(Qt.ItemDataRole.UserRole)
        self.accept()

    def matching(self) -> list[str]:
        """Check ids currently shown (for tests and for the count)."""
        return [self.list.item(i).data(Qt.ItemDataRole.UserRole) for i in range(self.list.count())
                if not self.list.item(i).isHidden()]
