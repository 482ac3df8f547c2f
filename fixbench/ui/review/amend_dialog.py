"""The owner's two changes to a kept case: amending a closed case, and deleting a case (removing
a customer's details is :mod:`fixbench.ui.review.forget_customer`, on the same frame).

Both dialogs check what they can before asking the store (who and why given, the ticket typed
back), then hand the change to :mod:`fixbench.workflows.review` off the GUI thread, since the
passphrase check alone costs about 0.1 s of scrypt. A wrong passphrase or a value the store refuses
is told in the dialog, which stays open for another try; nothing is changed.

A confirmed fault is amended together with its part and the stage the part sits in, as the bench
keeps them when a case is closed; a confirmed part likewise brings its stage along.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from PySide6.QtCore import Qt, Signal
from PySide6.QtWidgets import (QComboBox, QDialog, QDialogButtonBox, QFormLayout, QLabel,
                               QLineEdit, QProgressBar, QPushButton, QStackedWidget, QVBoxLayout,
                               QWidget)

from fixbench.knowledge.model import Family
from fixbench.store.errors import OwnerRequired, StoreError, StoreInputError
from fixbench.ui.bench.verify_close import parse_minutes
from fixbench.ui.workers import run_in_background
from fixbench.workflows.case_story import CaseStory, shown_value
from fixbench.workflows.money import read_amount
from fixbench.workflows.review import OUTCOMES, Store, amend_case, delete_case
from fixbench.workflows.trade_names import OUTCOME_WORDS, TradeNames

# What the owner may correct, in the order offered; the store's AMENDABLE also holds the stage,
# which follows the part rather than being chosen on its own.
FIELD_WORDS = (("outcome", "Outcome"), ("confirmed_fault", "Confirmed fault"),
               ("confirmed_part", "Confirmed part"), ("bench_minutes", "Bench minutes"),
               ("price_cents", "Price charged"), ("notes", "Notes"))
CHOSEN_FROM_LIST = ("outcome", "confirmed_fault", "confirmed_part")
FOLLOWS = {"confirmed_fault": "The confirmed part and its stage are amended with the fault.",
           "confirmed_part": "The confirmed stage is amended with the part."}


def value_choices(family: Family | None, field: str) -> list[tuple[str, str | None]]:
    """(words shown, stored value) for a field picked from a list."""
    if field == "outcome":
        return [(OUTCOME_WORDS[o], o) for o in OUTCOMES]
    if family is None:
        return [("None", None)]
    if field == "confirmed_fault":
        faults = sorted(family.faults, key=lambda f: f.title)
        return [("None (no fault confirmed)", None)] + [(f.title, f.id) for f in faults]
    if field == "confirmed_part":
        parts = sorted(family.parts, key=lambda p: p.title)
        return [("None (no part confirmed)", None)] + [(p.title, p.id) for p in parts]
    raise ValueError(f"{field} is not chosen from a list")


def changes_for(family: Family | None, field: str, value: Any) -> dict[str, Any]:
    """The store fields one amendment sets: a fault brings its part and stage, a part its stage."""
    if family is not None and field == "confirmed_fault":
        part = family.fault(value).part if value else None
        return {"confirmed_fault": value, "confirmed_part": part,
                "confirmed_stage": family.part(part).stage if part else None}
    if family is not None and field == "confirmed_part":
        return {"confirmed_part": value,
                "confirmed_stage": family.part(value).stage if value else None}
    return {field: value}


def typed_value(field: str, text: str) -> Any:
    """A typed field as the store keeps it; ValueError says what to type instead."""
    if field == "bench_minutes":
        return parse_minutes(text)
    if field == "price_cents":
        try:
            return read_amount(text)
        except StoreInputError as err:
            raise ValueError(str(err)) from None
    return text.strip()


class OwnerActionDialog(QDialog):
    """Shared frame: a message line, a moving bar while the store works, and one action button."""

    def __init__(self, title: str, action_words: str, parent: QWidget | None) -> None:
        super().__init__(parent)
        self.setWindowTitle(title)
        self.working = False
        self.message = QLabel(wordWrap=True)
        self.message.setStyleSheet("color: #9a2a1c; font-weight: 600;")
        self.message.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self.bar = QProgressBar(textVisible=False, maximumHeight=10)
        self.bar.setRange(0, 0)
        self.bar.hide()
        self.passphrase = QLineEdit(echoMode=QLineEdit.EchoMode.Password)
        self.passphrase.setAccessibleName("Owner's passphrase")
        self.buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Cancel)
        self.action_button = QPushButton(action_words)
        self.first_field: QWidget = self.passphrase
        self.buttons.addButton(self.action_button, QDialogButtonBox.ButtonRole.AcceptRole)
        self.buttons.accepted.connect(self.attempt)
        self.buttons.rejected.connect(self.reject)

    def showEvent(self, event) -> None:
        # Marked default only once inside the dialog, so Enter keeps meaning "do it" after the
        # focus has passed over Cancel; and the person starts typing in the first field.
        self.action_button.setDefault(True)
        self.first_field.setFocus()
        super().showEvent(event)

    def refuse(self, text: str, focus: QWidget | None = None) -> None:
        self.message.setText(text[:1].upper() + text[1:])
        if focus is not None:
            focus.setFocus()

    def attempt(self) -> None:  # each dialog checks its own fields, then calls run()
        raise NotImplementedError

    def run(self, work: Callable[[], object]) -> None:
        self.working = True
        self.message.setText("")
        self.bar.show()
        self.action_button.setEnabled(False)
        run_in_background(work, self._done, self._failed)

    def _settle(self) -> None:
        self.working = False
        self.bar.hide()
        self.action_button.setEnabled(True)

    def _done(self, _result) -> None:
        self._settle()
        self.accept()

    def _failed(self, err: Exception) -> None:
        self._settle()
        if isinstance(err, OwnerRequired):
            self.passphrase.clear()
            self.refuse(f"{err}. Nothing was changed.", self.passphrase)
        elif isinstance(err, StoreError):
            self.refuse(f"{err}. Nothing was changed.")
        else:  # a programmer's mistake: said plainly here, and not hidden
            self.refuse(f"Something went wrong and nothing was changed: {err}")
            raise err

    def reject(self) -> None:
        if not self.working:  # the store's answer is still on its way back to this dialog
            super().reject()


class AmendDialog(OwnerActionDialog):
    """Correct one field of a closed case; the old value stays in the record beside the new."""

    amended = Signal(int)  # case id

    def __init__(self, store: Store, names: TradeNames, story: CaseStory,
                 parent: QWidget | None = None) -> None:
        super().__init__(f"Amend case {story.ticket}", "&Keep the amendment", parent)
        self.store, self.names, self.story = store, names, story
        self.family = names.knowledge.families.get(story.family_id)
        intro = QLabel(f"Correct a field of closed case <b>{story.ticket}</b>. The value it had "
                       "stays in the record, with who changed it, when and why.", wordWrap=True)
        self.field = QComboBox()
        for field, words in FIELD_WORDS:
            self.field.addItem(words, field)
        self.now = QLabel(wordWrap=True)
        self.now.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self.choice = QComboBox()
        self.choice.setMinimumContentsLength(34)
        self.typed = QLineEdit()
        self.value = QStackedWidget()
        self.value.addWidget(self.choice)
        self.value.addWidget(self.typed)
        self.follows = QLabel(wordWrap=True)
        self.follows.setStyleSheet("color: #555;")
        self.who = QLineEdit(placeholderText="Your name")
        self.why = QLineEdit(placeholderText="What was wrong, in a few words")
        form = QFormLayout()
        form.addRow("&Field:", self.field)
        form.addRow("Now:", self.now)
        self.value_label = QLabel("New &value:")
        self.value_label.setBuddy(self.choice)
        form.addRow(self.value_label, self.value)
        form.addRow("", self.follows)
        form.addRow("&Who:", self.who)
        form.addRow("W&hy:", self.why)
        form.addRow("Owner's &passphrase:", self.passphrase)
        for label_for in (self.field, self.who, self.why, self.passphrase):
            form.labelForField(label_for).setBuddy(label_for)
        layout = QVBoxLayout(self)
        layout.addWidget(intro)
        layout.addLayout(form)
        layout.addWidget(self.message)
        layout.addWidget(self.bar)
        layout.addWidget(self.buttons)
        self.setMinimumWidth(560)
        self.field.currentIndexChanged.connect(self._show_field)
        self._show_field()
        self.first_field = self.field

    def chosen_field(self) -> str:
        return self.field.currentData()

    def _show_field(self) -> None:
        field = self.chosen_field()
        current = self.story.current.get(field)
        self.now.setText(shown_value(self.names, self.story.family_id, field, current))
        self.message.setText("")
        self.follows.setText(FOLLOWS.get(field, ""))
        self.follows.setVisible(field in FOLLOWS)
        if field in CHOSEN_FROM_LIST:
            self.choice.clear()
            for words, value in value_choices(self.family, field):
                self.choice.addItem(words, value)
            self.choice.setCurrentIndex(max(self.choice.findData(current), 0))
            self.value.setCurrentWidget(self.choice)
            self.value_label.setBuddy(self.choice)
        elif field == "price_cents":
            self.typed.setText("" if current is None else f"{current / 100:.2f}")
            self.value.setCurrentWidget(self.typed)
            self.value_label.setBuddy(self.typed)
        else:
            self.typed.setText("" if current is None else str(current))
            self.value.setCurrentWidget(self.typed)
            self.value_label.setBuddy(self.typed)
        self.setTabOrder(self.field, self.value.currentWidget())
        self.setTabOrder(self.value.currentWidget(), self.who)

    def new_value(self) -> Any:
        field = self.chosen_field()
        if field in CHOSEN_FROM_LIST:
            return self.choice.currentData()
        return typed_value(field, self.typed.text())

    def attempt(self) -> None:
        if self.working:
            return
        field = self.chosen_field()
        try:
            value = self.new_value()
        except ValueError as err:
            self.refuse(str(err), self.typed)
            return
        if value == self.story.current.get(field):
            self.refuse("That is the value the case already has; choose the corrected one.",
                        self.value.currentWidget())
            return
        who, why = self.who.text().strip(), self.why.text().strip()
        if not who:
            self.refuse("Say who is making the amendment.", self.who)
            return
        if not why:
            self.refuse("Say why the case is being amended.", self.why)
            return
        if not self.passphrase.text():
            self.refuse("Type the owner's passphrase.", self.passphrase)
            return
        store, case_id, passphrase = self.store, self.story.case_id, self.passphrase.text()
        changes = changes_for(self.family, field, value)
        self.run(lambda: amend_case(store, case_id, changes, by=who, reason=why,
                                           passphrase=passphrase))

    def _done(self, result) -> None:
        super()._done(result)
        self.amended.emit(self.story.case_id)


class DeleteCaseDialog(OwnerActionDialog):
    """Delete a case and everything kept under it, once the ticket is typed back."""

    deleted = Signal(int)  # case id

    def __init__(self, store: Store, case_id: int, ticket: str,
                 parent: QWidget | None = None) -> None:
        super().__init__(f"Delete case {ticket}", "&Delete the case", parent)
        self.store, self.case_id, self.ticket = store, case_id, ticket
        warning = QLabel(f"Deleting case <b>{ticket}</b> removes it with its readings, repairs, "
                         "verifications and amendments. It cannot be undone except from a "
                         "backup.", wordWrap=True)
        self.typed_ticket = QLineEdit(placeholderText=ticket)
        self.typed_ticket.setAccessibleName("Ticket typed back")
        form = QFormLayout()
        form.addRow("&Type the ticket to confirm:", self.typed_ticket)
        form.addRow("Owner's &passphrase:", self.passphrase)
        for label_for in (self.typed_ticket, self.passphrase):
            form.labelForField(label_for).setBuddy(label_for)
        layout = QVBoxLayout(self)
        layout.addWidget(warning)
        layout.addLayout(form)
        layout.addWidget(self.message)
        layout.addWidget(self.bar)
        layout.addWidget(self.buttons)
        self.setMinimumWidth(480)
        self.first_field = self.typed_ticket

    def attempt(self) -> None:
        if self.working:
            return
        if self.typed_ticket.text().strip() != self.ticket:
            self.refuse(f"The ticket typed does not match {self.ticket}; type it exactly.",
                        self.typed_ticket)
            return
        if not self.passphrase.text():
            self.refuse("Type the owner's passphrase.", self.passphrase)
            return
        store, case_id, passphrase = self.store, self.case_id, self.passphrase.text()
        self.run(lambda: delete_case(store, case_id, passphrase=passphrase))

    def _done(self, result) -> None:
        super()._done(result)
        self.deleted.emit(self.case_id)
