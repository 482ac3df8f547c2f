"""The board in hand on a step card: the part the step reads as the board names it (designator and
marking, or the family's typical value), a button to say "this board's part is marked ...", and
the board's photo around the test point where one has been marked.

Renders and forwards: the controller keeps a marking through the workflows, which recompute the
case for it.
"""

from __future__ import annotations

from PySide6.QtCore import QPointF, QRectF, Qt, Signal
from PySide6.QtGui import QColor, QImage, QPainter, QPen, QPixmap
from PySide6.QtWidgets import (QDialog, QDialogButtonBox, QFormLayout, QHBoxLayout, QLabel, QLineEdit,
                               QPushButton, QVBoxLayout, QWidget)

from fixbench.knowledge.board import BoardError, PartEntry, read_marking
from fixbench.knowledge.model import KIND_VALUE_UNITS
from fixbench.ui.bench.look import SUSPECT_HUE

CROP = 0.28  # the share of the photo's shorter side shown around a marked point
MARK_COLOUR = QColor(SUSPECT_HUE)


def photo_pixmap(image: bytes) -> QPixmap:
    pixmap = QPixmap()
    pixmap.loadFromData(image)
    return pixmap


def draw_mark(painter: QPainter, centre: QPointF, radius: float, text: str = "") -> None:
    """A ring with a cross on the test point, readable on a light or dark board."""
    for colour, width in ((QColor("white"), 5.0), (MARK_COLOUR, 2.5)):
        painter.setPen(QPen(colour, width))
        painter.drawEllipse(centre, radius, radius)
        painter.drawLine(centre - QPointF(radius * 1.6, 0), centre - QPointF(radius * 0.5, 0))
        painter.drawLine(centre + QPointF(radius * 0.5, 0), centre + QPointF(radius * 1.6, 0))
    if text:
        painter.setPen(QPen(QColor("white"), 1))
        painter.drawText(centre + QPointF(radius * 1.8, -radius), text)


def crop_around(pixmap: QPixmap, x: float, y: float, size: int) -> QPixmap:
    """The photo around (x, y) (fractions of width and height), the point marked, scaled to size."""
    side = CROP * min(pixmap.width(), pixmap.height())
    left = min(max(0.0, x * pixmap.width() - side / 2), max(0.0, pixmap.width() - side))
    top = min(max(0.0, y * pixmap.height() - side / 2), max(0.0, pixmap.height() - side))
    piece = pixmap.copy(round(left), round(top), round(side), round(side)).scaled(
        size, size, Qt.AspectRatioMode.KeepAspectRatio, Qt.TransformationMode.SmoothTransformation)
    painter = QPainter(piece)
    painter.setRenderHint(QPainter.RenderHint.Antialiasing)
    scale = piece.width() / side
    draw_mark(painter, QPointF((x * pixmap.width() - left) * scale, (y * pixmap.height() - top) * scale),
              size * 0.07)
    painter.end()
    return piece


class BoardPartStrip(QWidget):
    """One line under the step title: the part on this board, and its photo where marked."""

    marking_asked = Signal()

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.words = QLabel()
        self.words.setWordWrap(True)
        self.button = QPushButton("This board's part is marked\u2026")
        self.button.setToolTip("Type the board's designator and what the part is marked with; kept "
                               "for every unit of this model, and the expected values follow it")
        self.button.clicked.connect(self.marking_asked)
        self.photo = QLabel()
        self.photo.setToolTip("The board's photo around the test point (marked in the board profile)")
        self.photo.setVisible(False)
        text = QVBoxLayout()
        text.setContentsMargins(0, 0, 0, 0)
        text.addWidget(self.words)
        row = QHBoxLayout()
        row.addWidget(self.button)
        row.addStretch(1)
        text.addLayout(row)
        text.addStretch(1)
        layout = QHBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addLayout(text, 1)
        layout.addWidget(self.photo)
        self.part = None

    def show_part(self, part, words: str, photo: tuple | None) -> None:
        """``part`` the step reads (None: no single part), ``words`` what to say of it, ``photo`` a
        (KeptPhoto, point id) to show around its mark."""
        self.part = part
        self.words.setText(f"<b>Part</b> {words}" if part is not None else "")
        self.button.setVisible(part is not None)
        if photo is None:
            self.photo.clear()
            self.photo.setVisible(False)
        else:
            kept, point = photo
            x, y = kept.marks[point]
            self.photo.setPixmap(crop_around(photo_pixmap(kept.image), x, y, 110))
            self.photo.setVisible(True)
        self.setVisible(part is not None or photo is not None)


