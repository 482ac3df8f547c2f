"""The round as the trainee plays it: the unit and the customer's complaint, the check catalogue
with its search field, the step card, the running clock, the readings so far, the colleague's
shout when a slip stops the round, the optional coach (its cost said), and the diagnosis."""

from __future__ import annotations

from html import escape

from PySide6.QtCore import QAbstractTableModel, QModelIndex, Qt, Signal
from PySide6.QtWidgets import (QCheckBox, QHeaderView, QHBoxLayout, QLabel, QLineEdit, QListWidget,
                               QListWidgetItem, QSplitter, QTableView, QVBoxLayout, QWidget)

from fixbench.practice.explain import complaint_words
from fixbench.practice.round import PracticeRound, Step, Stop
from fixbench.practice.scoring import COACH_FIRST_POINTS, COACH_MAX_POINTS
from fixbench.ui.bench.look import heading
from fixbench.ui.practice.diagnosis_box import DiagnosisBox
from fixbench.ui.practice.slip_alert import SlipAlert
from fixbench.ui.practice.step_view import PracticeStep
from fixbench.workflows import step_wording as wording

STEP_COLUMNS = ("#", "Check", "Reading", "Min", "Clock")
COACH_COST = (f"Asking costs {COACH_FIRST_POINTS:g} points, up to {COACH_MAX_POINTS:g} if kept on, "
              "and the top band is earned without it.")
