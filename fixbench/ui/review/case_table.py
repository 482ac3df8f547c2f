"""The case history as a Qt table model: holds the pages loaded so far, asks for the next one.

Sorting and paging happen in the database (:mod:`fixbench.workflows.review`); this model only
shows the rows it is given and forwards the view's requests (a header click, scrolling near the
end) as signals that the history controller answers off the GUI thread.
"""

from __future__ import annotations

from PySide6.QtCore import QAbstractTableModel, QModelIndex, QPersistentModelIndex, Qt, Signal

from fixbench.workflows.review import CaseRow
from fixbench.workflows.trade_names import TradeNames, family_name, outcome_name

TICKET, OPENED, TECHNICIAN, FAMILY, DEVICE, FAULT, OUTCOME, MINUTES, CLOSED = range(9)
HEADERS = ("Ticket", "Opened", "Technician", "Supply family", "Device", "Confirmed fault",
           "Outcome", "Bench min", "Closed")
SORT_KEY = {TICKET: "ticket", OPENED: "opened", TECHNICIAN: "technician", FAMILY: "family",
            DEVICE: "device", FAULT: "fault", OUTCOME: "outcome", MINUTES: "minutes",
            CLOSED: "closed"}
ROW_ROLE = Qt.ItemDataRole.UserRole + 1  # the CaseRow behind a table row

_Index = QModelIndex | QPersistentModelIndex


class CaseTableModel(QAbstractTableModel):
    sort_requested = Signal(str, bool)  # sort key, descending
    more_requested = Signal()

    def __init__(self, names: TradeNames, parent=None) -> None:
        super().__init__(parent)
        self.names = names
        self.rows: list[CaseRow] = []
        self.total = 0
        self.loading = False

    # Filling, called by the controller on the GUI thread.
    def show_first_page(self, rows: list[CaseRow], total: int) -> None:
        self.beginResetModel()
        self.rows, self.total, self.loading = list(rows), total, False
        self.endResetModel()

    def append_page(self, rows: list[CaseRow]) -> None:
        self.loading = False
        if not rows:
            self.total = len(self.rows)  # the record shrank while scrolling
            return
        first = len(self.rows)
        self.beginInsertRows(QModelIndex(), first, first + len(rows) - 1)
        self.rows.extend(rows)
        self.endInsertRows()

    # The view's side.
    def rowCount(self, parent: _Index = QModelIndex()) -> int:
        return 0 if parent.isValid() else len(self.rows)

    def columnCount(self, parent: _Index = QModelIndex()) -> int:
        return 0 if parent.isValid() else len(HEADERS)

    def headerData(self, section: int, orientation: Qt.Orientation,
                   role: int = Qt.ItemDataRole.DisplayRole):
        if orientation == Qt.Orientation.Horizontal and role == Qt.ItemDataRole.DisplayRole:
            return HEADERS[section]
        return None

    def data(self, index: _Index, role: int = Qt.ItemDataRole.DisplayRole):
        if not index.isValid():
            return None
        row = self.rows[index.row()]
        if role == ROW_ROLE:
            return row
        if role == Qt.ItemDataRole.DisplayRole:
            return self._text(row, index.column())
        if role == Qt.ItemDataRole.ToolTipRole and index.column() == FAULT and row.fault:
            return self.names.fault(row.fault, row.family)
        if role == Qt.ItemDataRole.TextAlignmentRole and index.column() == MINUTES:
            return int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        return None

    def _text(self, row: CaseRow, column: int) -> str:
        if column == TICKET:
            return row.ticket
        if column == OPENED:
            return f"{row.opened:%Y-%m-%d %H:%M}"
        if column == TECHNICIAN:
            return row.technician
        if column == FAMILY:
            return family_name(row.family)
        if column == DEVICE:
            return f"{row.make} {row.model}"
        if column == FAULT:
            return self.names.fault_label(row.fault, row.family) if row.fault else ""
        if column == OUTCOME:
            return outcome_name(row.outcome, row.status)
        if column == MINUTES:
            return "" if row.minutes is None else str(row.minutes)
        return "" if row.closed is None else f"{row.closed:%Y-%m-%d}"

    def sort(self, column: int, order: Qt.SortOrder = Qt.SortOrder.AscendingOrder) -> None:
        self.sort_requested.emit(SORT_KEY[column], order == Qt.SortOrder.DescendingOrder)

    def canFetchMore(self, parent: _Index = QModelIndex()) -> bool:
        return not parent.isValid() and not self.loading and len(self.rows) < self.total

    def fetchMore(self, parent: _Index = QModelIndex()) -> None:
        if self.canFetchMore(parent):
            self.loading = True
            self.more_requested.emit()

    def case_at(self, row: int) -> CaseRow:
        return self.rows[row]
