"""The history's filter panel: the owner picks dates, people, family, device, fault, part,
outcome, comebacks, a customer, text.

Renders the choices it is given and forwards one :class:`CaseFilter` whenever any of them changes
(typing is gathered for a moment first, so each keystroke does not start a query). Faults and
parts are offered by what they are in their family (one entry per title, standing for the
(family, id) pairs behind it); the date pickers open on the months the record holds.
"""

from __future__ import annotations

from datetime import date

from PySide6.QtCore import QDate, QEvent, QObject, QTimer, Signal
from PySide6.QtWidgets import (QComboBox, QDateEdit, QFormLayout, QLineEdit, QPushButton,
                               QVBoxLayout, QWidget)

from fixbench.workflows.review import CaseFilter, FilterChoices
from fixbench.workflows.trade_names import TradeNames, family_name, outcome_name

NO_DATE = QDate(2000, 1, 1)  # the date edit's minimum, shown as "any day"
TYPING_PAUSE_MS = 300
RETURN_WORDS = (("Came back under warranty", "came_back"), ("Warranty returns", "is_return"))


class _CalendarPage(QObject):
    """Turns a date picker's calendar to a chosen month each time it pops up on "any day"
    (else it would open at the picker's minimum, January 2000)."""

    def __init__(self, edit: QDateEdit) -> None:
        super().__init__(edit)
        self.edit, self.month = edit, None
        self.calendar = edit.calendarWidget()
        self.calendar.window().installEventFilter(self)  # the pop-up the calendar sits in

    def eventFilter(self, watched, event) -> bool:
        if event.type() == QEvent.Type.Show and self.month is not None \
                and self.edit.date() == NO_DATE:
            self.calendar.setCurrentPage(*self.month)
        return False


def _pairs_key(pairs) -> str:
    # Combo data as plain text: Qt compares strings reliably, Python tuples it does not.
    return "|".join(f"{family}:{ident}" for family, ident in sorted(pairs))


def _pairs_of(key: str | None):
    if not key:
        return None
    return tuple(tuple(item.split(":", 1)) for item in key.split("|"))


