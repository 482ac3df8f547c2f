"""The colleague's shout: a slip stops the round where it happens until the trainee has read why.

Shown over the step card, in the suspect hue, with what was done, why it is dangerous, and one
button to carry on; the round takes no check while it is up. A repeat of the same mistake is
shouted again, and says it is not counted again.
"""

from __future__ import annotations

from PySide6.QtWidgets import QHBoxLayout, QLabel, QPushButton, QVBoxLayout

from fixbench.practice.safety import Slip
from fixbench.ui.bench.look import SUSPECT_HUE, banner, paint_banner


class SlipAlert:
    """Builds the banner; the round view owns it."""

    def __init__(self) -> None:
        self.frame = banner(SUSPECT_HUE)
        self.shout = QLabel()
        self.shout.setWordWrap(True)
        self.why = QLabel()
        self.why.setWordWrap(True)
        self.carry_on = QPushButton("Understood: carry on")
        layout = QVBoxLayout(self.frame)
        layout.addWidget(self.shout)
        layout.addWidget(self.why)
        row = QHBoxLayout()
        row.addStretch(1)
        row.addWidget(self.carry_on)
        layout.addLayout(row)
        self.frame.setVisible(False)

    def show_slip(self, slip: Slip, counted: bool) -> None:
        paint_banner(self.frame, SUSPECT_HUE, 0.35)
        stopped = " The check was not taken." if slip.stopped else ""
        again = "" if counted else " The same mistake again: it counts once, but the colleague still shouts."
        self.shout.setText(f"<b>\u26a0 {slip.shout}</b>{stopped}{again}")
        self.why.setText(f"Why: {slip.why}")
        self.frame.setVisible(True)
        self.carry_on.setFocus()

    def hide(self) -> None:
        self.frame.setVisible(False)

    def text(self) -> str:
        return f"{self.shout.text()} {self.why.text()}"

