"""Progress: the current trainee's rounds, and, for the owner, every trainee's summed up.

Both tables are fed by the store's queries (ordered and limited in SQL). The owner's table opens
with the owner's passphrase, checked off the GUI thread (the check is slow by design).
"""

from __future__ import annotations

from PySide6.QtCore import QAbstractTableModel, QModelIndex, Qt
from PySide6.QtWidgets import (QHBoxLayout, QHeaderView, QLabel, QLineEdit, QPushButton, QTableView,
                               QVBoxLayout, QWidget)

from fixbench.practice.progress import AttemptRecord, Progress
from fixbench.workflows.practice import TraineeSummary
from fixbench.ui.bench.look import heading


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
    columns = ("Level", "Family", "Checks", "Minutes", "Score", "Band", "Slips", "Coach")

    def __init__(self, family_titles: dict[str, str], parent=None) -> None:
        super().__init__(parent)
        self.family_titles = family_titles

    def cells(self, a: AttemptRecord) -> tuple[str, ...]:
        return (a.level, self.family_titles.get(a.family, a.family), str(a.checks_used), f"{a.minutes:g}", f"{a.score:g}", a.band,
                str(a.safety_slips), "yes" if a.coach_used else "")


class TraineesModel(_RowsModel):
    columns = ("Trainee", "Rounds", "Mean score", "Rounds with a slip", "Last round")

    def cells(self, t: TraineeSummary) -> tuple[str, ...]:
        return (t.name, str(t.rounds), "-" if t.mean_score is None else f"{t.mean_score:.0f}",
                str(t.rounds_with_slips), t.last_attempt.strftime("%Y-%m-%d") if t.last_attempt else "-")


def progress_words(progress: Progress | None) -> str:
    if progress is None:
        return "Choose a trainee to see their progress."
    if not progress.rounds:
        return "No rounds yet."
    trend = ""
    if progress.earlier_mean is not None:
        trend = (f"; the last {min(progress.rounds, 5)} average {progress.recent_mean:.0f} "
                 f"against {progress.earlier_mean:.0f} before")
    return (f"{progress.rounds} rounds, mean score {progress.mean_score:.0f}{trend}. "
            f"Bench-ready: {progress.ready_rounds}; with a safety slip: {progress.rounds_with_slips}; "
            f"with the coach: {progress.coached_rounds}.")


class ProgressView(QWidget):
    def __init__(self, family_titles: dict[str, str], parent=None) -> None:
        super().__init__(parent)
        self.summary = QLabel()
        self.summary.setWordWrap(True)
        self.attempts_model = AttemptsModel(family_titles, self)
        self.attempts = QTableView()
        self.attempts.setModel(self.attempts_model)
        self.trainees_model = TraineesModel(self)
        self.trainees = QTableView()
        self.trainees.setModel(self.trainees_model)
        for table in (self.attempts, self.trainees):
            table.verticalHeader().setVisible(False)
            table.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.Stretch)
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
        layout.addWidget(heading("Every trainee (owner)", factor=1.15))
        layout.addLayout(unlock)
        layout.addWidget(self.owner_message)
        layout.addWidget(self.trainees, 2)

    def show_progress(self, progress: Progress | None, attempts: list[AttemptRecord]) -> None:
        self.summary.setText(progress_words(progress))
        self.attempts_model.set_rows(list(reversed(attempts)))  # newest first

    def show_trainees(self, summaries: list[TraineeSummary]) -> None:
        self.trainees_model.set_rows(summaries)
        self.trainees.setVisible(True)
        self.owner_message.setText("")
        self.passphrase.clear()

    def refuse_owner(self, message: str) -> None:
        self.trainees.setVisible(False)
        self.owner_message.setText(f"\u26a0 {message}")
