"""Before power is ever applied: the cautions of this case, read and acknowledged once.

The texts are the engine's own (fixbench.engine.cautions); they come back on every live step card.
"""

from __future__ import annotations

from PySide6.QtCore import Signal
from PySide6.QtWidgets import QCheckBox, QHBoxLayout, QLabel, QPushButton, QVBoxLayout, QWidget

from fixbench.engine import cautions
from fixbench.ui.bench.look import CAUTION_HUE, banner, bind_keys, heading, scaled_font

ISOLATION = ("Use an isolation transformer between the wall and the unit for every live step, and "
             "keep a series lamp in line until a short on the primary has been ruled out.")
OWN_JUDGEMENT = ("fixbench suggests steps; it does not supervise them. Your local electrical rules, "
                 "your shop's procedures and a licensed technician's judgement come first; where "
                 "they differ from this screen, follow them.")


class CautionsPanel(QWidget):
    ticket_wanted = Signal()  # print the intake ticket of the case just opened

    def __init__(self, controller, parent=None) -> None:
        super().__init__(parent)
        self.controller = controller
        box = banner(CAUTION_HUE)
        box_layout = QVBoxLayout(box)
        box_layout.addWidget(heading("Before this unit is powered", factor=1.35))
        self.items = []
        for title, text in (("Mains", cautions.MAINS), ("Charged bulk capacitor", cautions.BULK),
                            ("Isolation transformer and series lamp", ISOLATION + " " + cautions.LAMP),
                            ("Scope ground", cautions.SCOPE)):
            label = QLabel(f"<b>\u26a0 {title}.</b> {text}")
            label.setFont(scaled_font(label, 1.15))
            label.setWordWrap(True)
            box_layout.addWidget(label)
            self.items.append(label)
        judgement = QLabel(OWN_JUDGEMENT)
        judgement.setFont(scaled_font(judgement, 1.1, bold=True))
        judgement.setWordWrap(True)
        box_layout.addWidget(judgement)
        self.confirm = QCheckBox("I have read these cautions and the bench is set up for them")
        self.accept_button = QPushButton("Start the guided checks")
        self.accept_button.setToolTip("Tick the box (Space), then Enter")
        self.accept_button.setDefault(True)
        self.accept_button.setAutoDefault(True)
        self.message = QLabel()
        self.accept_button.setText("Start the guided checks (Enter)")
        self.back_button = QPushButton("Back to open cases (Esc)")
        self.ticket_button = QPushButton("Print the intake ticket (Ctrl+P)")
        self.ticket_button.setToolTip("A label for the unit: ticket, unit, complaint, date and a "
                                      "code the bench scans to open the case")
        self.ticket_button.setAutoDefault(False)
        self.ticket_button.clicked.connect(self.ticket_wanted)
        bind_keys(self.ticket_button, "Ctrl+P")
        self.confirm.setFont(scaled_font(self.confirm, 1.15))
        buttons = QHBoxLayout()
        buttons.addWidget(self.accept_button)
        buttons.addWidget(self.back_button)
        buttons.addStretch(1)
        buttons.addWidget(self.ticket_button)
        layout = QVBoxLayout(self)
        layout.addWidget(box)
        layout.addWidget(self.confirm)
        layout.addWidget(self.message)
        layout.addLayout(buttons)
        layout.addStretch(1)
        self.setFocusProxy(self.confirm)
        self.accept_button.clicked.connect(self.accept)
        self.back_button.clicked.connect(controller.back_to_cases)
        self.confirm.toggled.connect(lambda _on: self.message.clear())

    def show_view(self, view) -> None:
        self.confirm.setChecked(False)
        self.message.clear()

    def accept(self) -> None:
        if not self.confirm.isChecked():
            self.message.setText("\u26a0 Tick the box first: the cautions are acknowledged once per case.")
            return
        self.controller.acknowledge_cautions()

    def keyPressEvent(self, event) -> None:  # noqa: N802 (Qt name)
        from PySide6.QtCore import Qt

        if event.key() in (Qt.Key.Key_Return, Qt.Key.Key_Enter):
            self.accept()
            return
        if event.key() == Qt.Key.Key_Escape:
            self.controller.back_to_cases()
            return
        super().keyPressEvent(event)
