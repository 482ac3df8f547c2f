"""The window for one case: its card, its timeline, a re-run through today's engine, the links to
the customer's other jobs and to the job it came back from (or came back as), and the owner's
amendments, deletion and removal of a customer's details.

Renders a :class:`CaseStory` (built off the GUI thread by :mod:`fixbench.workflows.case_story`) as
a timeline the owner reads top to bottom; readings that differ from a good unit's are marked in
words as well as colour. An amendment reloads the story; a deletion closes the window. Both are
announced by signal so the History list can count again.
"""

from __future__ import annotations

from html import escape

from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QKeySequence
from PySide6.QtWidgets import (QDialog, QDialogButtonBox, QHBoxLayout, QLabel, QPushButton,
                               QTextBrowser, QVBoxLayout, QWidget)

from fixbench.workflows.review import has_owner_passphrase
from fixbench.ui.context import AppContext
from fixbench.ui.review.amend_dialog import AmendDialog, DeleteCaseDialog
from fixbench.ui.review.forget_customer import ForgetCustomerDialog
from fixbench.ui.review.busy import BusyStrip
from fixbench.workflows.trade_names import TradeNames
from fixbench.workflows.case_story import CaseStory, Rerun, load_case_story, rerun_case
from fixbench.ui.workers import run_in_background

KIND_WORDS = {"intake": "Intake", "reading": "Reading", "skipped": "Skipped", "repair": "Repair",
              "verification": "Verification", "closed": "Closed", "came_back": "Came back",
              "amendment": "Amendment"}
KIND_COLOURS = {"intake": "#35506b", "reading": "#2f5d50", "skipped": "#666666", "repair": "#7a4b12",
                "verification": "#3b5a8c", "closed": "#444444", "came_back": "#a0281c",
                "amendment": "#7b2d5b"}


def timeline_html(story: CaseStory) -> str:
    parts = []
    for step in story.steps:
        mark = ""
        if step.in_band is True:
            mark = " <span style='color:#2b6b2b'>[as a good unit reads]</span>"
        elif step.in_band is False:
            mark = " <span style='color:#a0281c'><b>[NOT as a good unit reads]</b></span>"
        colour = KIND_COLOURS.get(step.kind, "#333")
        details = "".join(f"<div style='margin-left:18px'>{escape(line)}</div>"
                          for line in step.details)
        parts.append(f"<p style='margin:6px 0'><span style='color:#666'>{step.at:%Y-%m-%d %H:%M}"
                     f"</span> &nbsp;<b style='color:{colour}'>{KIND_WORDS.get(step.kind, step.kind)}"
                     f"</b> &nbsp;{escape(step.headline)}{mark}{details}</p>")
    return "".join(parts)


def facts_html(story: CaseStory, per_row: int = 3) -> str:
    shown = [(label, value) for label, value in story.facts if value]
    cells = [f"<td style='color:#555; padding-right:6px'>{escape(label)}</td>"
             f"<td style='padding-right:28px'><b>{escape(value)}</b></td>" for label, value in shown]
    rows = ["".join(cells[i:i + per_row]) for i in range(0, len(cells), per_row)]
    return "<table>" + "".join(f"<tr>{row}</tr>" for row in rows) + "</table>"


NO_OWNER = "No owner's passphrase is set for this shop, so the record cannot be changed here."


