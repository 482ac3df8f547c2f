"""Printing and exporting from the review screens: asks where to save (and, for owner-only
actions, the owner's passphrase), then writes the file off the GUI thread and says what happened.

Each action takes an optional path and passphrase so it can be driven without dialogs.
"""

from __future__ import annotations

from datetime import date

from PySide6.QtCore import QObject, Signal
from PySide6.QtWidgets import QFileDialog, QMessageBox, QWidget

from fixbench.store.errors import StoreError
from fixbench.ui.context import AppContext
from fixbench.ui.review.busy import BusyStrip
from fixbench.ui.review.owner_prompt import ask_owner_passphrase
from fixbench.ui.review.reports import shop_footer, write_job_report, write_monthly_summary
from fixbench.ui.workers import run_in_background
from fixbench.workflows.review import CaseFilter, export_cases_csv, require_owner


class ReportActions(QObject):
    finished = Signal(str)  # what was written, in words
    failed = Signal(str)

    def __init__(self, context: AppContext, parent: QWidget, busy: BusyStrip) -> None:
        super().__init__(parent)
        self.context, self.window, self.busy = context, parent, busy
        self.running = 0

    def _path(self, suggested: str, kinds: str) -> str | None:
        chosen, _ = QFileDialog.getSaveFileName(self.window, "Save as", suggested, kinds)
        return chosen or None

    def job_report(self, case_id: int, ticket: str = "", path: str | None = None) -> None:
        path = path or self._path(f"job-report-{ticket or case_id}.pdf", "PDF (*.pdf)")
        if path is None:
            return
        store, kb = self.context.store, self.context.knowledge

        def work():
            report = write_job_report(store, kb, case_id, path, shop_footer(store))
            return f"Job report saved: {report.path} ({report.pages} page)"

        self._run(work, "Writing the job report...")

    def monthly_summary(self, month: date, path: str | None = None,
                        passphrase: str | None = None) -> None:
        passphrase = passphrase if passphrase is not None else ask_owner_passphrase(
            self.window, "The monthly summary")
        if passphrase is None:
            return
        path = path or self._path(f"summary-{month:%Y-%m}.pdf", "PDF (*.pdf)")
        if path is None:
            return
        store, kb = self.context.store, self.context.knowledge

        def work():
            require_owner(store, passphrase)
            pages = write_monthly_summary(store, kb, month, path, shop_footer(store))
            return f"Monthly summary for {month:%B %Y} saved: {path} ({pages} pages)"

        self._run(work, "Writing the monthly summary...")

    def export_csv(self, case_filter: CaseFilter, sort: str = "opened", descending: bool = False,
                   path: str | None = None, passphrase: str | None = None,
                   with_customers: bool = False) -> None:
        """Customers' names and contacts go into the file only when the owner says so."""
        passphrase = passphrase if passphrase is not None else ask_owner_passphrase(
            self.window, "Exporting cases")
        if passphrase is None:
            return
        path = path or self._path("cases.csv", "CSV (*.csv)")
        if path is None:
            return
        store = self.context.store

        def work():
            count = export_cases_csv(store, case_filter, path, passphrase=passphrase, sort=sort,
                                     descending=descending, with_customers=with_customers)
            kept = "with" if with_customers else "without"
            return f"{count} cases exported to {path} ({kept} customers' details)"

        self._run(work, "Exporting...")

    def ask_with_customers(self) -> bool:
        """Whether the owner wants customers' names and contacts in an export (No by default)."""
        answer = QMessageBox.question(
            self.window, "Customers' details",
            "Put customers' names and contacts in the file?\n\nThey are personal data: leave "
            "them out unless the file needs them and stays with you.",
            QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.No,
            QMessageBox.StandardButton.No)
        return answer == QMessageBox.StandardButton.Yes

    def _run(self, work, doing: str) -> None:
        self.running += 1
        self.busy.set_busy(True)
        self.busy.tell(doing)
        run_in_background(work, self._done, self._error)

    def _done(self, message: str) -> None:
        self._settle()
        self.busy.tell(message)
        self.finished.emit(message)

    def _error(self, err: Exception) -> None:
        self._settle()
        known = isinstance(err, (StoreError, OSError))
        message = str(err) if known else f"Something went wrong: {err}"
        self.busy.warn(message[:1].upper() + message[1:])
        self.failed.emit(message)

    def _settle(self) -> None:
        self.running -= 1
        self.busy.set_busy(self.running > 0)
