"""The ranked suspects after the latest reading, as a table model and its view.

The rows come from the engine's state, not from SQL (they are recomputed after every reading and
kept with it by the store); the shading of the chance column follows the palette.
"""

from __future__ import annotations

from PySide6.QtCore import QAbstractTableModel, QModelIndex, Qt
from PySide6.QtGui import QPalette
from PySide6.QtWidgets import QAbstractItemView, QApplication, QHeaderView, QTableView

from fixbench.ui.bench.look import SUSPECT_HUE, blend

CHANCE, FAULT, PART, STAGE = range(4)
HEADERS = ("Chance", "Likely fault", "Part", "Stage")
ROW_ROLE = Qt.ItemDataRole.UserRole  # the engine's Suspect behind a row
SHOWN = 8


class SuspectsModel(QAbstractTableModel):
    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self._rows: tuple = ()
        self._family = None

    def show_state(self, state) -> None:
        self.beginResetModel()
        self._rows = tuple(state.suspects[:SHOWN]) if state is not None else ()
        self._family = state.family if state is not None else None
        self.endResetModel()

    def rowCount(self, parent=QModelIndex()) -> int:  # noqa: N802 (Qt name)
        return 0 if parent.isValid() else len(self._rows)

    def columnCount(self, parent=QModelIndex()) -> int:  # noqa: N802
        return 0 if parent.isValid() else len(HEADERS)

    def headerData(self, section, orientation, role=Qt.ItemDataRole.DisplayRole):  # noqa: N802
        if orientation == Qt.Orientation.Horizontal and role == Qt.ItemDataRole.DisplayRole:
            return HEADERS[section]
        return None

    def data(self, index: QModelIndex, role=Qt.ItemDataRole.DisplayRole):
        if not index.isValid():
            return None
        s = self._rows[index.row()]
        if role == ROW_ROLE:
            return s
        if role == Qt.ItemDataRole.DisplayRole:
            if index.column() == CHANCE:
                return f"{s.probability:.0%}" if s.probability >= 0.01 else "<1%"
            if index.column() == FAULT:
                return s.title
            if index.column() == PART:
                return s.label or "-"
            return self._family.stage(s.stage).title if s.stage else "-"
        if role == Qt.ItemDataRole.ToolTipRole and len(s.group) > 1:
            return "Cannot be told apart by any check from: " + ", ".join(g for g in s.group if g != s.fault)
        if role == Qt.ItemDataRole.BackgroundRole and index.column() == CHANCE:
            base = QApplication.palette().color(QPalette.ColorRole.Base)
            return blend(base, SUSPECT_HUE, 0.15 + 0.75 * s.probability)
        if role == Qt.ItemDataRole.TextAlignmentRole and index.column() == CHANCE:
            return int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        return None

    def top(self):
        return self._rows[0] if self._rows else None


class SuspectsView(QTableView):
    def __init__(self, model: SuspectsModel, parent=None) -> None:
        super().__init__(parent)
        self.setModel(model)
        self.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.setEditTriggers(QAbstractItemView.EditTrigger.NoEditTriggers)
        self.setFocusPolicy(Qt.FocusPolicy.NoFocus)  # the reading field keeps the keyboard
        self.verticalHeader().setVisible(False)
        header = self.horizontalHeader()
        header.setSectionResizeMode(FAULT, QHeaderView.ResizeMode.Stretch)
        for column in (CHANCE, PART):
            header.setSectionResizeMode(column, QHeaderView.ResizeMode.ResizeToContents)
        header.setSectionResizeMode(STAGE, QHeaderView.ResizeMode.Interactive)
        header.resizeSection(STAGE, 170)
        self.setWordWrap(False)
