"""Progress: the current trainee's rounds (each with its date and fault, and its debrief to open
again), and, for the owner, every trainee summed up with the faults they miss and the slips they
make.

Both tables are fed by the store's queries (ordered and limited in SQL). The owner's table opens
with the owner's passphrase, checked off the GUI thread (the check is slow by design).
"""

from __future__ import annotations

from PySide6.QtCore import QAbstractTableModel, QModelIndex, Qt, Signal
from PySide6.QtWidgets import (QHBoxLayout, QHeaderView, QLabel, QLineEdit, QPushButton, QTableView,
                               QVBoxLayout, QWidget)

from fixbench.practice.progress import AttemptRecord, Progress
from fixbench.ui.bench.look import heading
from fixbench.workflows.practice import TraineeOverview
from fixbench.workflows.trade_names import TradeNames, family_name

LEVEL_WORDS = {"easy": "Easy", "normal": "Normal", "hard": "Hard"}


class _RowsModel(QAbstractTableModel):
    columns: tuple[str, ...] = ()

    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self.rows: list = []

    def set_rows(self, rows: list) -> None:
        self.beginResetModel()
        self.rows = list(rows)
        self.endResetModel()

    def rowCount(self, parent=QModelIndex()) -> int:  # noqa: N802 (Qt name)
        return 0 if parent.isValid() else len(self.rows)

    def columnCount(self, parent=QModelIndex()) -> int:  # noqa: N802
        return len(self.columns)

    def headerData(self, section, orientation, role=Qt.ItemDataRole.DisplayRole):  # noqa: N802
        if role == Qt.ItemDataRole.DisplayRole and orientation == Qt.Orientation.Horizontal:
            return self.columns[section]
        return None

    def data(self, index, role=Qt.ItemDataRole.DisplayRole):
        row = self.rows[index.row()]
        if role == Qt.ItemDataRole.UserRole:
            return row
        if role == Qt.ItemDataRole.DisplayRole:
            return self.cells(row)[index.column()]
        return None


class AttemptsModel(_RowsModel):
    columns = ("Date", "Level", "Family", "Fault", "Verdict", "Minutes", "Score", "Band", "Slips", "Coach")

    def __init__(self, names: TradeNames, parent=None) -> None:
        super().__init__(parent)
        self.names = names

    def cells(self, a: AttemptRecord) -> tuple[str, ...]:
        verdict = "" if a.fault_right is None else "right" if a.fault_right else "wrong"
        return (a.played_on, LEVEL_WORDS.get(a.level, a.level), family_name(a.family),
                self.names.fault(a.fault, a.family), verdict, f"{a.minutes:g}", f"{a.score:g}", a.band,
                str(a.safety_slips) if a.safety_slips else "", "yes" if a.coach_used else "")


class TraineesModel(_RowsModel):
    columns = ("Trainee", "Rounds", "Mean score", "Rounds with a slip", "Last round", "Faults missed",
               "Slips by kind")

    def cells(self, t: TraineeOverview) -> tuple[str, ...]:
        s = t.summary
        return (s.name, str(s.rounds), "-" if s.mean_score is None else f"{s.mean_score:.0f}",
                str(s.rounds_with_slips), s.last_attempt.strftime("%Y-%m-%d") if s.last_attempt else "-",
                "; ".join(t.weak_faults) or "-", "; ".join(t.slips) or "-")


def progress_words(progress: Progress | None) -> str:
    if progress is None:
        return "Choose a trainee to see their progress."
    if not progress.rounds:
        return "No rounds yet."
    trend = ""
    if progress.earlier_mean is not None:
        trend = (f"; the last {min(progress.rounds, 5)} average {progress.recent_mean:.0f} "
                 f"against {progress.earlier_mean:.0f} before")
    return (f"{progress.rounds} round{'s' if progress.rounds != 1 else ''}, mean score {progress.mean_score:.0f}{trend}. "
            f"Bench-ready: {progress.ready_rounds}; with a safety slip: {progress.rounds_with_slips}; "
            f"with the coach: {progress.coached_rounds}.")


class ProgressView(QWidget):
    reopen_asked = Signal(int)  # attempt id

    def __init__(self, names: TradeNames, parent=None) -> None:
        super().__init__(parent)
        self.summary = QLabel()
        self.summary.setWordWrap(True)
        self.attempts_model = AttemptsModel(names, self)
        self.attempts = QTableView()
        self.attempts.setModel(self.attempts_model)
        self.trainees_model = TraineesModel(self)
        self.trainees = QTableView()
        self.trainees.setModel(self.trainees_model)
        for table in (self.attempts, self.trainees):
            table.verticalHeader().setVisible(False)
            table.setSelectionBehavior(QTableView.SelectionBehavior.SelectRows)
            table.setSelectionMode(QTableView.SelectionMode.SingleSelection)
            table.setWordWrap(True)
            header = table.horizontalHeader()
            header.setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        self.attempts.horizontalHeader().setSectionResizeMode(3, QHeaderView.ResizeMode.Stretch)
        self.trainees.horizontalHeader().setSectionResizeMode(5, QHeaderView.ResizeMode.Stretch)
        self.reopen_button = QPushButton("Open this round's debrief")
        self.reopen_message = QLabel()
        self.reopen_message.setWordWrap(True)
        self.passphrase = QLineEdit()
        self.passphrase.setEchoMode(QLineEdit.EchoMode.Password)
        self.passphrase.setPlaceholderText("owner's passphrase")
        self.unlock_button = QPushButton("Show every trainee")
        self.owner_message = QLabel()
        self.trainees.setVisible(False)
        unlock = QHBoxLayout()
        unlock.addWidget(self.passphrase, 1)
        unlock.addWidget(self.unlock_button)
        layout = QVBoxLayout(self)
        layout.addWidget(heading("My progress", factor=1.15))
        layout.addWidget(self.summary)
        layout.addWidget(self.attempts, 3)
        reopen = QHBoxLayout()
        reopen.addWidget(self.reopen_message, 1)
        reopen.addWidget(self.reopen_button)
        layout.addLayout(reopen)
        layout.addWidget(heading("Every trainee (owner)", factor=1.15))
        layout.addLayout(unlock)
        layout.addWidget(self.owner_message)
        layout.addWidget(self.trainees, 2)

        self.reopen_button.clicked.connect(self._reopen)
        self.attempts.doubleClicked.connect(lambda _index: self._reopen())

    def show_progress(self, progress: Progress | None, attempts: list[AttemptRecord]) -> None:
        self.summary.setText(progress_words(progress))
        self.attempts_model.set_rows(list(reversed(attempts)))  # newest first
        self.reopen_message.clear()

    def chosen_attempt(self) -> AttemptRecord | None:
        rows = self.attempts.selectionModel().selectedRows()
        return self.attempts_model.rows[rows[0].row()] if rows else None

    def _reopen(self) -> None:
        attempt = self.chosen_attempt()
        if attempt is None:
            self.reopen_message.setText("Choose a round in the table first.")
        elif not attempt.can_reopen or attempt.attempt_id is None:
            self.reopen_message.setText("That round was kept before debriefs were: it cannot be opened again.")
        else:
            self.reopen_message.setText("Playing the round again\u2026")
            self.reopen_asked.emit(attempt.attempt_id)

    def show_trainees(self, summaries: list[TraineeOverview]) -> None:
        self.trainees_model.set_rows(summaries)
        self.trainees.setVisible(True)
        self.owner_message.setText("")
        self.passphrase.clear()

    def refuse_owner(self, message: str) -> None:
        self.trainees.setVisible(False)
        self.owner_message.setText(f"\u26a0 {message}")
