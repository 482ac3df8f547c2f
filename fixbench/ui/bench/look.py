"""How the bench looks: sizes readable at arm's length and colours taken from the desktop palette.

Only the "suspect" and "caution" hues are fixed; they are blended into the palette's own base
colour, so the screen follows a light or dark desktop and text keeps the palette's text colour.
"""

from __future__ import annotations

from PySide6.QtGui import QColor, QFont, QPalette
from PySide6.QtWidgets import QFrame, QLabel, QWidget

SUSPECT_HUE = QColor(214, 72, 52)  # stages and rows likely at fault
CAUTION_HUE = QColor(230, 150, 20)  # live steps and cautions
GOOD_HUE = QColor(40, 150, 80)  # a reading in band
BIG = 1.8  # reading entry and expected value, against the desktop's own font
LARGE = 1.35  # step title


def scaled_font(widget: QWidget, factor: float, bold: bool = False) -> QFont:
    font = QFont(widget.font())
    size = font.pointSizeF() if font.pointSizeF() > 0 else 10.0
    font.setPointSizeF(size * factor)
    font.setBold(bold)
    return font


def blend(base: QColor, hue: QColor, amount: float) -> QColor:
    """``amount`` 0 gives ``base``, 1 gives ``hue``."""
    a = max(0.0, min(1.0, amount))
    return QColor(round(base.red() * (1 - a) + hue.red() * a),
                  round(base.green() * (1 - a) + hue.green() * a),
                  round(base.blue() * (1 - a) + hue.blue() * a))


def tinted(widget: QWidget, hue: QColor, amount: float) -> QColor:
    return blend(widget.palette().color(QPalette.ColorRole.Base), hue, amount)


def heading(text: str, parent: QWidget | None = None, factor: float = LARGE) -> QLabel:
    label = QLabel(text, parent)
    label.setFont(scaled_font(label, factor, bold=True))
    label.setWordWrap(True)
    return label


def banner(hue: QColor, parent: QWidget | None = None) -> QFrame:
    """A framed strip tinted with ``hue`` over the palette's base (cautions, out-of-band marks)."""
    frame = QFrame(parent)
    frame.setObjectName("banner")
    frame.setFrameShape(QFrame.Shape.StyledPanel)
    frame.setAutoFillBackground(True)
    paint_banner(frame, hue)
    return frame


def paint_banner(frame: QWidget, hue: QColor, amount: float = 0.28) -> None:
    palette = frame.palette()
    palette.setColor(QPalette.ColorRole.Window, tinted(frame, hue, amount))
    frame.setPalette(palette)
    frame.setStyleSheet(f"QFrame#banner {{ border: 2px solid {hue.name()}; border-radius: 4px; }}")


def bind_keys(button, *keys: str) -> None:
    """Give a button its keys as explicit shortcuts (live while the button is shown), and name them
    in its tooltip. Explicit shortcuts, not '&' mnemonics: those are off on some platforms."""
    from PySide6.QtGui import QKeySequence, QShortcut

    for key in keys:
        QShortcut(QKeySequence(key), button, activated=lambda b=button: b.isEnabled() and b.click())
    tip = button.toolTip() or button.text()
    button.setToolTip(f"{tip} ({' or '.join(keys)})" if keys else tip)