LEVEL_WORDS = {"easy": "Easy", "normal": "Normal", "hard": "Hard"}


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
        self.complaint = QLabel()
        self.complaint.setWordWrap(True)
        self.clock_label = heading("Clock: 0 min", factor=1.5)
        self.search = QLineEdit()
        self.search.setPlaceholderText("search checks: fuse, lamp, diode, Vcc, ripple\u2026")
        self.search.setClearButtonEnabled(True)
        self.catalogue = QListWidget()
        self.catalogue.setWordWrap(True)
        self.catalogue.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        self.step = PracticeStep()
        self.alert = SlipAlert()
        self.steps_model = StepsModel(self)
        self.readings = QTableView()
        self.readings.setModel(self.steps_model)
        self.readings.verticalHeader().setVisible(False)
        self.readings.setSelectionBehavior(QTableView.SelectionBehavior.SelectRows)
        header = self.readings.horizontalHeader()
        header.setSectionResizeMode(1, QHeaderView.ResizeMode.Stretch)
        for column in (0, 2, 3, 4):
            header.setSectionResizeMode(column, QHeaderView.ResizeMode.ResizeToContents)
        self.coach_box = QCheckBox("Coach: show the ranked suspects")
        self.coach_list = QListWidget()
        self.coach_list.setVisible(False)
        self.coach_list.setMaximumHeight(130)
        self.diagnosis = DiagnosisBox()
        self.commit_button, self.message = self.diagnosis.commit_button, self.diagnosis.message
        self.fault, self.parts = self.diagnosis.fault, self.diagnosis.parts

        left = QWidget()
        left_layout = QVBoxLayout(left)
        left_layout.addWidget(QLabel("<b>Checks</b> (the bench's catalogue)"))
        left_layout.addWidget(self.search)
        left_layout.addWidget(self.catalogue)
        middle = QWidget()
        middle_layout = QVBoxLayout(middle)
        middle_layout.addWidget(self.alert.frame)
        middle_layout.addWidget(self.step, 3)
        middle_layout.addWidget(QLabel("<b>Readings so far</b>"))
        middle_layout.addWidget(self.readings, 2)
        right = QWidget()
        right_layout = QVBoxLayout(right)
        coach_cost = QLabel(COACH_COST)
        coach_cost.setWordWrap(True)
        coach_cost.setEnabled(False)  # the palette's secondary text
        right_layout.addWidget(self.coach_box)
        right_layout.addWidget(coach_cost)
        right_layout.addWidget(self.coach_list)
        right_layout.addWidget(self.diagnosis, 2)
        split = QSplitter()
        for w in (left, middle, right):
            split.addWidget(w)
        split.setSizes([360, 580, 400])
        top = QHBoxLayout()
        top.addWidget(self.unit_label, 1)
        top.addWidget(self.clock_label)
        layout = QVBoxLayout(self)
        layout.addLayout(top)
        layout.addWidget(self.complaint)
        layout.addWidget(split, 1)

        self.search.textChanged.connect(self._filter)
        self.catalogue.currentItemChanged.connect(self._chosen)
        self.catalogue.itemActivated.connect(lambda item: self.take_asked.emit(item.data(Qt.ItemDataRole.UserRole)))
        self.step.take_asked.connect(self.take_asked)
        self.coach_box.toggled.connect(self.coach_toggled)
        self.coach_box.toggled.connect(self.coach_list.setVisible)
        self.diagnosis.commit_asked.connect(self.commit_asked)
        self.alert.carry_on.clicked.connect(self.carry_on)
        self.round: PracticeRound | None = None

    @property
    def stopped(self) -> bool:
        """A slip has stopped the round and the trainee has not yet carried on."""
        return self.alert.frame.isVisible()

    def show_round(self, practice: PracticeRound, choices, chosen_why: str | None = None) -> None:
        self.round = practice
        level = LEVEL_WORDS.get(practice.scenario.level_id, practice.scenario.level_id)
        self.unit_label.setText(f"{practice.scenario.describe()}  \u00b7  level: {level}")
        chosen = f"<br><i>Chosen for you: {escape(chosen_why)}.</i>" if chosen_why else ""
        said = complaint_words(practice.family, tuple((c, a.text) for c, a in practice.complaint))
        self.complaint.setText(f"<b>The customer says:</b> {escape(said)}{chosen}")
        self.catalogue.blockSignals(True)  # the old family's checks must not reach the new round
        self.catalogue.clear()
        for check in practice.family.checks:
            item = QListWidgetItem(f"{check.title}  [{wording.POWER_SHORT[check.power]}, {check.minutes:g} min]")
            item.setData(Qt.ItemDataRole.UserRole, check.id)
            self.catalogue.addItem(item)
        self.catalogue.blockSignals(False)
        self.search.clear()
        self.diagnosis.fill(choices, practice.family.parts)
        self.coach_box.setChecked(False)
        self.coach_list.clear()
        self.alert.hide()
        self._set_stopped(False)
        self.steps_model.set_steps([])
        self.clock_label.setText("Clock: 0 min")
        self.catalogue.setCurrentRow(0)
        self._chosen(self.catalogue.currentItem())

    def show_taken(self, practice: PracticeRound, taken: Step | Stop) -> None:
        if isinstance(taken, Stop):
            self.alert.show_slip(taken.slip, taken.counted)
            self._set_stopped(True)
            return
        if taken.slip is not None:
            self.alert.show_slip(taken.slip, True)
            self._set_stopped(True)
        elif taken.fuse_blew:  # the rules were kept and the fuse blew all the same: say so
            self.alert.shout.setText("<b>\u26a0 A pop as mains went on: the fuse has blown.</b>")
            self.alert.why.setText("Unplug it. The readings before said no short was likely; look again at them.")
            self.alert.frame.setVisible(True)
            self._set_stopped(True)
        self.steps_model.set_steps(practice.steps)
        self.readings.scrollToBottom()
        self.clock_label.setText(f"Clock: {practice.clock:g} min")
        self.step.show_reading(practice.state)

    def carry_on(self) -> None:
        self.alert.hide()
        self._set_stopped(False)

    def _set_stopped(self, stopped: bool) -> None:
        for widget in (self.catalogue, self.search, self.diagnosis):
            widget.setEnabled(not stopped)
        self.step.set_enabled(not stopped)

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

    def ticked_parts(self) -> set[str]:
        return self.diagnosis.ticked_parts()

    def tick_parts(self, part_ids) -> None:
        self.diagnosis.tick_parts(part_ids)

    def choose_fault(self, fault_id: str) -> None:
        self.diagnosis.choose_fault(fault_id)

    def choose_check(self, check_id: str) -> None:
        for i in range(self.catalogue.count()):
            if self.catalogue.item(i).data(Qt.ItemDataRole.UserRole) == check_id:
                self.catalogue.setCurrentRow(i)
                return
        raise KeyError(check_id)

    def set_busy(self, busy: bool, text: str = "") -> None:
        self.commit_button.setEnabled(not busy)
        self.step.set_enabled(not busy)
        self.message.setText(text)
