"""Putting right the label ratings of a kept case that cannot be resumed as they are (an output
below what its family's reference regulates, kept before ratings were checked against the family).

The fields are the intake's, filled with what was kept; the dialog returns the corrected ratings
and the controller keeps them and resumes the case, or says beside the fields why not.
"""

from __future__ import annotations

from PySide6.QtWidgets import QDialog, QDialogButtonBox, QFormLayout, QLabel, QVBoxLayout, QWidget

from fixbench.ui.bench.entry import CheckedField
from fixbench.ui.bench.intake import RATING_IN_MESSAGE, RATING_FIELDS, rating_check
from fixbench.workflows.intake import label_ratings


class RatingsDialog(QDialog):
    def __init__(self, ticket: str, ratings: dict[str, str], problem: str,
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setWindowTitle(f"Label ratings of {ticket}")
        self.problem = QLabel(f"\u26a0 {problem}")
        self.problem.setWordWrap(True)
        self.fields: dict[str, CheckedField] = {}
        form = QFormLayout()
        for key, label, unit, placeholder, required in RATING_FIELDS:
            field = CheckedField(placeholder, rating_check(key, required))
            field.set_text(ratings.get(key, ""))
            self.fields[key] = field
            form.addRow(f"{label} ({unit})", field)
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok
                                   | QDialogButtonBox.StandardButton.Cancel)
        buttons.button(QDialogButtonBox.StandardButton.Ok).setText("Keep and resume")
        buttons.accepted.connect(self._accept)
        buttons.rejected.connect(self.reject)
        layout = QVBoxLayout(self)
        layout.addWidget(self.problem)
        layout.addLayout(form)
        layout.addWidget(buttons)
        self.ratings: dict[str, str] = {}
        named = RATING_IN_MESSAGE.search(problem)
        if named and named.group(1) in self.fields:  # the cursor where the problem is
            self.fields[named.group(1)].setFocus()

    def _accept(self) -> None:
        try:
            for field in self.fields.values():
                field.value()
            self.ratings = label_ratings({k: f.text() for k, f in self.fields.items()})
        except ValueError as err:  # ReadingError is a ValueError; the field shows its own
            self.problem.setText(f"\u26a0 {err}")
            return
        self.accept()
