"""Runs the history's queries off the GUI thread and hands the results to the table model.

Every request carries a generation number; an answer to a filter or sort the owner has since
changed is dropped, so a slow count never overwrites a newer one.
"""

from __future__ import annotations

from PySide6.QtCore import QObject, Signal

from fixbench.ui.context import AppContext
from fixbench.ui.review.case_table import CaseTableModel
from fixbench.ui.workers import run_in_background
from fixbench.workflows.review import CaseFilter, history_first_page, history_page


class HistoryController(QObject):
    busy_changed = Signal(bool)
    count_changed = Signal(int)
    failed = Signal(str)
    filter_changed = Signal(object)  # the CaseFilter now shown

    def __init__(self, context: AppContext, model: CaseTableModel, parent=None) -> None:
        super().__init__(parent)
        self.context, self.model = context, model
        self.case_filter = CaseFilter()
        self.sort_key, self.descending = "opened", True
        self.generation = 0
        self.pending = 0
        model.sort_requested.connect(self.set_sort)
        model.more_requested.connect(self.fetch_more)

    @property
    def loading(self) -> bool:
        return self.pending > 0

    def set_filter(self, case_filter: CaseFilter) -> None:
        self.case_filter = case_filter
        self.filter_changed.emit(case_filter)
        self.reload()

    def set_sort(self, key: str, descending: bool) -> None:
        self.sort_key, self.descending = key, descending
        self.reload()

    def reload(self) -> None:
        self.generation += 1
        generation, store = self.generation, self.context.store
        case_filter, key, descending = self.case_filter, self.sort_key, self.descending

        self._start(lambda: history_first_page(store, case_filter, key, descending),
                    lambda result: self._first_page(generation, result))

    def fetch_more(self) -> None:
        generation, store = self.generation, self.context.store
        case_filter, key, descending = self.case_filter, self.sort_key, self.descending
        offset = len(self.model.rows)
        self._start(lambda: history_page(store, case_filter, key, descending, offset),
                    lambda rows: self._next_page(generation, rows))

    def _start(self, work, deliver) -> None:
        self.pending += 1
        if self.pending == 1:
            self.busy_changed.emit(True)
        run_in_background(work, lambda result: self._finish(deliver, result), self._error)

    def _finish(self, deliver, result) -> None:
        self._settle()
        deliver(result)

    def _error(self, err: Exception) -> None:
        self._settle()
        self.model.loading = False
        self.failed.emit(f"The case list could not be read: {err}")

    def _settle(self) -> None:
        self.pending -= 1
        if self.pending == 0:
            self.busy_changed.emit(False)

    def _first_page(self, generation: int, result) -> None:
        if generation != self.generation:
            return
        total, rows = result
        self.model.show_first_page(rows, total)
        self.count_changed.emit(total)

    def _next_page(self, generation: int, rows) -> None:
        if generation != self.generation:
            self.model.loading = False
            return
        self.model.append_page(rows)
