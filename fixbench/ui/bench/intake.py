"""Intake: ticket, the customer (optional: name and contact, completing from the customers seen
before), the unit (make and model completing from the shop's history), the price quoted, its
supply family, its label ratings typed with units, and the symptoms reported or seen. A unit back
within the shop's comeback window is named as a warranty return before the case is opened.

Enter in a field that reads correctly moves to the next one; Ctrl+Enter opens the case from
anywhere; Esc goes back to the open cases. A field that does not read gets its message under it and
keeps its text; nothing else on the form is touched. Ratings are read by
:mod:`fixbench.workflows.intake` (the one ratings parser); the shop's record (models seen before, a
ticket already used) is read off the GUI thread, so typing never waits for the database.
"""

from __future__ import annotations

import re

from PySide6.QtCore import QStringListModel, Qt, QTimer
from PySide6.QtGui import QKeySequence, QShortcut
from PySide6.QtWidgets import (QCheckBox, QComboBox, QCompleter, QFormLayout, QGridLayout, QGroupBox,
                               QHBoxLayout, QLabel, QLineEdit, QPushButton, QScrollArea,
                               QVBoxLayout, QWidget)

from fixbench.quantities import ReadingError
from fixbench.store.errors import StoreInputError
from fixbench.ui.bench.board_profile import BoardProfileDialog
from fixbench.ui.bench.entry import CheckedField
from fixbench.ui.bench.family_choice import FamilyChoice
from fixbench.ui.bench.look import heading
from fixbench.ui.workers import run_in_background
from fixbench.workflows.board_profiles import board_of_model
from fixbench.workflows.intake import (IntakeForm, customers_like, known_models, label_ratings,
                                       read_rating_field, ticket_in_use, warranty_check)
from fixbench.workflows.money import read_amount

KINDS = ("phone charger", "USB wall adapter", "laptop adapter", "appliance adapter", "other")
# rating key -> (label, unit, placeholder, required)
RATING_FIELDS = (
    ("mains", "Mains input", "V", "230 V, 120 V or universal", True),
    ("bench_mains", "Bench mains (universal units)", "V", "230 V", False),
    ("output", "Output voltage", "V", "5 V", True),
    ("current", "Output current", "A", "2 A", True),
    ("bulk", "Bulk capacitor (if read)", "F", "22 uF", False),
)
RATING_IN_MESSAGE = re.compile(r"rating '(\w+)'")


def _required(what: str):
    def check(text: str) -> str:
        if not text.strip():
            raise ValueError(f"{what} is needed")
        return text.strip()
    return check


def rating_check(key: str, required: bool):
    def check(text: str) -> str:
        if not text.strip():
            if required:
                raise ValueError("needed: type it as on the label, with its unit")
            return ""
        return read_rating_field(key, text)
    return check


def _amount_check(text: str) -> int | None:
    try:
        return read_amount(text)
    except StoreInputError as err:
        raise ValueError(str(err)) from None


