"""Who is at the bench: picked from the shop's technicians, or added by name on a new shop.
The choice is remembered in the shop settings for the next start."""

from __future__ import annotations

from PySide6.QtWidgets import QComboBox, QHBoxLayout, QLabel, QPushButton, QWidget

from fixbench.ui.bench.entry import CheckedField
from fixbench.workflows.shop import add_person, bench_people, last_at_bench, remember_at_bench


def _name(text: str) -> str:
    text = text.strip()
    if not text:
        raise ValueError("type a name")
    if len(text) > 80:
        raise ValueError("a name of at most 80 characters")
    return text


class TechnicianPicker(QWidget):
    def __init__(self, context, parent=None) -> None:
        super().__init__(parent)
        self.context = context
        self.combo = QComboBox()
        self.combo.setToolTip("Who is at the bench: cases and cautions are kept under this name")
        self.new_name = CheckedField("add a technician by name", _name)
        self.add_button = QPushButton("Add")
        self.add_button.clicked.connect(self.new_name.submit)
        self.new_name.accepted.connect(self._add)
        layout = QHBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(QLabel("At the bench:"))
        layout.addWidget(self.combo)
        layout.addWidget(self.new_name)
        layout.addWidget(self.add_button)
        self.combo.currentIndexChanged.connect(self._picked)
        self.reload()

    def reload(self) -> None:
        store = self.context.store
        remembered = last_at_bench(store)
        self.combo.blockSignals(True)
        self.combo.clear()
        for person_id, label in bench_people(store):
            self.combo.addItem(label, person_id)
        self.combo.blockSignals(False)
        if remembered is not None and self.combo.findData(remembered) >= 0:
            self.combo.setCurrentIndex(self.combo.findData(remembered))
        self.context.technician_id = self.combo.currentData()
        has_people = self.combo.count() > 0
        self.combo.setVisible(has_people)

    def _picked(self) -> None:
        self.context.technician_id = self.combo.currentData()
        if self.context.technician_id is not None and self.combo.signalsBlocked() is False:
            remember_at_bench(self.context.store, self.context.technician_id)

    def _add(self, name: str) -> None:
        add_person(self.context.store, name)
        self.new_name.set_text("")
        self.reload()
