"""The round as the trainee plays it: the check catalogue with its search field, the step card, the
running clock, the readings so far, the optional coach, and the diagnosis to commit."""

from __future__ import annotations

from PySide6.QtCore import QAbstractTableModel, QModelIndex, Qt, Signal
from PySide6.QtWidgets import (QCheckBox, QComboBox, QGroupBox, QHBoxLayout, QHeaderView, QLabel,
                               QLineEdit, QListWidget, QListWidgetItem, QPushButton, QSplitter,
                               QTableView, QVBoxLayout, QWidget)

from fixbench.practice.round import PracticeRound, Step
from fixbench.workflows import step_wording as wording
from fixbench.ui.bench.look import heading
from fixbench.ui.practice.step_view import PracticeStep

STEP_COLUMNS = ("#", "Check", "Reading", "Min", "Clock")


class StepsModel(QAbstractTableModel):
    """The readings of the round, first first. The backing Step is under Qt.UserRole."""

    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self.steps: list[Step] = []

    def set_steps(self, steps: list[Step]) -> None:
        self.beginResetModel()
        self.steps = list(steps)
        self.endResetModel()

    def rowCount(self, parent=QModelIndex()) -> int:  # noqa: N802 (Qt name)
        return 0 if parent.isValid() else len(self.steps)

    def columnCount(self, parent=QModelIndex()) -> int:  # noqa: N802
        return len(STEP_COLUMNS)

    def headerData(self, section, orientation, role=Qt.ItemDataRole.DisplayRole):  # noqa: N802
        if role == Qt.ItemDataRole.DisplayRole and orientation == Qt.Orientation.Horizontal:
            return STEP_COLUMNS[section]
        return None

    def data(self, index, role=Qt.ItemDataRole.DisplayRole):
        step = self.steps[index.row()]
        if role == Qt.ItemDataRole.UserRole:
            return step
        if role == Qt.ItemDataRole.DisplayRole:
            return (str(step.number), step.title, step.reading, f"{step.minutes:g}", f"{step.clock:g}")[index.column()]
        return None


