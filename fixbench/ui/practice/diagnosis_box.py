"""The trainee's diagnosis: the fault, the parts to replace, and the commit button.

The fault list opens on no fault chosen, and choosing or browsing a fault ticks nothing: the parts
are the trainee's own call (ticking the root's part for them taught nothing, and scrolling the
list ticked every part it passed).
"""

from __future__ import annotations

from PySide6.QtCore import Qt, Signal
from PySide6.QtWidgets import QComboBox, QGroupBox, QLabel, QListWidget, QListWidgetItem, QPushButton, QVBoxLayout

CHOOSE = "Choose the fault\u2026"


class DiagnosisBox(QGroupBox):
    commit_asked = Signal(str, object)  # fault id, set of part ids

    def __init__(self, parent=None) -> None:
        super().__init__("Your diagnosis", parent)
        self.fault = QComboBox()
        self.fault.setMinimumContentsLength(24)
        self.fault.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
        self.parts = QListWidget()
        self.commit_button = QPushButton("Commit diagnosis")
        self.message = QLabel()
        self.message.setWordWrap(True)
        layout = QVBoxLayout(self)
        layout.addWidget(QLabel("Fault"))
        layout.addWidget(self.fault)
        layout.addWidget(QLabel("Parts to replace (tick each one you would replace)"))
        layout.addWidget(self.parts, 1)
        layout.addWidget(self.commit_button)
        layout.addWidget(self.message)
        self.commit_button.clicked.connect(self._commit)

    def fill(self, choices, parts) -> None:
        self.fault.clear()
        self.fault.addItem(CHOOSE, None)
        for choice in choices:
            self.fault.addItem(choice.title, choice.fault_id)
        self.fault.setCurrentIndex(0)
        self.parts.clear()
        for part in parts:
            item = QListWidgetItem(f"{part.id}  {part.title}")
            item.setData(Qt.ItemDataRole.UserRole, part.id)
            item.setFlags(item.flags() | Qt.ItemFlag.ItemIsUserCheckable)
            item.setCheckState(Qt.CheckState.Unchecked)
            self.parts.addItem(item)
        self.message.clear()

    def ticked_parts(self) -> set[str]:
        return {self.parts.item(i).data(Qt.ItemDataRole.UserRole) for i in range(self.parts.count())
                if self.parts.item(i).checkState() == Qt.CheckState.Checked}

    def tick_parts(self, part_ids) -> None:
        wanted = set(part_ids)
        for i in range(self.parts.count()):
            item = self.parts.item(i)
            on = item.data(Qt.ItemDataRole.UserRole) in wanted
            item.setCheckState(Qt.CheckState.Checked if on else Qt.CheckState.Unchecked)

    def choose_fault(self, fault_id: str) -> None:
        self.fault.setCurrentIndex(self.fault.findData(fault_id))

    def _commit(self) -> None:
        fault_id = self.fault.currentData()
        if fault_id is None:
            self.message.setText("\u26a0 Choose the fault first.")
            return
        self.commit_asked.emit(fault_id, self.ticked_parts())
