"""A small read-only table model over one store :class:`Figure` (an SQL aggregate's rows), with
the figure's columns named for people and rates shown as percentages."""

from __future__ import annotations

from PySide6.QtCore import QAbstractTableModel, QModelIndex, QPersistentModelIndex, Qt

from fixbench.workflows.review import Figure

ROW_ROLE = Qt.ItemDataRole.UserRole + 1  # the figure's row tuple behind a table row
COLUMN_WORDS = {"name": "Technician", "closed": "Closed", "repaired": "Repaired",
                "first_time_fix_rate": "First-time fix", "comeback_rate": "Came back",
                "median_minutes": "Median min", "p25_minutes": "25% within (min)",
                "p75_minutes": "75% within (min)", "cases": "Cases"}

_Index = QModelIndex | QPersistentModelIndex


class FigureTableModel(QAbstractTableModel):
    def __init__(self, parent=None) -> None:
        super().__init__(parent)
        self.figure = Figure("", (), ())

    def show_figure(self, figure: Figure) -> None:
        self.beginResetModel()
        self.figure = figure
        self.endResetModel()

    def rowCount(self, parent: _Index = QModelIndex()) -> int:
        return 0 if parent.isValid() else len(self.figure.rows)

    def columnCount(self, parent: _Index = QModelIndex()) -> int:
        return 0 if parent.isValid() else len(self.figure.columns)

    def headerData(self, section: int, orientation: Qt.Orientation,
                   role: int = Qt.ItemDataRole.DisplayRole):
        if orientation == Qt.Orientation.Horizontal and role == Qt.ItemDataRole.DisplayRole:
            column = self.figure.columns[section]
            return COLUMN_WORDS.get(column, column.replace("_", " ").capitalize())
        return None

    def data(self, index: _Index, role: int = Qt.ItemDataRole.DisplayRole):
        if not index.isValid():
            return None
        row = self.figure.rows[index.row()]
        if role == ROW_ROLE:
            return row
        value, column = row[index.column()], self.figure.columns[index.column()]
        if role == Qt.ItemDataRole.DisplayRole:
            if value is None:
                return "-"
            if column.endswith("_rate"):
                return f"{value:.0%}"
            if isinstance(value, float):
                return f"{value:g}"
            return str(value)
        if role == Qt.ItemDataRole.TextAlignmentRole and index.column() > 0:
            return int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        return None
