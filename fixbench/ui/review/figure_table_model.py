"""A small read-only table model over one store :class:`Figure` (an SQL aggregate's rows), with
the figure's columns named for people, rates shown as percentages and amounts in the shop's
currency; it shows the columns it is told to (a figure may carry keys and sums for others)."""

from __future__ import annotations

from PySide6.QtCore import QAbstractTableModel, QModelIndex, QPersistentModelIndex, Qt

from fixbench.workflows.money import money_text
from fixbench.workflows.review import Figure

ROW_ROLE = Qt.ItemDataRole.UserRole + 1  # the figure's row tuple behind a table row
COLUMN_WORDS = {"name": "Technician", "closed": "Closed", "repaired": "Repaired",
                "first_time_fix_rate": "First-time fix", "comeback_rate": "Came back (%)",
                "median_minutes": "Median min", "p25_minutes": "25% within (min)",
                "p75_minutes": "75% within (min)", "cases": "Cases", "came_back": "Came back (jobs)",
                "returns": "Returns taken in", "return_minutes": "Minutes on returns",
                "jobs": "Jobs", "unpriced": "No price", "revenue_cents": "Charged",
                "parts_cents": "Parts", "labour_cents": "Labour", "margin_cents": "Margin",
                "model": "Model", "technician": "Technician"}

_Index = QModelIndex | QPersistentModelIndex


class FigureTableModel(QAbstractTableModel):
    def __init__(self, parent=None, currency: str = "") -> None:
        super().__init__(parent)
        self.figure = Figure("", (), ())
        self.currency = currency
        self.shown: tuple[int, ...] = ()  # the figure's columns shown, in order

    def show_figure(self, figure: Figure, columns: tuple[str, ...] | None = None) -> None:
        self.beginResetModel()
        self.figure = figure
        wanted = columns or tuple(c for c in figure.columns if c != "key")
        self.shown = tuple(figure.columns.index(c) for c in wanted)
        self.endResetModel()

    def rowCount(self, parent: _Index = QModelIndex()) -> int:
        return 0 if parent.isValid() else len(self.figure.rows)

    def columnCount(self, parent: _Index = QModelIndex()) -> int:
        return 0 if parent.isValid() else len(self.shown)

    def headerData(self, section: int, orientation: Qt.Orientation,
                   role: int = Qt.ItemDataRole.DisplayRole):
        if orientation == Qt.Orientation.Horizontal and role == Qt.ItemDataRole.DisplayRole:
            column = self.figure.columns[self.shown[section]]
            return COLUMN_WORDS.get(column, column.replace("_", " ").capitalize()
                                    if column.islower() else column)
        return None

    def data(self, index: _Index, role: int = Qt.ItemDataRole.DisplayRole):
        if not index.isValid():
            return None
        row = self.figure.rows[index.row()]
        if role == ROW_ROLE:
            return row
        at = self.shown[index.column()]
        value, column = row[at], self.figure.columns[at]
        if role == Qt.ItemDataRole.DisplayRole:
            if value is None:
                return "-"
            if column.endswith("_rate"):
                return f"{value:.0%}"
            if column.endswith("_cents"):
                return money_text(value, self.currency)
            if isinstance(value, float):
                return f"{value:g}"
            return str(value)
        if role == Qt.ItemDataRole.TextAlignmentRole and index.column() > 0:
            return int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        return None
