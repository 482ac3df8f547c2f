"""The bench's step card, used for practice: the one place practice meets the bench's widgets.

The card shows the chosen check as the bench does (power state, cautions, where, with what, what a
healthy unit shows, how). In practice the hidden unit gives the reading, so the typing field, the
outcome buttons and the bench's navigation are hidden and the card's keep button takes the check.
After the reading the card marks it healthy or not, with what a healthy unit reads beside it.
"""

from __future__ import annotations

from PySide6.QtCore import Signal
from PySide6.QtWidgets import QVBoxLayout, QWidget

from fixbench.engine.diagnosis import DiagnosisState
from fixbench.quantities import format_band
from fixbench.ui.bench.step_card import StepCard


class PracticeStep(QWidget):
    take_asked = Signal(str)  # check id

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.card = StepCard()
        for widget in (self.card.field, self.card.hint, self.card.skip_button, self.card.other_button,
                       self.card.undo_button, self.card.conclude_button, self.card.reason):
            widget.setVisible(False)
        self.card.record_button.setText("Take this check")
        self.card.record_button.setToolTip("The unit gives its reading; the minutes go on the clock")
        self.card.reading_typed.connect(lambda _text: self._take())
        self.check_id: str | None = None
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(self.card)

    def show_check(self, state: DiagnosisState, check_id: str) -> None:
        self.check_id = check_id
        self.card.show_step(state, state.proposal_for(check_id))
        self._hide_outcome_buttons()
        self.card.field.setVisible(False)
        self.card.record_button.setText(f"Take this check ({state.family.check(check_id).minutes:g} min)")
        self.card.show_mark(None, "")

    def show_reading(self, state: DiagnosisState) -> None:
        reading = state.readings[-1]
        proposal = state.proposal_for(reading.check)
        e = proposal.expected
        healthy = format_band(e.low, e.high, e.unit) if e is not None else proposal.expected_outcome or "-"
        self.card.show_mark(reading, healthy)
        # In the trade's words, as the debrief puts it.
        self.card.mark_label.setText(f"\u2714 {reading.shown()}: healthy" if reading.in_band else
                                     f"\u2716 {reading.shown()}: not healthy (a healthy unit: {healthy})")

    def set_enabled(self, on: bool) -> None:
        self.card.record_button.setEnabled(on and self.check_id is not None)

    def _hide_outcome_buttons(self) -> None:
        for i in range(self.card.outcomes.count()):
            widget = self.card.outcomes.itemAt(i).widget()
            if widget is not None:
                widget.setVisible(False)

    def _take(self) -> None:
        if self.check_id is not None:
            self.take_asked.emit(self.check_id)
