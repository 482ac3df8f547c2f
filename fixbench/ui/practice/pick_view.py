"""Picking a round: the trainee, a family and level, or a closed case of the shop to replay."""

from __future__ import annotations

from PySide6.QtCore import Qt, Signal
from PySide6.QtWidgets import (QComboBox, QFormLayout, QGroupBox, QHBoxLayout, QLabel, QListWidget,
                               QPushButton, QVBoxLayout, QWidget)

from fixbench.engine import cautions
from fixbench.ui.bench.look import CAUTION_HUE, banner, heading

SUMMARY_ROLE = Qt.ItemDataRole.UserRole + 1
PRACTICE_NOTE = ("Practice units are simulated: nothing here is powered. The slips it records are the "
                 "ones that injure people at a real bench. " + cautions.DEFER)


class PickView(QWidget):
    start_asked = Signal(str, str)  # family id, level id
    replay_asked = Signal(int, str)  # index of the past case, level id
    trainee_changed = Signal(object)  # trainee id or None

    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self.trainee = QComboBox()
        self.family = QComboBox()
        self.level = QComboBox()
        self.level_summary = QLabel()
        self.level_summary.setWordWrap(True)
        self.start_button = QPushButton("Start a round")
        self.cases = QListWidget()
        self.replay_button = QPushButton("Replay this case")
        note = banner(CAUTION_HUE)
        note_layout = QVBoxLayout(note)
        note_label = QLabel(PRACTICE_NOTE)
        note_label.setWordWrap(True)
        note_layout.addWidget(note_label)

        form = QFormLayout()
        form.addRow("Trainee", self.trainee)
        form.addRow("Supply family", self.family)
        form.addRow("Level", self.level)
        form.addRow("", self.level_summary)
        new_box = QGroupBox("A new unit")
        new_layout = QVBoxLayout(new_box)
        new_layout.addLayout(form)
        new_layout.addWidget(self.start_button)
        new_layout.addStretch(1)
        case_box = QGroupBox("A closed case of the shop (anonymised), at the level chosen")
        case_layout = QVBoxLayout(case_box)
        case_layout.addWidget(self.cases, 1)
        case_layout.addWidget(self.replay_button)
        boxes = QHBoxLayout()
        boxes.addWidget(new_box, 1)
        boxes.addWidget(case_box, 1)
        layout = QVBoxLayout(self)
        layout.addWidget(heading("Practice: find the hidden fault"))
        layout.addWidget(note)
        layout.addLayout(boxes, 1)

        self.start_button.clicked.connect(lambda: self.start_asked.emit(self.family.currentData(),
                                                                        self.level.currentData()))
        self.replay_button.clicked.connect(self._replay)
        self.level.currentIndexChanged.connect(lambda _i: self.level_summary.setText(
            self.level.currentData(role=SUMMARY_ROLE) or ""))
        self.trainee.currentIndexChanged.connect(lambda _i: self.trainee_changed.emit(self.trainee.currentData()))

    def fill(self, trainees, families, levels, cases, current_trainee: int | None) -> None:
        self.trainee.blockSignals(True)
        self.trainee.clear()
        self.trainee.addItem("(nobody: the round is not kept)", None)
        for tid, name in trainees:
            self.trainee.addItem(name, tid)
        index = self.trainee.findData(current_trainee)
        self.trainee.setCurrentIndex(max(index, 0))
        self.trainee.blockSignals(False)
        self.family.clear()
        for family in families:
            self.family.addItem(family.title, family.id)
        self.level.clear()
        for level in levels:
            self.level.addItem(level.title, level.id)
            self.level.setItemData(self.level.count() - 1, level.summary, SUMMARY_ROLE)
        self.level.setCurrentIndex(1 if len(levels) > 1 else 0)
        self.cases.clear()
        titles = {f.id: f.title for f in families}
        for case in cases:
            r = case.ratings
            self.cases.addItem(f"Closed {case.closed}: {titles.get(case.family_id, case.family_id)}, "
                               f"{r.get('output', '?')} / {r.get('current', '?')}")
        self.replay_button.setEnabled(bool(cases))
        if cases:
            self.cases.setCurrentRow(0)

    def _replay(self) -> None:
        row = self.cases.currentRow()
        if row >= 0:
            self.replay_asked.emit(row, self.level.currentData())
