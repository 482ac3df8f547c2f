"""Picking a round: the trainee, a level (with what it changes), and then the next unit chosen where
the trainee is weakest, a new unit of a family, or a closed case of the shop to replay."""

from __future__ import annotations

from PySide6.QtCore import QAbstractTableModel, QModelIndex, Qt, Signal
from PySide6.QtWidgets import (QComboBox, QFormLayout, QGroupBox, QHBoxLayout, QHeaderView, QLabel,
                               QPushButton, QTableView, QVBoxLayout, QWidget)

from fixbench.engine import cautions
from fixbench.ui.bench.look import CAUTION_HUE, banner, heading

CHANGES_ROLE = Qt.ItemDataRole.UserRole + 1
PRACTICE_NOTE = ("Practice units are simulated: nothing here is powered. The slips it records are the "
                 "ones that injure people at a real bench. " + cautions.DEFER)
CASE_COLUMNS = ("Closed", "Family", "Unit", "The customer said")


class ReplayModel(QAbstractTableModel):
    """The closed cases offered, newest first (as the store ordered them), one family or all. The
    backing choice is under Qt.UserRole."""

    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self.all: list = []
        self.rows: list = []

    def set_choices(self, choices: list, family_title: str | None = None) -> None:
        self.beginResetModel()
        self.all = list(choices)
        self.rows = [c for c in self.all if family_title is None or c.family == family_title]
        self.endResetModel()

    def show_family(self, family_title: str | None) -> None:
        self.set_choices(self.all, family_title)

    def rowCount(self, parent=QModelIndex()) -> int:  # noqa: N802 (Qt name)
        return 0 if parent.isValid() else len(self.rows)

    def columnCount(self, parent=QModelIndex()) -> int:  # noqa: N802
        return len(CASE_COLUMNS)

    def headerData(self, section, orientation, role=Qt.ItemDataRole.DisplayRole):  # noqa: N802
        if role == Qt.ItemDataRole.DisplayRole and orientation == Qt.Orientation.Horizontal:
            return CASE_COLUMNS[section]
        return None

    def data(self, index, role=Qt.ItemDataRole.DisplayRole):
        row = self.rows[index.row()]
        if role == Qt.ItemDataRole.UserRole:
            return row
        if role in (Qt.ItemDataRole.DisplayRole, Qt.ItemDataRole.ToolTipRole):
            return (row.closed, row.family, row.unit, row.said)[index.column()]
        return None


class PickView(QWidget):
    next_asked = Signal(str)  # level id
    start_asked = Signal(str, str)  # family id, level id
    replay_asked = Signal(object, str)  # the chosen PastCase, level id
    trainee_changed = Signal(object)  # trainee id or None

    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self.trainee = QComboBox()
        self.level = QComboBox()
        self.level_changes = QLabel()
        self.level_changes.setWordWrap(True)
        self.next_button = QPushButton("Next unit, chosen where I am weakest")
        self.family = QComboBox()
        self.start_button = QPushButton("Start a round on this family")
        self.case_family = QComboBox()
        self.cases_model = ReplayModel(self)
        self.cases = QTableView()
        self.cases.setModel(self.cases_model)
        self.cases.verticalHeader().setVisible(False)
        self.cases.setSelectionBehavior(QTableView.SelectionBehavior.SelectRows)
        self.cases.setSelectionMode(QTableView.SelectionMode.SingleSelection)
        header = self.cases.horizontalHeader()
        for column in (0, 1, 2):
            header.setSectionResizeMode(column, QHeaderView.ResizeMode.ResizeToContents)
        header.setSectionResizeMode(3, QHeaderView.ResizeMode.Stretch)
        self.replay_button = QPushButton("Replay this case")
        note = banner(CAUTION_HUE)
        note_layout = QVBoxLayout(note)
        note_label = QLabel(PRACTICE_NOTE)
        note_label.setWordWrap(True)
        note_layout.addWidget(note_label)

        form = QFormLayout()
        form.addRow("Trainee", self.trainee)
        form.addRow("Level", self.level)
        form.addRow("", self.level_changes)
        who = QGroupBox("Who and how hard")
        who.setLayout(form)
        new_box = QGroupBox("A new unit")
        new_layout = QVBoxLayout(new_box)
        new_layout.addWidget(self.next_button)
        new_layout.addWidget(QLabel("or a unit of one family:"))
        new_layout.addWidget(self.family)
        new_layout.addWidget(self.start_button)
        new_layout.addStretch(1)
        left = QVBoxLayout()
        left.addWidget(who)
        left.addWidget(new_box, 1)
        case_box = QGroupBox("A closed case of the shop (anonymised), at the level chosen")
        case_layout = QVBoxLayout(case_box)
        case_layout.addWidget(self.case_family)
        case_layout.addWidget(self.cases, 1)
        case_layout.addWidget(self.replay_button)
        boxes = QHBoxLayout()
        boxes.addLayout(left, 2)
        boxes.addWidget(case_box, 3)
        layout = QVBoxLayout(self)
        layout.addWidget(heading("Practice: find the hidden fault"))
        layout.addWidget(note)
        layout.addLayout(boxes, 1)

        self.next_button.clicked.connect(lambda: self.next_asked.emit(self.level.currentData()))
        self.start_button.clicked.connect(lambda: self.start_asked.emit(self.family.currentData(),
                                                                        self.level.currentData()))
        self.replay_button.clicked.connect(self._replay)
        self.cases.doubleClicked.connect(lambda _index: self._replay())
        self.level.currentIndexChanged.connect(lambda _i: self.level_changes.setText(
            self.level.currentData(role=CHANGES_ROLE) or ""))
        self.case_family.currentIndexChanged.connect(lambda _i: self._show_cases())
        self.trainee.currentIndexChanged.connect(lambda _i: self.trainee_changed.emit(self.trainee.currentData()))

    def fill(self, trainees, families, levels, choices, current_trainee: int | None) -> None:
        self.trainee.blockSignals(True)
        self.trainee.clear()
        self.trainee.addItem("(nobody: the round is not kept)", None)
        for tid, name in trainees:
            self.trainee.addItem(name, tid)
        index = self.trainee.findData(current_trainee)
        self.trainee.setCurrentIndex(max(index, 0))
        self.trainee.blockSignals(False)
        self.family.clear()
        self.case_family.blockSignals(True)
        self.case_family.clear()
        self.case_family.addItem("Every family", None)
        for family in families:
            self.family.addItem(family.title, family.id)
            self.case_family.addItem(family.title, family.title)
        self.case_family.blockSignals(False)
        self.level.clear()
        for level in levels:
            self.level.addItem(level.title, level.id)
            self.level.setItemData(self.level.count() - 1, "\n".join(level.changes), CHANGES_ROLE)
        self.level.setCurrentIndex(1 if len(levels) > 1 else 0)
        self.cases_model.set_choices(choices)
        self._show_cases()

    def _show_cases(self) -> None:
        self.cases_model.show_family(self.case_family.currentData())
        self.replay_button.setEnabled(self.cases_model.rowCount() > 0)
        if self.cases_model.rowCount():
            self.cases.selectRow(0)

    def chosen_case(self):
        rows = self.cases.selectionModel().selectedRows()
        return self.cases_model.rows[rows[0].row()] if rows else None

    def _replay(self) -> None:
        choice = self.chosen_case()
        if choice is not None:
            self.replay_asked.emit(choice.case, self.level.currentData())
