"""Intake: ticket, the unit (make and model completing from the shop's history), its supply family,
its label ratings typed with units, and the symptoms reported or seen.

Enter in a field that reads correctly moves to the next one; Ctrl+Enter opens the case from
anywhere; Esc goes back to the open cases. A field that does not read gets its message under it and
keeps its text; nothing else on the form is touched.
"""

from __future__ import annotations

import re

from PySide6.QtCore import Qt
from PySide6.QtGui import QKeySequence, QShortcut
from PySide6.QtWidgets import (QCheckBox, QComboBox, QCompleter, QFormLayout, QGridLayout, QGroupBox,
                               QHBoxLayout, QLabel, QLineEdit, QPushButton, QScrollArea,
                               QVBoxLayout, QWidget)

from fixbench.physics.ratings import parse_ratings
from fixbench.quantities import ReadingError, parse_quantity
from fixbench.store import bench_log
from fixbench.ui.bench.entry import CheckedField
from fixbench.ui.bench.family_choice import FamilyChoice
from fixbench.ui.bench.look import heading
from fixbench.ui.bench.records import IntakeForm

KINDS = ("phone charger", "USB wall adapter", "laptop adapter", "appliance adapter", "other")
# rating key -> (label, unit, placeholder, required)
RATING_FIELDS = (
    ("mains", "Mains input", "V", "230 V, 120 V or universal", True),
    ("bench_mains", "Bench mains (universal units)", "V", "230 V", False),
    ("output", "Output voltage", "V", "5 V", True),
    ("current", "Output current", "A", "2 A", True),
    ("bulk", "Bulk capacitor (if read)", "F", "22 uF", False),
)
_RATING_IN_MESSAGE = re.compile(r"rating '(\w+)'")


def _required(what: str):
    def check(text: str) -> str:
        if not text.strip():
            raise ValueError(f"{what} is needed")
        return text.strip()
    return check


def _rating_check(key: str, unit: str, required: bool):
    def check(text: str) -> str:
        text = text.strip()
        if not text:
            if required:
                raise ValueError("needed: type it as on the label, with its unit")
            return ""
        if key == "mains" and text.lower() in ("universal", "100-240 v", "100-240v", "100-240", "85-265", "90-264"):
            return text
        measured = parse_quantity(text, unit)
        if measured.over_range or measured.value <= 0:
            raise ReadingError(f"'{text}' must be a positive value in {unit}")
        return text
    return check


class IntakePanel(QWidget):
    def __init__(self, controller, parent=None) -> None:
        super().__init__(parent)
        self.controller = controller
        store = controller.context.store
        self.ticket = CheckedField("ticket reference, e.g. BW-2291", self._ticket_check)
        self.make = CheckedField("make", _required("the make"))
        self.model = CheckedField("model", _required("the model"))
        self.serial = CheckedField("serial (optional: links a unit that comes back)")
        self.kind = QComboBox()
        self.kind.addItems(KINDS)
        self.family = FamilyChoice(controller.context.knowledge)
        self.family.chosen.connect(self._family_chosen)
        self.ratings: dict[str, CheckedField] = {}
        for key, _label, unit, placeholder, required in RATING_FIELDS:
            self.ratings[key] = CheckedField(placeholder, _rating_check(key, unit, required))
        self.notes = QLineEdit()
        self.notes.setPlaceholderText("what the customer said, in their words")
        self.symptom_box = QGroupBox("Symptoms reported or seen (tick what applies; the rest is asked later)")
        self.symptom_layout = QGridLayout(self.symptom_box)
        self.symptoms: dict[str, QCheckBox] = {}
        self.filled_note = QLabel()
        self.message = QLabel()
        self.message.setWordWrap(True)

        self.known = {m.label.lower(): m for m in bench_log.known_models(store)}
        makes = sorted({m.make for m in self.known.values()})
        models = sorted({m.model for m in self.known.values()})
        self.make.edit.setCompleter(self._completer(makes))
        self.model.edit.setCompleter(self._completer(models))
        self.model.edit.editingFinished.connect(self._fill_from_history)

        unit_form = QFormLayout()
        for label, widget in (("Ticket", self.ticket), ("Make", self.make), ("Model", self.model),
                              ("Serial", self.serial), ("Kind", self.kind)):
            unit_form.addRow(label, widget)
        unit_form.addRow("", self.filled_note)
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

        self.order = [self.ticket, self.make, self.model, self.serial] + [self.ratings[k] for k, *_ in RATING_FIELDS]
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
        text = _required("a ticket reference")(text)
        if bench_log.ticket_taken(self.controller.context.store, text):
            raise ValueError(f"ticket {text} is already a case: open it from the list, or use another")
        return text

    def _advance(self, i: int) -> None:
        if i + 1 < len(self.order):
            self.order[i + 1].setFocus()
        else:
            self.submit()

    def _family_chosen(self, family_id: str) -> None:
        family = self.controller.context.knowledge.family(family_id)
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
        self.message.clear()
        self.known = {m.label.lower(): m for m in bench_log.known_models(self.controller.context.store)}
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
        ratings = {k: f.text().strip() for k, f in self.ratings.items() if f.text().strip()}
        if ok:
            if ratings.get("mains", "").lower() not in ("universal", "100-240 v", "100-240v", "100-240", "85-265", "90-264"):
                ratings.pop("bench_mains", None)  # only universal units are tested on a chosen mains
            try:
                parse_ratings(ratings)
            except ReadingError as err:
                match = _RATING_IN_MESSAGE.search(str(err))
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
                          self.notes.text().strip())

    def submit(self) -> None:
        form = self.form()
        if form is not None:
            self.controller.open_case(form)
