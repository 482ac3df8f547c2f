"""The cases still open, listed when the bench starts: Enter resumes the highlighted one, Ctrl+N
starts a new one, and a ticket typed or scanned (the code on the intake ticket types it like a
keyboard) opens its case. The model reads one page at a time from SQL (newest first) and fetches
more as the list is scrolled."""

from __future__ import annotations

from PySide6.QtCore import QAbstractTableModel, QModelIndex, Qt, Signal
from PySide6.QtWidgets import (QAbstractItemView, QHBoxLayout, QHeaderView, QLabel, QLineEdit,
                               QPushButton, QTableView, QVBoxLayout, QWidget)

from fixbench.ui.bench.look import bind_keys, heading
from fixbench.workflows.shop import OpenCaseRow, open_case_count, open_case_with_ticket, open_cases

TICKET, UNIT, FAMILY, STATUS, READINGS, TECHNICIAN, OPENED = range(7)
HEADERS = ("Ticket", "Unit", "Family", "Where it is", "Readings", "Technician", "Opened")
ROW_ROLE = Qt.ItemDataRole.UserRole  # the OpenCaseRow behind a row
PAGE = 100
STATUS_WORDS = {"intake": "just opened", "diagnosing": "checks", "repairing": "repair",
                "verifying": "verification"}


class OpenCasesModel(QAbstractTableModel):
    def __init__(self, store, family_titles: dict[str, str], parent=None) -> None:
        super().__init__(parent)
        self.store = store
        self.family_titles = family_titles
        self._rows: list[OpenCaseRow] = []
        self._total = 0

    def refresh(self) -> None:
        self.beginResetModel()
        self._total = open_case_count(self.store)
        self._rows = open_cases(self.store, 0, PAGE)
        self.endResetModel()

    def canFetchMore(self, parent=QModelIndex()) -> bool:  # noqa: N802 (Qt name)
        return not parent.isValid() and len(self._rows) < self._total

    def fetchMore(self, parent=QModelIndex()) -> None:  # noqa: N802
        more = open_cases(self.store, len(self._rows), PAGE)
        if more:
            self.beginInsertRows(QModelIndex(), len(self._rows), len(self._rows) + len(more) - 1)
            self._rows.extend(more)
            self.endInsertRows()

    def rowCount(self, parent=QModelIndex()) -> int:  # noqa: N802
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
        row = self._rows[index.row()]
        if role == ROW_ROLE:
            return row
        if role != Qt.ItemDataRole.DisplayRole:
            return None
        return (row.ticket, f"{row.make} {row.model}", self.family_titles.get(row.family_id, row.family_id),
                STATUS_WORDS.get(row.status, row.status), row.readings, row.technician,
                row.opened_at.strftime("%Y-%m-%d %H:%M"))[index.column()]

    @property
    def total(self) -> int:
        return self._total


class CaseTable(QTableView):
    resume_wanted = Signal(int)

    def keyPressEvent(self, event) -> None:  # noqa: N802 (Qt name)
        if event.key() in (Qt.Key.Key_Return, Qt.Key.Key_Enter) and self.currentIndex().isValid():
            self.resume_wanted.emit(self.model().data(self.currentIndex(), ROW_ROLE).id)
            return
        super().keyPressEvent(event)


class OpenCasesPanel(QWidget):
    def __init__(self, controller, parent=None) -> None:
        super().__init__(parent)
        self.controller = controller
        titles = {f.id: f.title for f in controller.context.knowledge.families.values()}
        self.model = OpenCasesModel(controller.context.store, titles, self)
        self.table = CaseTable()
        self.table.setModel(self.model)
        self.table.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.table.setSelectionMode(QAbstractItemView.SelectionMode.SingleSelection)
        self.table.setEditTriggers(QAbstractItemView.EditTrigger.NoEditTriggers)
        self.table.verticalHeader().setVisible(False)
        self.table.horizontalHeader().setSectionResizeMode(UNIT, QHeaderView.ResizeMode.Stretch)
        self.table.horizontalHeader().setSectionResizeMode(FAMILY, QHeaderView.ResizeMode.Stretch)
        self.table.setToolTip("Enter or double-click resumes the case where it was left")
        self.table.resume_wanted.connect(controller.resume)
        self.table.doubleClicked.connect(lambda index: controller.resume(self.model.data(index, ROW_ROLE).id))
        self.count = QLabel()
        self.new_button = QPushButton("New case (Ctrl+N)")
        self.new_button.setToolTip("Start the intake of a unit")
        self.new_button.clicked.connect(controller.new_case)
        bind_keys(self.new_button, "Ctrl+N")
        self.scan = QLineEdit(placeholderText="scan or type a ticket, then Enter")
        self.scan.setAccessibleName("Ticket to open")
        self.scan.setMaximumWidth(280)
        self.scan.returnPressed.connect(self.open_scanned)
        top = QHBoxLayout()
        top.addWidget(heading("Open cases", factor=1.35))
        top.addStretch(1)
        top.addWidget(self.scan)
        top.addWidget(self.new_button)
        self.empty_offer = QWidget()  # filled by the screen when the shop has no records yet
        self.empty_offer.setVisible(False)
        layout = QVBoxLayout(self)
        layout.addLayout(top)
        layout.addWidget(self.empty_offer)
        layout.addWidget(self.table, 1)
        layout.addWidget(self.count)
        self.setFocusProxy(self.table)

    def open_scanned(self) -> None:
        """Resume the open case whose ticket was scanned or typed."""
        ticket = self.scan.text().strip()
        if not ticket:
            return
        case_id = open_case_with_ticket(self.controller.context.store, ticket)
        if case_id is None:
            self.count.setText(f"\u26a0 No open case has ticket {ticket}: it may be closed "
                               "(see History) or typed differently.")
            self.scan.selectAll()
            return
        self.scan.clear()
        self.controller.resume(case_id)

    def refresh(self) -> None:
        self.model.refresh()
        total = self.model.total
        self.count.setText(f"{total} open case{'s' if total != 1 else ''}. Enter resumes the highlighted "
                           "case; every step was kept as it was taken." if total else
                           "No open cases. Ctrl+N starts a new one.")
        if total:
            self.table.selectRow(0)
            self.table.setCurrentIndex(self.model.index(0, 0))
        self.table.resizeColumnToContents(TICKET)