class RoundView(QWidget):
    take_asked = Signal(str)
    coach_toggled = Signal(bool)
    commit_asked = Signal(str, object)  # fault id, set of part ids

    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self.unit_label = heading("", factor=1.15)
        self.clock_label = heading("Clock: 0 min", factor=1.5)
        self.search = QLineEdit()
        self.search.setPlaceholderText("search checks: fuse, lamp, diode, Vcc, ripple\u2026")
        self.search.setClearButtonEnabled(True)
        self.catalogue = QListWidget()
        self.step = PracticeStep()
        self.steps_model = StepsModel(self)
        self.readings = QTableView()
        self.readings.setModel(self.steps_model)
        self.readings.verticalHeader().setVisible(False)
        self.readings.horizontalHeader().setSectionResizeMode(1, QHeaderView.ResizeMode.Stretch)
        self.readings.setSelectionBehavior(QTableView.SelectionBehavior.SelectRows)

        self.coach_box = QCheckBox("Coach: show the ranked suspects (its use is recorded)")
        self.coach_list = QListWidget()
        self.coach_list.setVisible(False)
        self.fault = QComboBox()
        self.fault.setMinimumContentsLength(24)
        self.fault.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
        self.parts = QListWidget()
        self.commit_button = QPushButton("Commit diagnosis")
        self.message = QLabel()
        self.message.setWordWrap(True)
        self.event = QLabel()
        self.event.setWordWrap(True)
        self.event.setVisible(False)
        self.catalogue.setWordWrap(True)
        self.catalogue.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        header = self.readings.horizontalHeader()
        for column in (0, 3, 4):
            header.setSectionResizeMode(column, QHeaderView.ResizeMode.ResizeToContents)
        header.setSectionResizeMode(2, QHeaderView.ResizeMode.ResizeToContents)

        left = QWidget()
        left_layout = QVBoxLayout(left)
        left_layout.addWidget(QLabel("<b>Checks</b> (the bench's catalogue)"))
        left_layout.addWidget(self.search)
        left_layout.addWidget(self.catalogue)
        middle = QWidget()
        middle_layout = QVBoxLayout(middle)
        middle_layout.addWidget(self.step, 3)
        middle_layout.addWidget(self.event)
        middle_layout.addWidget(QLabel("<b>Readings so far</b>"))
        middle_layout.addWidget(self.readings, 2)
        right = QWidget()
        right_layout = QVBoxLayout(right)
        right_layout.addWidget(self.coach_box)
        self.coach_list.setMaximumHeight(130)
        right_layout.addWidget(self.coach_list)
        commit = QGroupBox("Your diagnosis")
        commit_layout = QVBoxLayout(commit)
        commit_layout.addWidget(QLabel("Fault"))
        commit_layout.addWidget(self.fault)
        commit_layout.addWidget(QLabel("Parts to replace (tick each)"))
        commit_layout.addWidget(self.parts, 1)
        commit_layout.addWidget(self.commit_button)
        commit_layout.addWidget(self.message)
        right_layout.addWidget(commit, 2)
        split = QSplitter()
        for w in (left, middle, right):
            split.addWidget(w)
        split.setSizes([360, 580, 400])
        top = QHBoxLayout()
        top.addWidget(self.unit_label, 1)
        top.addWidget(self.clock_label)
        layout = QVBoxLayout(self)
        layout.addLayout(top)
        layout.addWidget(split, 1)

        self.search.textChanged.connect(self._filter)
        self.catalogue.currentItemChanged.connect(self._chosen)
        self.catalogue.itemActivated.connect(lambda item: self.take_asked.emit(item.data(Qt.ItemDataRole.UserRole)))
        self.step.take_asked.connect(self.take_asked)
        self.coach_box.toggled.connect(self.coach_toggled)
        self.coach_box.toggled.connect(self.coach_list.setVisible)
        self.commit_button.clicked.connect(self._commit)
        self.fault.currentIndexChanged.connect(self._fault_changed)
        self.round: PracticeRound | None = None
        self._fault_parts: dict[str, str | None] = {}

    def show_round(self, practice: PracticeRound, choices) -> None:
        self.round = practice
        self.unit_label.setText(practice.scenario.describe() + f"  \u00b7  level: {practice.scenario.level_id}")
        self.catalogue.clear()
        for check in practice.family.checks:
            item = QListWidgetItem(f"{check.title}  [{wording.POWER_SHORT[check.power]}, {check.minutes:g} min]")
            item.setData(Qt.ItemDataRole.UserRole, check.id)
            self.catalogue.addItem(item)
        self.search.clear()
        self.fault.blockSignals(True)
        self.fault.clear()
        self._fault_parts = {}
        for choice in choices:
            self.fault.addItem(choice.title, choice.fault_id)
            self._fault_parts[choice.fault_id] = choice.part
        self.fault.blockSignals(False)
        self.parts.clear()
        for part in practice.family.parts:
            item = QListWidgetItem(f"{part.id}  {part.title}")
            item.setData(Qt.ItemDataRole.UserRole, part.id)
            item.setFlags(item.flags() | Qt.ItemFlag.ItemIsUserCheckable)
            item.setCheckState(Qt.CheckState.Unchecked)
            self.parts.addItem(item)
        self.coach_box.setChecked(False)
        self.coach_list.clear()
        self.message.clear()
        self.event.setVisible(False)
        self.commit_button.setEnabled(True)
        self.steps_model.set_steps([])
        self.clock_label.setText("Clock: 0 min")
        self.catalogue.setCurrentRow(0)

    def show_step_taken(self, practice: PracticeRound, step: Step) -> None:
        if step.slip is not None and step.slip.blew_fuse:
            # The one slip the bench makes plain at once: a bang and a dead unit.
            self.event.setText("\u26a0 A pop and a flash as mains went on: the fuse has blown. "
                               "Unplug, and think about what you knew before powering it.")
            self.event.setVisible(True)
        self.steps_model.set_steps(practice.steps)
        self.readings.scrollToBottom()
        self.clock_label.setText(f"Clock: {practice.clock:g} min")
        self.step.show_reading(practice.state)

    def show_coach(self, suspects) -> None:
        self.coach_list.clear()
        for s in suspects:
            self.coach_list.addItem(f"{s.probability:.0%}  {s.part + ': ' if s.part else ''}{s.title}")

    def _filter(self, text: str) -> None:
        shown = {c.id for c in self.round.catalogue(text)} if self.round else set()
        first = None
        for i in range(self.catalogue.count()):
            item = self.catalogue.item(i)
            item.setHidden(item.data(Qt.ItemDataRole.UserRole) not in shown)
            if first is None and not item.isHidden():
                first = item
        if first is not None:
            self.catalogue.setCurrentItem(first)

    def _chosen(self, item, _previous=None) -> None:
        if item is not None and self.round is not None:
            self.step.show_check(self.round.state, item.data(Qt.ItemDataRole.UserRole))

    def _fault_changed(self, _index: int) -> None:
        part = self._fault_parts.get(self.fault.currentData())
        if part is None:
            return
        for i in range(self.parts.count()):
            item = self.parts.item(i)
            if item.data(Qt.ItemDataRole.UserRole) == part:
                item.setCheckState(Qt.CheckState.Checked)

    def ticked_parts(self) -> set[str]:
        return {self.parts.item(i).data(Qt.ItemDataRole.UserRole) for i in range(self.parts.count())
                if self.parts.item(i).checkState() == Qt.CheckState.Checked}

    def tick_parts(self, part_ids) -> None:
        for i in range(self.parts.count()):
            item = self.parts.item(i)
            on = item.data(Qt.ItemDataRole.UserRole) in set(part_ids)
            item.setCheckState(Qt.CheckState.Checked if on else Qt.CheckState.Unchecked)

    def choose_fault(self, fault_id: str) -> None:
        self.fault.setCurrentIndex(self.fault.findData(fault_id))

    def choose_check(self, check_id: str) -> None:
        for i in range(self.catalogue.count()):
            if self.catalogue.item(i).data(Qt.ItemDataRole.UserRole) == check_id:
                self.catalogue.setCurrentRow(i)
                return
        raise KeyError(check_id)

    def _commit(self) -> None:
        self.commit_asked.emit(self.fault.currentData(), self.ticked_parts())

    def set_busy(self, busy: bool, text: str = "") -> None:
        self.commit_button.setEnabled(not busy)
        self.step.set_enabled(not busy)
        self.message.setText(text)