class CaseStoryWindow(QDialog):
    report_requested = Signal(int)  # case id: print the customer's job report
    case_amended = Signal(int)  # case id
    case_deleted = Signal(int)  # case id; the window closes
    customer_jobs_wanted = Signal(int, str)  # customer id, name: list their jobs
    case_wanted = Signal(int, str)  # case id, ticket: open that job's story

    def __init__(self, context: AppContext, case_id: int, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.context, self.case_id = context, case_id
        self.story: CaseStory | None = None
        self.rerun: Rerun | None = None
        self.owner_set = False
        self.amend_dialog: AmendDialog | None = None
        self.delete_dialog: DeleteCaseDialog | None = None
        self.setWindowTitle("Case")
        self.resize(980, 680)
        self.heading = QLabel("Reading the case...")
        self.heading.setStyleSheet("font-size: 15pt; font-weight: 600;")
        self.facts = QLabel(wordWrap=True)
        self.facts.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self.timeline = QTextBrowser()
        self.timeline.setOpenLinks(False)
        self.rerun_text = QLabel(wordWrap=True)
        self.busy = BusyStrip()
        self.rerun_button = QPushButton("&Re-run with today's engine")
        self.rerun_button.setShortcut(QKeySequence("Ctrl+R"))
        self.report_button = QPushButton("Customer job re&port (PDF)...")
        self.amend_button = QPushButton("&Amend...")
        self.delete_button = QPushButton("&Delete case...")
        self.forget_button = QPushButton("Remove customer's details...")
        self.forget_dialog: ForgetCustomerDialog | None = None
        self.customer_button = QPushButton("Customer's &jobs")
        self.customer_button.setToolTip("Every job of this customer, on the History tab")
        self.linked_buttons = QHBoxLayout()
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Close)
        buttons.addButton(self.rerun_button, QDialogButtonBox.ButtonRole.ActionRole)
        buttons.addButton(self.report_button, QDialogButtonBox.ButtonRole.ActionRole)
        # The owner's changes stand apart on the left, away from Close, and Enter never presses
        # them by accident.
        for button in (self.amend_button, self.delete_button, self.forget_button,
                       self.customer_button):
            button.setAutoDefault(False)
        bottom = QHBoxLayout()
        bottom.addWidget(self.amend_button)
        bottom.addWidget(self.delete_button)
        bottom.addWidget(self.forget_button)
        bottom.addStretch(1)
        bottom.addWidget(buttons)
        buttons.rejected.connect(self.reject)
        layout = QVBoxLayout(self)
        layout.addWidget(self.heading)
        layout.addWidget(self.facts)
        links = QHBoxLayout()
        links.addWidget(self.customer_button)
        links.addLayout(self.linked_buttons)
        links.addStretch(1)
        layout.addLayout(links)
        layout.addWidget(QLabel("<b>Timeline</b>"))
        layout.addWidget(self.timeline, 1)
        layout.addWidget(self.rerun_text)
        layout.addWidget(self.busy)
        layout.addLayout(bottom)
        for button in (self.rerun_button, self.amend_button, self.delete_button,
                       self.forget_button, self.customer_button):
            button.setEnabled(False)
        self.amend_button.setToolTip("Correct a field of this closed case (owner only)")
        self.delete_button.setToolTip("Delete this case and all kept under it (owner only)")
        self.rerun_button.clicked.connect(self.start_rerun)
        self.report_button.clicked.connect(lambda: self.report_requested.emit(self.case_id))
        self.amend_button.clicked.connect(self.open_amend)
        self.delete_button.clicked.connect(self.open_delete)
        self.forget_button.clicked.connect(self.open_forget)
        self.forget_button.setToolTip("On the customer's request: remove their name and contact "
                                      "from every job, keeping the jobs (owner only)")
        self.customer_button.clicked.connect(
            lambda: self.customer_jobs_wanted.emit(self.story.customer_id, self.story.customer))
        self.load()

    def load(self) -> None:
        """Read (or read again, after an amendment) the case off the GUI thread."""
        self.busy.set_busy(True)
        store, kb, case_id = self.context.store, self.context.knowledge, self.case_id
        run_in_background(lambda: (load_case_story(store, kb, case_id),
                                   has_owner_passphrase(store)), self._loaded, self._failed)

    def _loaded(self, loaded: tuple[CaseStory, bool]) -> None:
        story, self.owner_set = loaded
        self.show_story(story)

    def show_story(self, story: CaseStory) -> None:
        self.busy.set_busy(False)
        self.story = story
        self.setWindowTitle(f"Case {story.ticket}")
        self.heading.setText(f"{story.ticket}: {story.title}")
        self.facts.setText(facts_html(story))
        self.timeline.setHtml(timeline_html(story))
        self.rerun_button.setEnabled(bool(story.readings))
        closed = story.status == "closed"
        self.amend_button.setEnabled(self.owner_set and closed)
        self.delete_button.setEnabled(self.owner_set)
        known = story.customer_id is not None
        self.customer_button.setEnabled(known)
        self.forget_button.setEnabled(self.owner_set and known)
        self._show_links(story)
        if not self.owner_set:
            for button in (self.amend_button, self.delete_button):
                button.setToolTip(NO_OWNER)
        elif not closed:
            self.amend_button.setToolTip("This case is still open; it is changed at the bench, "
                                         "not by amendment")
        self.timeline.setFocus()

    def _show_links(self, story: CaseStory) -> None:
        """A button per linked job: the one this came back from, the returns it came back as."""
        while self.linked_buttons.count():
            self.linked_buttons.takeAt(0).widget().deleteLater()
        links = ([(f"Came back from {story.return_of[1]}", *story.return_of)]
                 if story.return_of else [])
        links += [(f"Came back as {ticket}", case_id, ticket) for case_id, ticket in story.returns]
        for words, case_id, ticket in links:
            button = QPushButton(words)
            button.setAutoDefault(False)
            button.clicked.connect(lambda _c=False, i=case_id, t=ticket: self.case_wanted.emit(i, t))
            self.linked_buttons.addWidget(button)

    def open_forget(self) -> None:
        if self.story is None or self.story.customer_id is None or self.forget_dialog is not None:
            return
        dialog = ForgetCustomerDialog(self.context.store, self.story.customer_id,
                                      self.story.customer, self)
        dialog.forgotten.connect(self._forgotten)
        dialog.finished.connect(lambda _result: setattr(self, "forget_dialog", None))
        self.forget_dialog = dialog
        dialog.open()

    def _forgotten(self, jobs: int) -> None:
        self.busy.tell(f"The customer's details were removed from {jobs} jobs; the jobs are kept.")
        self.load()
        self.case_amended.emit(self.case_id)

    def open_amend(self) -> None:
        if self.story is None or self.amend_dialog is not None:
            return
        dialog = AmendDialog(self.context.store, TradeNames(self.context.knowledge), self.story,
                             self)
        dialog.amended.connect(self._amended)
        dialog.finished.connect(lambda _result: setattr(self, "amend_dialog", None))
        self.amend_dialog = dialog
        dialog.open()

    def _amended(self, case_id: int) -> None:
        self.busy.tell("Amendment kept; the timeline shows it below the closing.")
        self.rerun = None
        self.rerun_text.setText("")  # it compared against the values before the amendment
        self.load()
        self.case_amended.emit(case_id)

    def open_delete(self) -> None:
        if self.story is None or self.delete_dialog is not None:
            return
        dialog = DeleteCaseDialog(self.context.store, self.case_id, self.story.ticket, self)
        dialog.deleted.connect(self._deleted)
        dialog.finished.connect(lambda _result: setattr(self, "delete_dialog", None))
        self.delete_dialog = dialog
        dialog.open()

    def _deleted(self, case_id: int) -> None:
        self.case_deleted.emit(case_id)
        self.accept()

    def start_rerun(self) -> None:
        if self.story is None:
            return
        self.rerun_button.setEnabled(False)
        self.busy.set_busy(True)
        self.busy.tell("Running the readings through today's engine...")
        kb, story = self.context.knowledge, self.story
        run_in_background(lambda: rerun_case(kb, story), self.show_rerun, self._failed)

    def show_rerun(self, rerun: Rerun) -> None:
        self.busy.set_busy(False)
        self.busy.tell("")
        self.rerun = rerun
        text = rerun.summary
        if rerun.skipped:
            text += " Readings today's engine could not take: " + "; ".join(rerun.skipped)
        colour = "#a0281c" if rerun.changed else "#2b6b2b"
        self.rerun_text.setText(f"<span style='color:{colour}'>{escape(text, quote=False)}</span>")
        self.rerun_button.setEnabled(True)

    def _failed(self, err: Exception) -> None:
        self.busy.set_busy(False)
        self.busy.warn(f"This case could not be shown: {err}")
        self.heading.setText("Case not shown")