class MarkingDialog(QDialog):
    """"This board's part is marked ...": designator, marking, voltage rating, package. The marking is
    read before the dialog closes, so a slip is told here."""

    def __init__(self, part, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.part = part
        self.setWindowTitle(f"{part.title} on this board")
        unit = KIND_VALUE_UNITS.get(part.kind)
        self.designator = QLineEdit(part.designator)
        self.designator.setPlaceholderText(f"as printed beside it, e.g. {part.id} or R3 + R4")
        self.value = QLineEdit(part.marking)
        self.value.setPlaceholderText({"ohm": "e.g. 2M2, 22R, 2 x 2.2 Mohm", "F": "e.g. 10 uF 400 V",
                                       "A": "e.g. T2A 250V", "V": "e.g. 5V1"}.get(unit, "type number, e.g. 1N4007"))
        self.rated = QLineEdit()
        self.rated.setPlaceholderText("voltage rating if printed apart, e.g. 400 V")
        self.package = QLineEdit(part.package)
        self.package.setPlaceholderText("e.g. TO-220, 1206, radial 10x16")
        self.message = QLabel()
        self.message.setWordWrap(True)
        form = QFormLayout(self)
        form.addRow(QLabel(f"What the board in hand says of its <b>{part.title.lower()}</b> (the family's "
                           f"{part.id}). Kept for every unit of this model."))
        form.addRow("Designator", self.designator)
        form.addRow("Marked", self.value)
        form.addRow("Voltage rating", self.rated)
        form.addRow("Package", self.package)
        form.addRow(self.message)
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Ok | QDialogButtonBox.StandardButton.Cancel)
        buttons.button(QDialogButtonBox.StandardButton.Ok).setText("Keep for this model")
        buttons.accepted.connect(self.accept)
        buttons.rejected.connect(self.reject)
        form.addRow(buttons)
        self.entry: PartEntry | None = None

    def accept(self) -> None:
        entry = PartEntry(self.part.id, self.designator.text(), self.value.text(), self.rated.text(),
                          self.package.text())
        try:
            read_marking(self.part.kind, entry.value, entry.rated)
        except BoardError as err:
            self.message.setText(f"\u26a0 {err}")
            self.value.setFocus()
            return
        self.entry = entry
        super().accept()


def photo_rect(pixmap: QPixmap, area: QRectF) -> QRectF:
    """Where a photo scaled to fit ``area`` (aspect kept, centred) lies in it."""
    if pixmap.isNull() or pixmap.width() == 0 or pixmap.height() == 0:
        return QRectF()
    scale = min(area.width() / pixmap.width(), area.height() / pixmap.height())
    w, h = pixmap.width() * scale, pixmap.height() * scale
    return QRectF(area.x() + (area.width() - w) / 2, area.y() + (area.height() - h) / 2, w, h)


def scaled_for_keeping(image: QImage, longest: int = 1600) -> QImage:
    """A photo no larger than the screen needs, so the shop's database stays small."""
    if max(image.width(), image.height()) <= longest:
        return image
    return image.scaled(longest, longest, Qt.AspectRatioMode.KeepAspectRatio,
                        Qt.TransformationMode.SmoothTransformation)