class IntakePanel(QWidget):
    def __init__(self, controller, parent=None) -> None:
        super().__init__(parent)
        self.controller = controller
        self.ticket = CheckedField("ticket reference, e.g. BW-2291", self._ticket_check)
        self.customer = CheckedField("customer's name (optional)")
        self.contact = CheckedField("phone or e-mail (optional)")
        self.quote = CheckedField("price quoted, e.g. 35 (optional)", _amount_check)
        self.customer_list = QStringListModel(self)
        completer = QCompleter(self.customer_list, self)
        completer.setCaseSensitivity(Qt.CaseSensitivity.CaseInsensitive)
        completer.setFilterMode(Qt.MatchFlag.MatchContains)
        completer.activated.connect(self._customer_chosen)
        self.customer.edit.setCompleter(completer)
        self._customer_rows: dict[str, object] = {}
        self._customer_typing = QTimer(self, singleShot=True, interval=250)
        self._customer_typing.timeout.connect(self._look_up_customers)
        self.customer.edit.textEdited.connect(lambda _t: self._customer_typing.start())
        self.warranty_note = QLabel()
        self.warranty_note.setWordWrap(True)
        self.make = CheckedField("make", _required("the make"))
        self.model = CheckedField("model", _required("the model"))
        self.serial = CheckedField("serial (optional: links a unit that comes back)")
        self.kind = QComboBox()
        self.kind.addItems(KINDS)
        self.family = FamilyChoice(controller.context.knowledge)
        self.family.chosen.connect(self._family_chosen)
        self.ratings: dict[str, CheckedField] = {}
        for key, _label, _unit, placeholder, required in RATING_FIELDS:
            self.ratings[key] = CheckedField(placeholder, rating_check(key, required))
        self.notes = QLineEdit()
        self.notes.setPlaceholderText("what the customer said, in their words")
        self.symptom_box = QGroupBox("Symptoms reported or seen (tick what applies; the rest is asked later)")
        self.symptom_layout = QGridLayout(self.symptom_box)
        self.symptoms: dict[str, QCheckBox] = {}
        self.filled_note = QLabel()
        self.message = QLabel()
        self.message.setWordWrap(True)

        self.known: dict | None = None  # None until the shop's record has been read
        self._fill_wanted = False
        self._load_known_models()
        self.model.edit.editingFinished.connect(self._fill_from_history)
        self.model.edit.editingFinished.connect(self._look_up_board)
        for field in (self.model, self.serial, self.customer, self.contact):
            field.edit.editingFinished.connect(self._check_warranty)
        self.ticket.accepted.connect(self._check_ticket_in_use)
        controller.ticket_refused.connect(self._ticket_refused)

        unit_form = QFormLayout()
        for label, widget in (("Ticket", self.ticket), ("Customer", self.customer),
                              ("Contact", self.contact), ("Make", self.make), ("Model", self.model),
                              ("Serial", self.serial), ("Kind", self.kind),
                              ("Price quoted", self.quote)):
            unit_form.addRow(label, widget)
        unit_form.addRow("", self.filled_note)
        unit_form.addRow("", self.warranty_note)
        ratings_form = QFormLayout()
        for key, label, unit, _p, required in RATING_FIELDS:
            ratings_form.addRow(f"{label} ({unit}){'' if required else ''}", self.ratings[key])
        ratings_form.addRow("Customer's words", self.notes)
        left = QVBoxLayout()
        left.addWidget(heading("The unit", factor=1.15))
        left.addLayout(unit_form)
        left.addWidget(heading("Label ratings", factor=1.15))
        left.addLayout(ratings_form)
        left.addWidget(self.symptom_box)
        left.addStretch(1)
        right = QVBoxLayout()
        right.addWidget(heading("Supply family", factor=1.15))
        right.addWidget(self.family)
        self.board_note = QLabel("Board profile: type the model and choose the family first.")
        self.board_note.setWordWrap(True)
        self.board_button = QPushButton("Board profile…")
        self.board_button.setToolTip("This model's board: designators, markings and photos, kept for "
                                     "every unit of the model")
        self.board_button.clicked.connect(self.edit_board)
        board_row = QHBoxLayout()
        board_row.addWidget(self.board_note, 1)
        board_row.addWidget(self.board_button)
        right.addLayout(board_row)
        right.addStretch(1)
        columns = QHBoxLayout()
        columns.addLayout(left, 5)
        columns.addLayout(right, 6)
        inner = QWidget()
        inner.setLayout(columns)
        scroll = QScrollArea()
        scroll.setWidgetResizable(True)
        # Wrap the family descriptions to the window rather than scroll sideways.
        scroll.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        scroll.setWidget(inner)

        self.open_button = QPushButton("Open the case (Ctrl+Enter)")
        self.open_button.setToolTip("Keep the intake and go to the cautions")
        self.open_button.clicked.connect(self.submit)
        self.cancel_button = QPushButton("Back to open cases (Esc)")
        self.cancel_button.setToolTip("Leave without opening a case")
        self.cancel_button.clicked.connect(controller.back_to_cases)
        buttons = QHBoxLayout()
        buttons.addWidget(self.message, 1)
        buttons.addWidget(self.cancel_button)
        buttons.addWidget(self.open_button)
        layout = QVBoxLayout(self)
        layout.addWidget(heading("New case", factor=1.35))
        layout.addWidget(scroll, 1)
        layout.addLayout(buttons)

        self.order = ([self.ticket, self.customer, self.contact, self.make, self.model, self.serial,
                       self.quote] + [self.ratings[k] for k, *_ in RATING_FIELDS])
        for i, field in enumerate(self.order):
            field.accepted.connect(lambda _v, i=i: self._advance(i))
            field.escaped.connect(controller.back_to_cases)
        for keys in ("Ctrl+Return", "Ctrl+Enter"):
            QShortcut(QKeySequence(keys), self, activated=self.submit)
        self.setFocusProxy(self.ticket)

    @staticmethod
    def _completer(words: list[str]) -> QCompleter:
        completer = QCompleter(words)
        completer.setCaseSensitivity(Qt.CaseSensitivity.CaseInsensitive)
        completer.setFilterMode(Qt.MatchFlag.MatchContains)
        return completer

    def _ticket_check(self, text: str) -> str:
        return _required("a ticket reference")(text)

    def _check_ticket_in_use(self, ticket: str) -> None:
        """Say at once (off the GUI thread) if the ticket is already a case's; opening the case
        checks again, in the same job that keeps it."""
        store = self.controller.context.store

        def shown(in_use: bool) -> None:
            if in_use and self.ticket.text().strip() == ticket:
                self._ticket_refused(f"ticket {ticket} is already a case: open it from the list, "
                                     "or use another")

        run_in_background(lambda: ticket_in_use(store, ticket), shown, self._lookup_failed)

    def _ticket_refused(self, message: str) -> None:
        self.ticket.show_message(message)
        self.ticket.setFocus()

    def _load_known_models(self) -> None:
        """Fill the make and model completers from the shop's record, off the GUI thread."""
        store = self.controller.context.store
        run_in_background(lambda: known_models(store), self._set_known_models, self._lookup_failed)

    def _set_known_models(self, models) -> None:
        self.known = {m.label.lower(): m for m in models}
        self.make.edit.setCompleter(self._completer(sorted({m.make for m in models})))
        self.model.edit.setCompleter(self._completer(sorted({m.model for m in models})))
        if self._fill_wanted:  # the model was typed before the record had been read
            self._fill_from_history()

    def _lookup_failed(self, err: Exception) -> None:
        self.message.setText(f"\u26a0 The shop's record could not be read: {err}")

    def _look_up_customers(self) -> None:
        """Offer the customers seen before whose name or contact holds what is typed (off the
        GUI thread)."""
        typed = self.customer.text().strip()
        if len(typed) < 2:
            return
        store = self.controller.context.store

        def offer(rows) -> None:
            self._customer_rows = {row.label: row for row in rows}
            self.customer_list.setStringList(list(self._customer_rows))

        run_in_background(lambda: customers_like(store, typed), offer, self._lookup_failed)

    def _customer_chosen(self, label: str) -> None:
        row = self._customer_rows.get(label)
        if row is not None:
            self.customer.set_text(row.name)
            self.contact.set_text(row.contact or "")
            self._check_warranty()

    def _check_warranty(self) -> None:
        """Say, before the case is opened, that the unit is back under warranty (off the GUI
        thread; opening the case makes the same link by the same rule)."""
        make, model = self.make.text().strip(), self.model.text().strip()
        if not (make and model):
            self.warranty_note.clear()
            return
        store = self.controller.context.store
        serial, name, contact = self.serial.text(), self.customer.text(), self.contact.text()

        def shown(earlier) -> None:
            if earlier is None:
                self.warranty_note.clear()
                return
            how = "this unit" if earlier.same_unit else "this customer's unit of this model"
            self.warranty_note.setText(
                f"\u21ba Warranty return: {how} was repaired as job {earlier.ticket}, handed back "
                f"{earlier.days_since} days ago. The case will be kept as its return; the quote "
                "is normally nothing.")

        run_in_background(lambda: warranty_check(store, make, model, serial, name, contact),
                          shown, self._lookup_failed)

    def _advance(self, i: int) -> None:
        if i + 1 < len(self.order):
            self.order[i + 1].setFocus()
        else:
            self.submit()

    def _look_up_board(self) -> None:
        """Say whether the shop has a board profile of this model (off the GUI thread)."""
        model, family_id = self.model.text().strip(), self.family.family_id()
        if not model or family_id is None:
            self.board_note.setText("Board profile: type the model and choose the family first.")
            return
        store = self.controller.context.store

        def shown(board) -> None:
            if (model, family_id) != (self.model.text().strip(), self.family.family_id()):
                return
            if board is None or not board.parts:
                self.board_note.setText(f"No board profile of {model} yet: the family's typical parts "
                                        "are used until one is filled in.")
            else:
                self.board_note.setText(f"Board profile of {board.model}: {len(board.parts)} parts with "
                                        "the board's own designators and markings; used for this unit.")

        run_in_background(lambda: board_of_model(store, model, family_id), shown, self._lookup_failed)

    def edit_board(self) -> BoardProfileDialog | None:
        model, family_id = self.model.text().strip(), self.family.family_id()
        if not model or family_id is None:
            self.board_note.setText("⚠ Type the model and choose the family first: a profile "
                                    "belongs to a model.")
            return None
        family = self.controller.context.knowledge.family(family_id)
        ratings = {k: f.text() for k, f in self.ratings.items() if f.text().strip()}
        dialog = BoardProfileDialog(self.controller.context, family, model, ratings, self)
        dialog.finished.connect(self._board_closed)
        dialog.open()
        return dialog

    def _board_closed(self, _result: int) -> None:
        self._look_up_board()
        self.window().activateWindow()  # Ctrl+Enter and the other keys work again at once
        self.board_button.setFocus()

    def _family_chosen(self, family_id: str) -> None:
        family = self.controller.context.knowledge.family(family_id)
        self._look_up_board()
        self.family.show_message("")
        ticked = {cid for cid, box in self.symptoms.items() if box.isChecked()}
        for box in self.symptoms.values():
            self.symptom_layout.removeWidget(box)
            box.deleteLater()
        self.symptoms = {}
        shown = [c for c in family.checks if c.power == "none" and not c.procedure]
        half = (len(shown) + 1) // 2
        for i, check in enumerate(shown):
            box = QCheckBox(check.title)
            box.setToolTip(check.how)
            box.setChecked(check.id in ticked)
            self.symptom_layout.addWidget(box, i % half, i // half)
            self.symptoms[check.id] = box

    def _fill_from_history(self) -> None:
        if self.known is None:
            self._fill_wanted = True
            return
        self._fill_wanted = False
        known = self.known.get(f"{self.make.text().strip()} {self.model.text().strip()}".lower())
        if known is None:
            return
        filled = []
        for key, value in known.ratings.items():
            if key in self.ratings and not self.ratings[key].text().strip():
                self.ratings[key].set_text(value)
                filled.append(key)
        if self.family.family_id() is None:
            self.family.select(known.family_id)
            filled.append("family")
        if known.kind in KINDS:
            self.kind.setCurrentText(known.kind)
        if filled:
            self.filled_note.setText(f"Filled from an earlier case of this model: {', '.join(filled)}. Check them.")

    def reset(self) -> None:
        for field in self.order:
            field.set_text("")
        self.notes.clear()
        self.filled_note.clear()
        self.warranty_note.clear()
        self.message.clear()
        self.known, self._fill_wanted = None, False
        self._load_known_models()
        self.ticket.setFocus()

    def form(self) -> IntakeForm | None:
        """The checked form, or None with every problem shown beside its field."""
        ok = True
        self.message.clear()
        for field in self.order:
            try:
                field.value()
            except ValueError:
                ok = False
        family_id = self.family.family_id()
        if family_id is None:
            self.family.show_message("choose the supply family (or answer the questions)")
            ok = False
        ratings: dict[str, str] = {}
        if ok:
            try:
                ratings = label_ratings({k: f.text() for k, f in self.ratings.items()})
            except ReadingError as err:
                match = RATING_IN_MESSAGE.search(str(err))
                key = match.group(1) if match and match.group(1) in self.ratings else "current"
                self.ratings[key].show_message(str(err).split(": ", 1)[-1])
                ok = False
        if not self.controller.context.technician_id:
            self.message.setText("\u26a0 Choose who is at the bench (top of the screen) first.")
            ok = False
        if not ok:
            if not self.message.text():
                self.message.setText("\u26a0 Some fields need attention (marked); nothing typed is lost.")
            return None
        self.message.clear()
        return IntakeForm(self.ticket.text().strip(), self.make.text().strip(), self.model.text().strip(),
                          self.serial.text().strip(), self.kind.currentText(), family_id, ratings,
                          tuple(cid for cid, box in self.symptoms.items() if box.isChecked()),
                          self.notes.text().strip(), customer_name=self.customer.text().strip(),
                          customer_contact=self.contact.text().strip(),
                          quoted_cents=self.quote.value())

    def submit(self) -> None:
        form = self.form()
        if form is not None:
            self.controller.open_case(form)
