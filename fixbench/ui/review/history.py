"""The History screen: every case the shop has kept, filtered and sorted by the database.

Widgets render and forward: the filter panel gives a CaseFilter, the controller runs the count and
the pages off the GUI thread, the table shows them. Enter (or a double click) opens a case's story;
when the owner amends or deletes a case there, or removes a customer's details, the list and its
count are read again. Every column fits the window at its own size (1366 x 768).
"""

from __future__ import annotations

from PySide6.QtCore import Qt, Slot
from PySide6.QtGui import QKeySequence, QShortcut
from PySide6.QtWidgets import (QAbstractItemView, QGroupBox, QHBoxLayout, QHeaderView, QLabel,
                               QPushButton, QTableView, QTabWidget, QVBoxLayout, QWidget)

from fixbench.workflows.review import CaseFilter, FilterChoices, filter_choices
from fixbench.ui.context import AppContext
from fixbench.ui.review.busy import BusyStrip
from fixbench.ui.review.case_story import CaseStoryWindow
from fixbench.ui.review.case_table import FAULT, OPENED, ROW_ROLE, WIDEST_TEXT, CaseTableModel
from fixbench.ui.review.filters_panel import FiltersPanel
from fixbench.ui.review.history_controller import HistoryController
from fixbench.workflows.trade_names import TradeNames
from fixbench.ui.review.report_actions import ReportActions
from fixbench.ui.workers import run_in_background


class HistoryScreen(QWidget):
    def __init__(self, context: AppContext, parent=None) -> None:
        super().__init__(parent)
        self.context = context
        names = TradeNames(context.knowledge)
        self.model = CaseTableModel(names, self)
        self.controller = HistoryController(context, self.model, self)
        self.filters = FiltersPanel(names)
        self.table = QTableView()
        self.table.setModel(self.model)
        self.table.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.table.setSelectionMode(QAbstractItemView.SelectionMode.SingleSelection)
        self.table.setAlternatingRowColors(True)
        self.table.setWordWrap(False)
        self.table.verticalHeader().hide()
        header = self.table.horizontalHeader()
        header.setSectionResizeMode(QHeaderView.ResizeMode.Interactive)
        header.setSectionResizeMode(FAULT, QHeaderView.ResizeMode.Stretch)
        header.setStretchLastSection(False)
        cells, heads = self.table.fontMetrics(), header.fontMetrics()
        for column, widest in enumerate(WIDEST_TEXT):
            if widest is not None:
                title = self.model.headerData(column, Qt.Orientation.Horizontal)
                header.resizeSection(column, max(cells.horizontalAdvance(widest) + 16,
                                                 heads.horizontalAdvance(title) + 20))
        self.table.verticalHeader().setDefaultSectionSize(24)
        self.table.setSortingEnabled(True)
        self.table.sortByColumn(OPENED, Qt.SortOrder.DescendingOrder)
        self.count = QLabel("Counting cases...")
        self.count.setStyleSheet("font-size: 11pt; font-weight: 600;")
        self.busy = BusyStrip()
        self.actions = ReportActions(context, self, self.busy)
        self.open_button = QPushButton("&Open case")
        self.report_button = QPushButton("Job &report (PDF)...")
        self.export_button = QPushButton("E&xport CSV...")
        self.export_button.setToolTip("The cases matching the filter, for a spreadsheet (owner only; "
                                      "customers' names only if asked for)")
        self.stories: list[CaseStoryWindow] = []
        side = QGroupBox("Which cases")
        side_layout = QVBoxLayout(side)
        side_layout.addWidget(self.filters)
        side.setFixedWidth(250)
        top = QHBoxLayout()
        top.addWidget(self.count)
        top.addStretch(1)
        for button in (self.open_button, self.report_button, self.export_button):
            top.addWidget(button)
        right = QVBoxLayout()
        right.addLayout(top)
        right.addWidget(self.busy)
        right.addWidget(self.table, 1)
        layout = QHBoxLayout(self)
        layout.addWidget(side)
        layout.addLayout(right, 1)
        self.filters.changed.connect(self.controller.set_filter)
        self.controller.count_changed.connect(self._show_count)
        self.controller.busy_changed.connect(self.busy.set_busy)
        self.controller.failed.connect(self.busy.warn)
        self.table.activated.connect(lambda index: self.open_case(index.row()))
        self.open_button.clicked.connect(lambda: self.open_case(self._selected_row()))
        self.report_button.clicked.connect(self._report_selected)
        self.export_button.clicked.connect(
            lambda: self.actions.export_csv(self.controller.case_filter, self.controller.sort_key,
                                            self.controller.descending,
                                            with_customers=self.actions.ask_with_customers()))
        QShortcut(QKeySequence("Ctrl+F"), self, activated=self.filters.text.setFocus)
        QShortcut(QKeySequence("Ctrl+L"), self, activated=self.table.setFocus)
        store = context.store
        run_in_background(lambda: filter_choices(store), self._set_choices, self._choices_failed)

    def _set_choices(self, choices: FilterChoices) -> None:
        self.filters.set_choices(choices)

    def _choices_failed(self, err: Exception) -> None:
        self.busy.warn(f"The filter lists could not be read: {err}")

    def _show_count(self, total: int) -> None:
        described = "every case" if not self.controller.case_filter.as_dict() else "match the filter"
        self.count.setText(f"{total:,} {'case' if total == 1 else 'cases'} "
                           f"{'in the record' if described == 'every case' else described}")

    @Slot(dict)
    def apply_filter(self, values: dict) -> None:
        """Show the cases behind a figure (a clicked bar): set the filter and bring this tab up."""
        case_filter = CaseFilter.from_dict(values)
        self.filters.show_filter(case_filter, emit=False)
        self.controller.set_filter(case_filter)
        tabs = self.parentWidget()
        while tabs is not None and not isinstance(tabs, QTabWidget):
            tabs = tabs.parentWidget()
        if tabs is not None:
            tabs.setCurrentWidget(self)

    def _selected_row(self) -> int | None:
        rows = self.table.selectionModel().selectedRows()
        return rows[0].row() if rows else None

    def open_case(self, row: int | None) -> CaseStoryWindow | None:
        if row is None:
            self.busy.tell("Pick a case in the list first.")
            return None
        case = self.model.index(row, 0).data(ROW_ROLE)
        return self.open_case_id(case.id, case.ticket)

    def open_case_id(self, case_id: int, ticket: str = "") -> CaseStoryWindow:
        """The story window of one case (also from a link in another case's story)."""
        story = CaseStoryWindow(self.context, case_id, self)
        story.report_requested.connect(lambda cid: self.actions.job_report(cid, ticket))
        story.finished.connect(lambda _result: self.stories.remove(story))
        story.case_amended.connect(lambda _case_id: self.controller.reload())
        story.case_deleted.connect(lambda _case_id: self._case_deleted(ticket))
        story.customer_jobs_wanted.connect(self.show_customer_jobs)
        story.case_wanted.connect(self.open_case_id)
        self.stories.append(story)
        story.show()
        return story

    def show_customer_jobs(self, customer_id: int, name: str) -> None:
        """List every job of one customer (one click from any of their cases)."""
        self.filters.name_customer(customer_id, name)
        self.apply_filter({"customer_id": customer_id})

    def _case_deleted(self, ticket: str) -> None:
        self.busy.tell(f"Case {ticket} deleted.")
        self.controller.reload()

    def _report_selected(self) -> None:
        row = self._selected_row()
        if row is None:
            self.busy.tell("Pick a case in the list first.")
            return
        case = self.model.index(row, 0).data(ROW_ROLE)
        self.actions.job_report(case.id, case.ticket)
