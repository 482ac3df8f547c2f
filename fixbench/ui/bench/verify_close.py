"""Verification after the repair (the readings a repaired unit must give, each marked as it is
typed) and closing the case with its outcome, bench minutes and the final price charged."""

from __future__ import annotations

from html import escape

from PySide6.QtCore import Qt
from PySide6.QtWidgets import (QComboBox, QFormLayout, QHBoxLayout, QLabel, QListWidget, QPushButton,
                               QVBoxLayout, QWidget)

from fixbench.store.errors import StoreInputError
from fixbench.workflows import step_wording as wording
from fixbench.workflows.money import read_amount
from fixbench.workflows.verify_how import verification_how
from fixbench.ui.bench.entry import CheckedField
from fixbench.ui.bench.step_card import OUTCOME_WORDS as OUTCOME_WORDS_SHOWN
from fixbench.ui.bench.look import BIG, SUSPECT_HUE, banner, bind_keys, heading, scaled_font

OUTCOME_WORDS = (("repaired", "Repaired and verified"), ("not_economical", "Not worth repairing"),
                 ("no_fault_found", "No fault found in the supply"),
                 ("returned_unrepaired", "Returned unrepaired"))
MAX_MINUTES = 24 * 60 * 5


def parse_minutes(text: str) -> int:
    text = text.strip()
    if not text:
        raise ValueError("type the bench minutes, for example 25")
    try:
        minutes = float(text)
    except ValueError:
        raise ValueError(f"'{text}' is not a number of minutes") from None
    if minutes < 0 or minutes > MAX_MINUTES or minutes != minutes:
        raise ValueError(f"{text} minutes is not a bench time: 0 to {MAX_MINUTES}")
    return round(minutes)


class VerifyPanel(QWidget):
    def __init__(self, controller, parent=None) -> None:
        super().__init__(parent)
        self.controller = controller
        self.steps: tuple = ()
        self.live_box = banner(SUSPECT_HUE)
        live_layout = QVBoxLayout(self.live_box)
        self.live_label = QLabel()
        self.live_label.setWordWrap(True)
        live_layout.addWidget(self.live_label)
        self.title = heading("", factor=1.35)
        self.where = QLabel()
        self.expected = QLabel()
        self.expected.setFont(scaled_font(self.expected, BIG, bold=True))
        self.field = CheckedField("type the reading and press Enter", big=BIG)
        self.field.edit.returnPressed.disconnect()
        self.field.edit.returnPressed.connect(self.submit)
        self.field.escaped.connect(controller.back_to_checks)
        self.list = QListWidget()
        self.list.setFocusPolicy(Qt.FocusPolicy.NoFocus)
        self.result = heading("", factor=1.15)
        self.repair_button = QPushButton("Back to repair (Alt+B)")
        self.repair_button.setToolTip("A reading failed: fix and verify again")
        bind_keys(self.repair_button, "Alt+B")
        self.repair_button.clicked.connect(lambda: controller.page_wanted.emit("repair"))
        self.close_button = QPushButton("Close the case (Alt+L)")
        self.close_button.setToolTip("Record the outcome")
        bind_keys(self.close_button, "Alt+L")
        self.close_button.clicked.connect(controller.go_close)
        buttons = QHBoxLayout()
        buttons.addWidget(self.repair_button)
        buttons.addStretch(1)
        buttons.addWidget(self.close_button)
        self.how_label = QLabel()  # how to prove the repair, with the unit's own figures
        self.how_label.setWordWrap(True)
        self.how_label.setTextFormat(Qt.TextFormat.RichText)
        self.how_label.setAlignment(Qt.AlignmentFlag.AlignTop)
        readings = QVBoxLayout()
        readings.addWidget(self.live_box)
        readings.addWidget(self.title)
        readings.addWidget(self.where)
        readings.addWidget(self.expected)
        readings.addWidget(self.field)
        readings.addWidget(self.result)
        readings.addWidget(self.list, 1)
        how = QVBoxLayout()
        how.addWidget(heading("How to prove it", factor=1.15))
        how.addWidget(self.how_label, 1)
        columns = QHBoxLayout()
        columns.addLayout(readings, 6)
        columns.addSpacing(16)
        columns.addLayout(how, 5)
        layout = QVBoxLayout(self)
        layout.addWidget(heading("Verification: what a repaired unit must show", factor=1.15))
        layout.addLayout(columns, 1)
        layout.addLayout(buttons)
        self.setFocusProxy(self.field)

    def _current(self, view):
        passed = {v.check_id for v in view.verifications if v.passed}
        for step in self.steps:
            if step.check not in passed:
                return step
        return None

    def show_view(self, view) -> None:
        if view.case is None or view.state is None or view.conclusion is None:
            return
        self.steps = view.conclusion.verify
        state = view.state
        self.how_label.setText("".join(f"<p><b>{escape(step.title)}</b><br>{escape(step.how)}</p>"
                                       for step in verification_how(state.model.ratings)))
        latest = {}
        for v in view.verifications:
            latest[v.check_id] = v
        self.list.clear()
        for step in self.steps:
            shown = step.expected.describe() if step.expected else step.outcome
            done = latest.get(step.check)
            mark = "" if done is None else f"   read {done.typed}  " + ("\u2714" if done.passed else "\u2716 FAILED")
            self.list.addItem(f"{step.title}: {shown}{mark}")
        step = self._current(view)
        if step is None:
            self.title.setText("Every verification reading is as a good unit reads")
            self.where.setText("Close the case with its outcome (Alt+L).")
            self.expected.setText("")
            self.field.setEnabled(False)
            self.live_box.setVisible(False)
        else:
            proposal = state.proposal_for(step.check)
            self.title.setText(step.title)
            self.where.setText(f"{wording.POWER_WORDS[proposal.check.power]}.  {wording.point_words(state.family, proposal.check)}")
            self.expected.setText(step.expected.describe() if step.expected else
                                  f"healthy: {OUTCOME_WORDS_SHOWN.get(step.outcome, step.outcome)}")
            self.live_label.setText("\n".join(f"\u26a0 {c}" for c in proposal.cautions))
            self.live_box.setVisible(bool(proposal.cautions))
            self.field.setEnabled(True)
            self.field.set_text("")
        last = view.last_verification
        if last is not None:
            self.result.setText(f"\u2714 {last.shown()}: as a good unit reads" if last.in_band else
                                f"\u2716 {last.shown()}: NOT as a good unit reads; the repair "
                                "is not proven")
        else:
            self.result.setText("")
        self.close_button.setEnabled(True)
        self.field.setFocus()

    def submit(self) -> None:
        step = self._current(self.controller.view)
        if step is None:
            return
        try:
            self.controller.submit_verification(step.check, self.field.text())
        except ValueError as err:
            self.field.show_message(str(err))


