"""Who is at the bench: picked from the shop's technicians, or added by name on a new shop.
The choice is remembered in the shop settings for the next start."""

from __future__ import annotations

from PySide6.QtWidgets import QComboBox, QHBoxLayout, QLabel, QPushButton, QWidget

from fixbench.store import bench_log, people
from fixbench.ui.bench.entry import CheckedField

LAST_TECHNICIAN = "bench_last_technician"


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
        remembered = bench_log.get_setting(store, LAST_TECHNICIAN)
        self.combo.blockSignals(True)
        self.combo.clear()
        for person in people.technicians(store):
            if person.active:
                self.combo.addItem(f"{person.name}{' (trainee)' if person.role == 'trainee' else ''}", person.id)
        self.combo.blockSignals(False)
        if remembered is not None and self.combo.findData(int(remembered)) >= 0:
            self.combo.setCurrentIndex(self.combo.findData(int(remembered)))
        self.context.technician_id = self.combo.currentData()
        has_people = self.combo.count() > 0
        self.combo.setVisible(has_people)

    def _picked(self) -> None:
        self.context.technician_id = self.combo.currentData()
        if self.context.technician_id is not None and self.combo.signalsBlocked() is False:
            bench_log.set_setting(self.context.store, LAST_TECHNICIAN, str(self.context.technician_id))

    def _add(self, name: str) -> None:
        new_id = people.add_technician(self.context.store, name)
        bench_log.set_setting(self.context.store, LAST_TECHNICIAN, str(new_id))
        self.new_name.set_text("")
        self.reload()
