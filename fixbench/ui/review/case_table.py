"""The case history as a Qt table model: holds the pages loaded so far, asks for the next one.

Sorting and paging happen in the database (:mod:`fixbench.workflows.review`); this model only
shows the rows it is given and forwards the view's requests (a header click, scrolling near the
end) as signals that the history controller answers off the GUI thread.
"""

from __future__ import annotations

from PySide6.QtCore import QAbstractTableModel, QModelIndex, QPersistentModelIndex, Qt, Signal

from fixbench.workflows.review import CaseRow
from fixbench.workflows.trade_names import TradeNames, family_name, outcome_name

TICKET, OPENED, CUSTOMER, DEVICE, TECHNICIAN, FAULT, OUTCOME, CAME_BACK, MINUTES, CLOSED = range(10)
HEADERS = ("Ticket", "Opened", "Customer", "Device", "Technician", "Confirmed fault", "Outcome",
           "Came back", "Min", "Closed")
HEADER_TIPS = {MINUTES: "Bench minutes", CAME_BACK: "Came back under warranty (the return's "
                                                    "ticket), or a warranty return of a job"}
# What each column must show whole (its width is this text's, or the header's if wider); the
# confirmed fault takes the room left, so the table fits the History screen at the window's own
# size (1366 x 768) beside the filters.
WIDEST_TEXT = ("W2506-0580", "2025-06-30", "Odile Fenwright", "Halvenor HV-12S",
               "Teodor Malk", None, "Returned unrepaired", "return of W2506-0580", "999",
               "2025-06-30")
SORT_KEY = {TICKET: "ticket", OPENED: "opened", CUSTOMER: "customer", TECHNICIAN: "technician",
            DEVICE: "device", FAULT: "fault", OUTCOME: "outcome", CAME_BACK: "came_back",
            MINUTES: "minutes", CLOSED: "closed"}
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
        if orientation == Qt.Orientation.Horizontal and role == Qt.ItemDataRole.ToolTipRole:
            return HEADER_TIPS.get(section)
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
            return f"{self.names.fault_label(row.fault, row.family)} ({family_name(row.family)})"
        if role == Qt.ItemDataRole.ToolTipRole and index.column() == CAME_BACK:
            return self._came_back_tip(row)
        if role == Qt.ItemDataRole.ToolTipRole and index.column() == CUSTOMER and row.customer:
            return row.customer
        if role == Qt.ItemDataRole.TextAlignmentRole and index.column() == MINUTES:
            return int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        return None

    @staticmethod
    def _came_back_tip(row: CaseRow) -> str | None:
        if row.came_back and row.return_ticket:
            return f"Came back under warranty as job {row.return_ticket}"
        if row.return_of:
            return f"A warranty return of job {row.return_of}"
        return None

    def _text(self, row: CaseRow, column: int) -> str:
        if column == TICKET:
            return row.ticket
        if column == OPENED:
            return f"{row.opened:%Y-%m-%d}"
        if column == CUSTOMER:
            return row.customer or ""
        if column == TECHNICIAN:
            return row.technician
        if column == CAME_BACK:
            if row.came_back:
                return f"yes: {row.return_ticket}" if row.return_ticket else "yes"
            return f"return of {row.return_of}" if row.return_of else ""
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
