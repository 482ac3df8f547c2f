"""One step card: what to measure, where, with what, unplugged or live, the value a healthy unit
shows, how, the cautions, and the big field the reading is typed into.

The card renders a Proposal and forwards what the technician does; the controller decides.
"""

from __future__ import annotations

from PySide6.QtCore import QEvent, Qt, Signal
from PySide6.QtGui import QKeySequence
from PySide6.QtWidgets import (QGridLayout, QHBoxLayout, QLabel, QPushButton, QVBoxLayout,
                               QWidget)

from fixbench.workflows import step_wording as wording
from fixbench.ui.bench.board_part import BoardPartStrip
from fixbench.ui.bench.entry import CheckedField
from fixbench.ui.bench.look import (BIG, CAUTION_HUE, GOOD_HUE, LARGE, SUSPECT_HUE, banner, bind_keys,
                                    heading, paint_banner, scaled_font)

OUTCOME_WORDS = {"bright": "steady bright", "flash": "flash, then dim or dark", "no_flash": "no flash at all",
                 "cycling": "ticking / cycling", "steady": "steady"}


class StepCard(QWidget):
    reading_typed = Signal(str)  # Enter on the field
    skip_asked = Signal()
    other_check_asked = Signal()
    undo_asked = Signal()
    conclude_asked = Signal()

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.power_strip = banner(CAUTION_HUE)
        strip = QVBoxLayout(self.power_strip)
        self.power_label = heading("", factor=1.15)
        self.caution_label = QLabel()
        self.caution_label.setWordWrap(True)
        strip.addWidget(self.power_label)
        strip.addWidget(self.caution_label)

        self.title = heading("", factor=LARGE)
        self.board = BoardPartStrip()  # the part on the board in hand, and its photo
        self.where = QLabel()
        self.where.setWordWrap(True)
        self.instrument = QLabel()
        self.instrument.setWordWrap(True)
        self.expected = QLabel()
        self.expected.setFont(scaled_font(self.expected, BIG, bold=True))
        self.band = QLabel()
        self.how = QLabel()
        self.how.setWordWrap(True)
        self.reason = QLabel()
        self.reason.setEnabled(False)  # shown in the palette's disabled text: secondary information

        self.field = CheckedField("type the reading and press Enter", big=BIG)
        self.field.edit.setToolTip("Type what the meter shows: 325 V, 4k7, 0R47, 22 uF, OL; "
                                   "'3,3' is refused: use a point. Enter keeps it, Esc clears.")
        self.field.escaped.connect(lambda: self.field.set_text(""))
        self.field.edit.returnPressed.disconnect()
        self.field.edit.returnPressed.connect(lambda: self.reading_typed.emit(self.field.text()))
        self.hint = QLabel()
        self.hint.setEnabled(False)
        self.outcomes = QHBoxLayout()

        self.mark = banner(GOOD_HUE)
        mark_layout = QVBoxLayout(self.mark)
        self.mark_label = QLabel()
        self.mark_label.setFont(scaled_font(self.mark_label, 1.15, bold=True))
        self.mark_label.setWordWrap(True)
        mark_layout.addWidget(self.mark_label)
        self.mark.setVisible(False)

        self.record_button = QPushButton("Keep reading (Enter)")
        self.record_button.setToolTip("Keep the reading (Enter in the field)")
        self.record_button.clicked.connect(lambda: self.reading_typed.emit(self.field.text()))
        self.skip_button = QPushButton("Cannot measure (Alt+C)")
        self.skip_button.setToolTip("Skip this step: it cannot be measured on this unit")
        self.skip_button.clicked.connect(self.skip_asked)
        self.other_button = QPushButton("Other check\u2026 (Ctrl+F)")
        self.other_button.setToolTip("Take any other check from a searchable list")
        self.other_button.clicked.connect(self.other_check_asked)
        self.undo_button = QPushButton("Undo last (Ctrl+Z)")
        self.undo_button.setToolTip("Take back the last reading")
        self.undo_button.clicked.connect(self.undo_asked)
        self.conclude_button = QPushButton("Conclusion and repair (Alt+R)")
        self.conclude_button.setToolTip("Stop measuring and go to the parts to replace")
        self.conclude_button.clicked.connect(self.conclude_asked)
        bind_keys(self.skip_button, "Alt+C")
        bind_keys(self.other_button, "Ctrl+F", "Alt+O")
        bind_keys(self.undo_button, "Ctrl+Z", "Alt+U")
        bind_keys(self.conclude_button, "Alt+R")
        self.field.edit.installEventFilter(self)

        details = QGridLayout()
        details.setColumnStretch(1, 1)
        self.row_labels: list[QLabel] = []
        for row, (name, widget) in enumerate((("Where", self.where), ("With", self.instrument),
                                              ("How", self.how))):
            label = QLabel(f"<b>{name}</b>")
            label.setAlignment(Qt.AlignmentFlag.AlignTop)
            details.addWidget(label, row, 0)
            details.addWidget(widget, row, 1)
            self.row_labels.append(label)
        expect_box = QVBoxLayout()
        expect_box.setSpacing(0)
        self.expect_caption = QLabel("A healthy unit shows")
        expect_box.addWidget(self.expect_caption)
        expect_box.addWidget(self.expected)
        expect_box.addWidget(self.band)
        buttons = QHBoxLayout()
        for b in (self.record_button, self.skip_button, self.other_button, self.undo_button):
            buttons.addWidget(b)
        buttons.addStretch(1)
        buttons.addWidget(self.conclude_button)

        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(self.power_strip)
        layout.addWidget(self.title)
        layout.addWidget(self.board)
        layout.addLayout(details)
        layout.addLayout(expect_box)
        layout.addWidget(self.field)
        layout.addWidget(self.hint)
        layout.addLayout(self.outcomes)
        layout.addLayout(buttons)
        layout.addWidget(self.mark)
        layout.addWidget(self.reason)
        layout.addStretch(1)
        self.setFocusProxy(self.field)

    def eventFilter(self, watched, event) -> bool:  # noqa: N802 (Qt name)
        # An empty field has no typing to undo: let Ctrl+Z reach "undo last reading".
        if (watched is self.field.edit and event.type() == QEvent.Type.ShortcutOverride
                and event.matches(QKeySequence.StandardKey.Undo) and not self.field.edit.text()):
            return True
        return super().eventFilter(watched, event)

    # --- rendering ---------------------------------------------------------------------------------

    def _label_rows(self, names: tuple[str, str, str], expecting: bool) -> None:
        for label, name in zip(self.row_labels, names):
            label.setText(f"<b>{name}</b>" if name else "")
        self.expect_caption.setVisible(expecting)

    def show_step(self, state, proposal) -> None:
        check, family = proposal.check, state.family
        self._label_rows(("Where", "With", "How"), True)
        powered = check.power in wording.POWERED
        self.power_label.setText(wording.POWER_WORDS[check.power])
        self.caution_label.setText("\n".join(f"\u26a0 {c}" for c in proposal.cautions))
        self.power_strip.setVisible(bool(proposal.cautions) or powered)
        paint_banner(self.power_strip, SUSPECT_HUE if powered else CAUTION_HUE, 0.3 if powered else 0.2)
        self.title.setText(proposal.title)
        self.where.setText(wording.point_words(family, check).split(": ", 1)[-1] or "nothing to probe")
        e = proposal.expected
        rng = wording.meter_range(check.instrument, check.unit, e and e.low, e and e.high, e and e.nominal)
        instrument = wording.INSTRUMENT_WORDS.get(check.instrument, check.instrument)
        self.instrument.setText(f"{instrument}{', ' + rng if rng else ''}  \u00b7  about {proposal.minutes:g} min")
        big, band = wording.expected_words(proposal)
        self.expected.setText(OUTCOME_WORDS.get(big, big))
        self.band.setText(band)
        self.how.setText(proposal.how)
        self.reason.setText(f"Why this step: {proposal.reason}")
        self.hint.setText(wording.entry_hint(check))
        self._set_outcomes(wording.outcome_names(state, check.id) if check.unit is None else ())
        self.field.set_text("")
        for w in (self.field, self.record_button, self.skip_button, self.other_button):
            w.setEnabled(True)
        self.undo_button.setEnabled(bool(state.readings))

    def show_done(self, state, conclusion) -> None:
        self.power_strip.setVisible(False)
        self.board.show_part(None, "", None)
        self.title.setText("The checks are done: the conclusion is ready")
        self._label_rows(("Found", "Next", ""), False)
        top = state.suspects[0] if state.suspects else None
        self.where.setText(f"Most likely: {top.title} ({top.label or 'no part'}, {top.probability:.0%})"
                           if top else "-")
        self.instrument.setText("Press Alt+R for the parts to replace, or Ctrl+F to measure more.")
        self.expected.setText("")
        self.band.setText("")
        self.how.setText("")
        self.hint.setText("")
        self.reason.setText("")
        self._set_outcomes(())
        self.field.set_text("")
        for w in (self.field, self.record_button, self.skip_button):
            w.setEnabled(False)

    def _set_outcomes(self, names: tuple[str, ...]) -> None:
        while self.outcomes.count():
            item = self.outcomes.takeAt(0)
            if item.widget() is not None:
                item.widget().hide()  # gone from this frame, not only once the deletion runs
                item.widget().deleteLater()
        for name in names:
            button = QPushButton(OUTCOME_WORDS.get(name, name))
            button.setToolTip(f"Or type '{name}' and press Enter")
            button.setFocusPolicy(Qt.FocusPolicy.NoFocus)  # Tab goes field -> buttons below
            button.clicked.connect(lambda _=False, n=name: self.reading_typed.emit(n))
            self.outcomes.addWidget(button)
        if names:
            self.outcomes.addStretch(1)

    def show_mark(self, reading, expected_text: str) -> None:
        """Mark the reading just kept: in band, or out of band with the healthy band beside it."""
        if reading is None:
            self.mark.setVisible(False)
            return
        if reading.in_band:
            text, hue = f"\u2714 {reading.shown()}: in band", GOOD_HUE
        elif reading.value is not None:
            text, hue = f"\u2716 {reading.shown()}: OUT OF BAND (healthy {expected_text})", SUSPECT_HUE
        else:
            text, hue = f"\u2716 {reading.shown()}: not what a healthy unit gives ({expected_text})", SUSPECT_HUE
        self.mark_label.setText(text)
        paint_banner(self.mark, hue)
        self.mark.setVisible(True)

    def refuse(self, message: str) -> None:
        self.field.show_message(message)
