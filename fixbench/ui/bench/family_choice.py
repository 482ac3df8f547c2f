"""Choosing the supply family: each described in a few lines, and the knowledge base's questions
about what is on the board for someone who is not sure (they pick the family that fits, or say
which come closest and why: fixbench.knowledge.identify)."""

from __future__ import annotations

from PySide6.QtCore import Qt, Signal
from PySide6.QtWidgets import (QButtonGroup, QComboBox, QFormLayout, QLabel, QRadioButton,
                               QVBoxLayout, QWidget)

from fixbench.knowledge.identify import identify

NOT_SURE = "not sure"


class FamilyChoice(QWidget):
    chosen = Signal(str)

    def __init__(self, knowledge, parent=None) -> None:
        super().__init__(parent)
        self.families = list(knowledge.families.values())
        self.questions = knowledge.questions
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
        for question in self.questions:
            combo = QComboBox()
            combo.addItem(NOT_SURE, None)
            for answer in question.answers:
                combo.addItem(answer.text, answer.id)
            combo.currentIndexChanged.connect(self._suggest)
            questions.addRow(question.text, combo)
            self.answers[question.id] = combo
        layout.addWidget(QLabel("<b>Not sure?</b> Answer what you can see on the board:"))
        layout.addLayout(questions)
        self.suggestion = QLabel()
        self.suggestion.setTextFormat(Qt.TextFormat.PlainText)
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

    def given_answers(self) -> dict[str, str]:
        return {k: c.currentData() for k, c in self.answers.items() if c.currentData() is not None}

    def _suggest(self) -> None:
        found = identify(self.families, self.questions, self.given_answers())
        if found.family is not None:
            self.select(found.family.id)
        self.suggestion.setText(found.describe())

    def show_message(self, text: str) -> None:
        self.message.setText(f"\u26a0 {text}" if text else "")
