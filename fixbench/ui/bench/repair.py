"""Conclusion and repair: the parts to replace, the parts to test before power-up, and the record of
what was replaced (part, value fitted, cost) or tested (part, passed or failed)."""

from __future__ import annotations

import html

from PySide6.QtWidgets import (QComboBox, QFormLayout, QHBoxLayout, QLabel, QListWidget, QPushButton,
                               QVBoxLayout, QWidget)
from PySide6.QtCore import Qt

from fixbench.ui.bench.entry import CheckedField
from fixbench.ui.bench.look import CAUTION_HUE, banner, bind_keys, heading

MAX_COST = 100_000.0  # a parts cost above this for one supply is a typing slip


def parse_cost(text: str) -> int:
    """Cost in the shop's currency, typed '1.20' or '0' (blank is 0); returns cents."""
    text = text.strip()
    if not text:
        return 0
    if "," in text and "." not in text:
        raise ValueError(f"'{text}': use a point for decimals, for example {text.replace(',', '.')}")
    try:
        value = float(text)
    except ValueError:
        raise ValueError(f"'{text}' is not an amount: type it like 1.20") from None
    if value < 0 or value != value:
        raise ValueError("a cost cannot be negative")
    if value > MAX_COST:
        raise ValueError(f"{value:g} is more than a supply's parts can cost: check the amount")
    return round(value * 100)


def repair_line(repair, label: str | None = None) -> str:
    """One kept repair line as the list shows it: "C2 replaced  22 uF 50 V  cost 0.45"."""
    done = repair.action
    if repair.test_passed is not None:
        done += ": passed" if repair.test_passed else ": failed"
    details = [text for text in (repair.value_fitted, repair.note) if text]
    return "  ".join([f"{label or repair.part_id} {done}", *details, f"cost {repair.cost_cents / 100:.2f}"])


