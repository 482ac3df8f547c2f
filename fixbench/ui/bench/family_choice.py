"""Choosing the supply family: each described in a few lines, and three yes/no questions about
what is on the board for someone who is not sure (they pick the family that fits)."""

from __future__ import annotations

from PySide6.QtCore import Signal
from PySide6.QtWidgets import (QButtonGroup, QComboBox, QFormLayout, QLabel, QRadioButton,
                               QVBoxLayout, QWidget)

QUESTIONS = (
    ("controller_8pin", "An 8-pin controller chip on the primary side?"),
    ("optocoupler", "An optocoupler (4-pin chip) bridging the isolation slot?"),
    ("tl431", "A TL431 (three-legged reference) near the output?"),
)
ANSWERS = ("not sure", "yes", "no")


def best_family(families, answers: dict[str, bool]) -> str | None:
    """The family whose board matches every answer given (None if none or no answer yet)."""
    if not answers:
        return None
    fitting = [f for f in families if all(f.identify.get(k, False) == v for k, v in answers.items())]
    return fitting[0].id if len(fitting) == 1 else None


class FamilyChoice(QWidget):
    chosen = Signal(str)

    def __init__(self, knowledge, parent=None) -> None:
        super().__init__(parent)
        self.families = list(knowledge.families.values())
        self.group = QButtonGroup(self)
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        self.buttons: dict[str, QRadioButton] = {}
        for family in self.families:
            button = QRadioButton(family.title)
            font = button.font()
            font.setBold(True)
            button.setFont(font)
            button.setToolTip(family.summary)
            about = QLabel(f"{family.summary}<br><i>Typical: {', '.join(family.examples)}</i>")
            about.setWordWrap(True)
            about.setIndent(22)
            layout.addWidget(button)
            layout.addWidget(about)
            self.group.addButton(button)
            self.buttons[family.id] = button
            button.toggled.connect(lambda on, fid=family.id: on and self.chosen.emit(fid))
        questions = QFormLayout()
        self.answers: dict[str, QComboBox] = {}
        for key, text in QUESTIONS:
            combo = QComboBox()
            combo.addItems(ANSWERS)
            combo.currentIndexChanged.connect(self._suggest)
            questions.addRow(text, combo)
            self.answers[key] = combo
        layout.addWidget(QLabel("<b>Not sure?</b> Answer what you can see on the board:"))
        layout.addLayout(questions)
        self.suggestion = QLabel()
        self.suggestion.setWordWrap(True)
        layout.addWidget(self.suggestion)
        self.message = QLabel()
        layout.addWidget(self.message)

    def family_id(self) -> str | None:
        for fid, button in self.buttons.items():
            if button.isChecked():
                return fid
        return None

    def select(self, family_id: str) -> None:
        if family_id in self.buttons:
            self.buttons[family_id].setChecked(True)

    def given_answers(self) -> dict[str, bool]:
        return {k: c.currentText() == "yes" for k, c in self.answers.items() if c.currentText() != "not sure"}

    def _suggest(self) -> None:
        answers = self.given_answers()
        fid = best_family(self.families, answers)
        if fid is not None:
            self.select(fid)
            title = self.buttons[fid].text()
            self.suggestion.setText(f"\u2192 That board fits: <b>{title}</b> (chosen above).")
        elif answers:
            self.suggestion.setText("No single family fits those answers yet: look again, or choose above.")
        else:
            self.suggestion.clear()

    def show_message(self, text: str) -> None:
        self.message.setText(f"\u26a0 {text}" if text else "")