def parse_price(text: str) -> int | None:
    try:
        return read_amount(text)
    except StoreInputError as err:
        raise ValueError(str(err)) from None


class ClosePanel(QWidget):
    def __init__(self, controller, parent=None) -> None:
        super().__init__(parent)
        self.controller = controller
        self.outcome = QComboBox()
        for key, words in OUTCOME_WORDS:
            self.outcome.addItem(words, key)
        self.fault = QComboBox()
        self.minutes = CheckedField("bench minutes", parse_minutes)
        self.minutes.accepted.connect(lambda _v: self.submit())
        self.minutes.escaped.connect(lambda: controller.page_wanted.emit("verify"))
        self.price = CheckedField("final price charged, e.g. 35 (empty: not known)", parse_price)
        self.price.accepted.connect(lambda _v: self.submit())
        self.price.escaped.connect(lambda: controller.page_wanted.emit("verify"))
        self.summary = QLabel()
        self.summary.setWordWrap(True)
        self.close_button = QPushButton("Close the case")
        self.close_button.setToolTip("Keep the outcome; the case then changes only by amendment (Enter)")
        self.close_button.clicked.connect(self.submit)
        form = QFormLayout()
        form.addRow("Outcome", self.outcome)
        form.addRow("Fault confirmed", self.fault)
        form.addRow("Bench minutes", self.minutes)
        form.addRow("Price charged", self.price)
        layout = QVBoxLayout(self)
        layout.addWidget(heading("Close the case", factor=1.35))
        layout.addWidget(self.summary)
        layout.addLayout(form)
        layout.addWidget(self.close_button)
        layout.addStretch(1)
        self.setFocusProxy(self.minutes)

    def show_view(self, view) -> None:
        if view.case is None or view.state is None:
            return
        passed = sum(1 for v in view.verifications if v.passed)
        failed = sum(1 for v in view.verifications if not v.passed)
        self.summary.setText(f"{len(view.repairs)} repair lines, {passed} verification readings "
                             f"as a good unit reads, {failed} not.")
        self.fault.clear()
        for s in view.state.suspects[:6]:
            self.fault.addItem(f"{s.title} ({s.probability:.0%})", s.fault)
        self.fault.addItem("None confirmed", None)
        self.minutes.set_text(str(self.controller.minutes_so_far()))
        self.minutes.edit.selectAll()
        expected = view.case.expected_price
        self.price.set_text("" if expected is None else f"{expected / 100:.2f}")
        if view.case.return_of is not None:
            self.summary.setText(self.summary.text() + f" A warranty return of job "
                                                       f"{view.case.return_of}: normally free.")

    def submit(self) -> None:
        try:
            minutes = self.minutes.value()
            price = self.price.value()
        except ValueError:
            return
        self.controller.close_case(self.outcome.currentData(), minutes, self.fault.currentData(),
                                   price)