class FiltersPanel(QWidget):
    changed = Signal(object)  # CaseFilter

    def __init__(self, names: TradeNames, parent=None) -> None:
        super().__init__(parent)
        self.names = names
        self.customer_names: dict[int, str] = {}
        self.since, self.until = self._date_edit("Opened on or after"), self._date_edit("Opened on or before")
        self.technician, self.family = QComboBox(), QComboBox()
        self.device, self.fault, self.part, self.outcome = (QComboBox(), QComboBox(), QComboBox(),
                                                           QComboBox())
        self.returns, self.customer = QComboBox(), QComboBox()
        self.returns.addItem("Any job", None)
        for words, value in RETURN_WORDS:
            self.returns.addItem(words, value)
        self.customer.addItem("Any customer", None)
        self.text = QLineEdit(placeholderText="ticket, customer, notes, make...")
        self.pages = {edit: _CalendarPage(edit) for edit in (self.since, self.until)}
        self.text.setClearButtonEnabled(True)
        self.clear = QPushButton("&Clear filters")
        form = QFormLayout()
        form.setFieldGrowthPolicy(QFormLayout.FieldGrowthPolicy.AllNonFixedFieldsGrow)
        for label, widget in (("&From", self.since), ("&To", self.until),
                              ("Tech&nician", self.technician), ("Fa&mily", self.family),
                              ("&Device", self.device), ("F&ault", self.fault),
                              ("&Part", self.part), ("Out&come", self.outcome),
                              ("Ret&urns", self.returns), ("Cust&omer", self.customer),
                              ("&Search", self.text)):
            form.addRow(label, widget)
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addLayout(form)
        layout.addWidget(self.clear)
        layout.addStretch(1)
        self._typing = QTimer(self, singleShot=True, interval=TYPING_PAUSE_MS)
        self._typing.timeout.connect(self._emit)
        self.text.textChanged.connect(self._typing.start)
        for combo in (self.technician, self.family, self.device, self.fault, self.part,
                      self.outcome, self.returns, self.customer):
            combo.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
            combo.setMinimumContentsLength(14)
            combo.currentIndexChanged.connect(self._emit)
        for edit in (self.since, self.until):
            edit.dateChanged.connect(self._emit)
        self.clear.clicked.connect(lambda: self.show_filter(CaseFilter(), emit=True))

    def _date_edit(self, tip: str) -> QDateEdit:
        edit = QDateEdit(calendarPopup=True, displayFormat="yyyy-MM-dd")
        edit.setMinimumDate(NO_DATE)
        edit.setSpecialValueText("any day")
        edit.setDate(NO_DATE)
        edit.setToolTip(tip + " (set to the earliest date for any day)")
        return edit

    def set_choices(self, choices: FilterChoices) -> None:
        """Fill the lists from what the record holds, keeping the current filter."""
        current = self.current()
        self._fill(self.technician, "Everyone", [(name, pid) for pid, name in choices.technicians])
        self._fill(self.family, "Any family", [(family_name(f), f) for f in choices.families])
        makes = sorted({make for make, _ in choices.devices})
        devices = [(f"{make} (any model)", _device_key(make, None)) for make in makes]
        devices += [(f"{make} {model}", _device_key(make, model)) for make, model in choices.devices]
        self._fill(self.device, "Any device", sorted(devices))
        self._fill(self.fault, "Any fault", self._by_title(choices.faults, self.names.fault_label))
        self._fill(self.part, "Any part", self._by_title(choices.parts, self.names.part_label))
        self._fill(self.outcome, "Any outcome", [(outcome_name(o), o) for o in choices.outcomes])
        for edit, moment in ((self.since, choices.first_opened), (self.until, choices.last_opened)):
            self.pages[edit].month = None if moment is None else (moment.year, moment.month)
            if moment is not None:
                edit.setMaximumDate(QDate(choices.last_opened.year, choices.last_opened.month,
                                          choices.last_opened.day).addYears(1))
        self.show_filter(current, emit=False)

    @staticmethod
    def _by_title(pairs, label) -> list[tuple[str, str]]:
        """One entry per title: a fault or part is what it is in its family."""
        titles: dict[str, list[tuple[str, str]]] = {}
        for family, ident in pairs:
            titles.setdefault(label(ident, family), []).append((family, ident))
        return sorted((title, _pairs_key(keys)) for title, keys in titles.items())

    @staticmethod
    def _fill(combo: QComboBox, anything: str, items: list[tuple[str, object]]) -> None:
        combo.blockSignals(True)
        combo.clear()
        combo.addItem(anything, None)
        for label, value in items:
            combo.addItem(label, value)
        combo.blockSignals(False)

    def current(self) -> CaseFilter:
        device = _device_of(self.device.currentData())
        return CaseFilter(since=_day(self.since), until=_day(self.until),
                          technician_id=self.technician.currentData(),
                          family=self.family.currentData(), make=device[0], model=device[1],
                          fault=_pairs_of(self.fault.currentData()),
                          part=_pairs_of(self.part.currentData()),
                          outcome=self.outcome.currentData(),
                          customer_id=self.customer.currentData(),
                          returns=self.returns.currentData(), text=self.text.text().strip())

    def show_filter(self, case_filter: CaseFilter, emit: bool) -> None:
        """Set every widget to ``case_filter``; values the lists do not hold are added to them."""
        widgets = (self.since, self.until, self.technician, self.family, self.device, self.fault,
                   self.part, self.outcome, self.returns, self.customer, self.text)
        for widget in widgets:
            widget.blockSignals(True)
        for edit, day in ((self.since, case_filter.since), (self.until, case_filter.until)):
            edit.setDate(NO_DATE if day is None else QDate(day.year, day.month, day.day))
        device = None if case_filter.make is None else _device_key(case_filter.make, case_filter.model)
        fault = None if case_filter.fault is None else _pairs_key(case_filter.fault)
        part = None if case_filter.part is None else _pairs_key(case_filter.part)
        for combo, value in ((self.technician, case_filter.technician_id),
                             (self.family, case_filter.family), (self.device, device),
                             (self.fault, fault), (self.part, part),
                             (self.outcome, case_filter.outcome),
                             (self.returns, case_filter.returns),
                             (self.customer, case_filter.customer_id)):
            index = combo.findData(value)
            if index < 0:
                combo.addItem(self._unlisted(combo, value), value)
                index = combo.count() - 1
            combo.setCurrentIndex(index)
        self.text.setText(case_filter.text)
        for widget in widgets:
            widget.blockSignals(False)
        if emit:
            self._emit()

    def _unlisted(self, combo: QComboBox, value) -> str:
        """A name for a value the list does not hold yet (a filter set from a figure or a case)."""
        if value is None:
            return "Any"
        if combo is self.device:
            return " ".join(str(v) for v in _device_of(value) if v)
        if combo in (self.fault, self.part):
            label = self.names.fault_label if combo is self.fault else self.names.part_label
            return " or ".join(sorted({label(ident, family) for family, ident in _pairs_of(value)}))
        if combo is self.customer:
            return self.customer_names.get(value, "this customer")
        return str(value)

    def name_customer(self, customer_id: int, name: str) -> None:
        """The name to show when the list is set to one customer's jobs."""
        self.customer_names[customer_id] = name

    def _emit(self) -> None:
        self.changed.emit(self.current())


def _day(edit: QDateEdit) -> date | None:
    chosen = edit.date()
    if chosen == NO_DATE:
        return None
    return date(chosen.year(), chosen.month(), chosen.day())


def _device_key(make: str, model: str | None) -> str:
    # Combo data as plain text: Qt compares strings reliably, Python tuples it does not.
    return f"{make}\t{model or ''}"


def _device_of(key: str | None) -> tuple[str | None, str | None]:
    if not key:
        return None, None
    make, model = key.split("\t", 1)
    return make, model or None