class RepairPanel(QWidget):
    def __init__(self, controller, parent=None) -> None:
        super().__init__(parent)
        self.controller = controller
        self.verdict = heading("", factor=1.35)
        self.replace_label = QLabel()
        self.replace_label.setWordWrap(True)
        self.test_box = banner(CAUTION_HUE)
        test_layout = QVBoxLayout(self.test_box)
        self.test_label = QLabel()
        self.test_label.setWordWrap(True)
        test_layout.addWidget(self.test_label)
        self.part = QComboBox()
        self.action = QComboBox()
        self.action.addItems(("replaced", "tested"))
        self.action.setToolTip("Replaced, or tested before power-up (type r or t)")
        # No result is chosen until the technician chooses one: a default "passed" could be kept
        # for a part that failed.
        self.result = QComboBox()
        self.result.addItem("passed", True)
        self.result.addItem("failed", False)
        self.result.setPlaceholderText("passed or failed? (type p or f)")
        self.result.setToolTip("The result of the test before power-up (type p or f)")
        self.result_message = QLabel()
        self.result_message.setWordWrap(True)
        self.result_message.setVisible(False)
        result_box = QVBoxLayout()
        result_box.setContentsMargins(0, 0, 0, 0)
        result_box.addWidget(self.result)
        result_box.addWidget(self.result_message)
        self.value = CheckedField("value fitted, e.g. 22 uF 400 V or the part number")
        self.cost = CheckedField("parts cost, e.g. 1.20", parse_cost)
        self.record_button = QPushButton("Keep this repair line (Enter in Cost, or Alt+K)")
        self.record_button.setToolTip("Keep the part line")
        bind_keys(self.record_button, "Alt+K")
        self.done_list = QListWidget()
        self.done_list.setFocusPolicy(Qt.FocusPolicy.NoFocus)
        self.back_button = QPushButton("Back to the checks (Alt+B)")
        self.back_button.setToolTip("Measure more before repairing")
        bind_keys(self.back_button, "Alt+B")
        self.verify_button = QPushButton("Go to verification (Alt+V)")
        self.verify_button.setToolTip("The repair is done: prove it with the readings")
        bind_keys(self.verify_button, "Alt+V")
        form = QFormLayout()
        form.addRow("Part", self.part)
        form.addRow("Action", self.action)
        form.addRow("Test result", result_box)
        form.addRow("Value fitted", self.value)
        form.addRow("Cost", self.cost)
        buttons = QHBoxLayout()
        buttons.addWidget(self.back_button)
        buttons.addStretch(1)
        buttons.addWidget(self.verify_button)
        layout = QVBoxLayout(self)
        layout.addWidget(self.verdict)
        layout.addWidget(self.replace_label)
        layout.addWidget(self.test_box)
        layout.addWidget(heading("What was done", factor=1.15))
        layout.addLayout(form)
        layout.addWidget(self.record_button)
        layout.addWidget(self.done_list, 1)
        layout.addLayout(buttons)
        self.record_button.clicked.connect(self.record)
        self.cost.accepted.connect(lambda _v: self.record())
        self.value.accepted.connect(lambda _v: self.cost.setFocus())
        self.back_button.clicked.connect(controller.back_to_checks)
        self.verify_button.clicked.connect(controller.go_verify)
        for field in (self.value, self.cost):
            field.escaped.connect(controller.back_to_checks)
        self.action.currentTextChanged.connect(self._action_chosen)
        self.result.currentIndexChanged.connect(
            lambda _index: self.result_message.setVisible(False))
        chain = (self.part, self.action, self.result, self.value, self.cost, self.record_button)
        for before, after in zip(chain, chain[1:]):
            QWidget.setTabOrder(before, after)
        self._action_chosen(self.action.currentText())

    def _action_chosen(self, action: str) -> None:
        """A tested part takes a result and no value; a replaced part a value and no result."""
        tested = action == "tested"
        self.result.setEnabled(tested)
        self.result.setCurrentIndex(-1)
        self.result_message.setVisible(False)
        self.value.setEnabled(not tested)
        self.setFocusProxy(self.result if tested else self.value)

    def show_view(self, view) -> None:
        if view.case is None or view.state is None:
            return
        family, c = view.state.family, view.conclusion
        if c is not None:
            names = [family.fault(f).title if f in {x.id for x in family.faults} else "no fault in the supply"
                     for f in c.faults]
            sure = "" if c.certain else " (not certain: try the parts in the order below)"
            self.verdict.setText(f"Likely fault: {', '.join(names)}  \u2014 {c.probability:.0%}{sure}")
            self.replace_label.setText("<b>Replace:</b> " + ("".join(
                f"<br>\u2022 <b>{html.escape(a.label)}</b> {html.escape(a.title)}: buy "
                f"{html.escape(a.spec)}" for a in c.replace)
                or "nothing: no failed part found") +
                ("<br><b>Try in this order:</b> " + ", ".join(family.part(s.part).label for s in c.repair_order)
                 if c.repair_order else ""))
            tests = "; ".join(f"{a.label} {a.title} ({a.probability:.0%} likely {a.mode})" for a in c.test_before_power)
            self.test_label.setText(f"<b>Test before power-up:</b> {tests}<br>Discharge the bulk capacitor "
                                    "and confirm it reads under 5 V before touching the primary.")
            self.test_box.setVisible(bool(tests))
        current = self.part.currentData()
        self.part.clear()
        suggested = [a.part for a in (c.replace + c.test_before_power)] if c else []
        for part in sorted(family.parts, key=lambda p: (p.id not in suggested, suggested.index(p.id) if p.id in suggested else 0, p.id)):
            self.part.addItem(f"{part.label}  {part.title}{'  (suggested)' if part.id in suggested else ''}", part.id)
        if current:
            self.part.setCurrentIndex(max(0, self.part.findData(current)))
        self.done_list.clear()
        for r in view.repairs:
            known = {p.id for p in family.parts}
            self.done_list.addItem(repair_line(r, family.part(r.part_id).label if r.part_id in known else None))
        self.verify_button.setEnabled(bool(view.repairs) or (c is not None and c.no_fault))

    def record(self) -> None:
        tested = self.action.currentText() == "tested"
        if tested and self.result.currentIndex() < 0:
            self.result_message.setText("\u26a0 Choose whether the part passed or failed its test "
                                        "(p or f in Test result).")
            self.result_message.setVisible(True)
            self.result.setFocus()
            return
        try:
            cents = self.cost.value()
        except ValueError:
            return
        self.controller.record_repair(self.part.currentData(), self.action.currentText(),
                                      "" if tested else self.value.text(),
                                      self.result.currentData() if tested else None, cents)
        self.value.set_text("")
        self.cost.set_text("")
        if tested:
            self.result.setCurrentIndex(-1)
            self.part.setFocus()  # each test is of another part
        else:
            self.value.setFocus()
