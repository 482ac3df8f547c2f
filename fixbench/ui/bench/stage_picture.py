"""The supply drawn as its stages: power flows left to right along the top row, the control
stages sit under the part of the path they drive, and the isolation slot is a dashed line through
the transformer. Each stage is shaded by how likely it holds the fault; the stages the current
step puts probes on get a thick outline and a probe dot.

Positions come from the stage's role, so any family file drawn with the known roles gets a tidy
picture; a stage with a role not placed here goes in an extra row at the bottom.
"""

from __future__ import annotations

from PySide6.QtCore import QPointF, QRectF, Qt
from PySide6.QtGui import (QBrush, QColor, QFont, QFontMetricsF, QPainter, QPainterPath, QPalette, QPen,
                           QPolygonF)
from PySide6.QtWidgets import QSizePolicy, QWidget

from fixbench.knowledge.graph import stage_graph
from fixbench.ui.bench.look import SUSPECT_HUE, blend

# role -> (column, row). Row 1 is the power path; row 0 above it, rows 2-3 under it.
PLACES = {
    "input": (0, 1), "rectifier": (1, 1), "bulk": (2, 1), "transformer": (3.5, 1),
    "output_rectifier": (5, 1), "output_filter": (6, 1), "lead": (7, 1),
    "clamp": (3.5, 0), "startup": (1.5, 2), "drive": (2.5, 3), "switch": (3.5, 2), "pfc": (1.5, 0),
}
FEEDBACK_PLACE = {"secondary": (6, 2.5), "primary": (1.3, 3), "isolation": (4.5, 3)}
COLUMNS, ROWS = 8, 4


class StagePicture(QWidget):
    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Expanding)
        self.setMinimumHeight(200)
        self.family = None
        self.graph = None
        self.chances: dict[str, float] = {}
        self.probed: set[str] = set()
        self.places: dict[str, tuple[float, float]] = {}

    def show_state(self, state, check=None) -> None:
        if state is None:
            self.family = self.graph = None
            self.update()
            return
        if state.family is not self.family:
            self.family = state.family
            self.graph = stage_graph(state.family)
            self.places = self._place(state.family)
        self.chances = dict(state.stage_chances)
        self.probed = {state.family.test_point(p).stage for p in check.points} if check is not None else set()
        self.setToolTip("Shading: chance the fault is in that stage. Outline and dot: where the "
                        "current step puts the probes.\n" + "\n".join(
                            f"{s.title}: {self.chances.get(s.id, 0):.0%}" for s in state.family.stages))
        self.update()

    @staticmethod
    def _place(family) -> dict[str, tuple[float, float]]:
        places, extra = {}, 0
        for stage in family.stages:
            if stage.role == "feedback":
                places[stage.id] = FEEDBACK_PLACE.get(stage.side, (5, 3))
            elif stage.role in PLACES and PLACES[stage.role] not in places.values():
                places[stage.id] = PLACES[stage.role]
            else:
                places[stage.id] = (extra, ROWS)
                extra += 1
        return places

    # --- painting ----------------------------------------------------------------------------------

    def _box(self, stage_id: str) -> QRectF:
        col, row = self.places[stage_id]
        rows = ROWS + (1 if any(r >= ROWS for _, r in self.places.values()) else 0)
        cell_w = self.width() / COLUMNS
        cell_h = (self.height() - 22) / rows
        w, h = cell_w * 0.86, cell_h * 0.74
        cx, cy = (col + 0.5) * cell_w, (row + 0.5) * cell_h
        return QRectF(cx - w / 2, cy - h / 2, w, h)

    def paintEvent(self, _event) -> None:  # noqa: N802 (Qt name)
        painter = QPainter(self)
        painter.setRenderHint(QPainter.RenderHint.Antialiasing)
        palette = self.palette()
        painter.fillRect(self.rect(), palette.color(QPalette.ColorRole.Base))
        if self.family is None:
            painter.end()
            return
        text = palette.color(QPalette.ColorRole.Text)
        self._draw_slot(painter, text)
        for source, target, data in self.graph.edges(data=True):
            self._draw_link(painter, source, target, data["kind"], text)
        for stage in self.family.stages:
            self._draw_stage(painter, stage, palette)
        self._draw_legend(painter, text)
        painter.end()

    def _draw_slot(self, painter: QPainter, text: QColor) -> None:
        transformer = [s.id for s in self.family.stages if s.role == "transformer"]
        if not transformer:
            return
        x = self._box(transformer[0]).center().x()
        pen = QPen(blend(text, self.palette().color(QPalette.ColorRole.Base), 0.5), 1.5, Qt.PenStyle.DashLine)
        painter.setPen(pen)
        painter.drawLine(QPointF(x, 4), QPointF(x, self.height() - 24))
        painter.drawText(QRectF(4, 2, x - 10, 16), Qt.AlignmentFlag.AlignLeft, "primary side (mains)")
        painter.drawText(QRectF(x + 6, 2, self.width() - x - 10, 16), Qt.AlignmentFlag.AlignRight,
                         "secondary side (output)")

    def _draw_link(self, painter: QPainter, source: str, target: str, kind: str, text: QColor) -> None:
        a, b = self._box(source), self._box(target)
        start, end = _edge_point(a, b.center()), _edge_point(b, a.center())
        power = kind == "power"
        colour = QColor(text)
        colour.setAlpha(200 if power else 130)
        painter.setPen(QPen(colour, 2.2 if power else 1.2, Qt.PenStyle.SolidLine if power else Qt.PenStyle.DashLine))
        painter.drawLine(start, end)
        direction = end - start
        length = max((direction.x() ** 2 + direction.y() ** 2) ** 0.5, 1e-6)
        ux, uy = direction.x() / length, direction.y() / length
        size = 8 if power else 6
        head = QPolygonF([end, QPointF(end.x() - ux * size - uy * size / 2, end.y() - uy * size + ux * size / 2),
                          QPointF(end.x() - ux * size + uy * size / 2, end.y() - uy * size - ux * size / 2)])
        painter.setBrush(QBrush(colour))
        painter.setPen(Qt.PenStyle.NoPen)
        painter.drawPolygon(head)

    def _draw_stage(self, painter: QPainter, stage, palette: QPalette) -> None:
        box = self._box(stage.id)
        chance = self.chances.get(stage.id, 0.0)
        base = palette.color(QPalette.ColorRole.Base)
        fill = blend(base, SUSPECT_HUE, min(1.0, 0.08 + chance ** 0.6 * 0.92) if chance > 0.005 else 0.0)
        probed = stage.id in self.probed
        outline = palette.color(QPalette.ColorRole.Highlight) if probed else palette.color(QPalette.ColorRole.Mid)
        painter.setBrush(QBrush(fill))
        painter.setPen(QPen(outline, 4 if probed else 1.2))
        path = QPainterPath()
        path.addRoundedRect(box, 8, 8)
        painter.drawPath(path)
        text = palette.color(QPalette.ColorRole.Text)
        if fill.lightness() < 110 and text.lightness() < 128:
            text = palette.color(QPalette.ColorRole.HighlightedText)  # dark text on a dark red box
        painter.setPen(text)
        inner = box.adjusted(3, 2, -3, -box.height() * 0.3)
        painter.setFont(_fitting_font(painter.font(), stage.title, inner))
        painter.drawText(inner, Qt.AlignmentFlag.AlignCenter | Qt.TextFlag.TextWordWrap, stage.title)
        font = painter.font()
        font.setBold(True)
        painter.setFont(font)
        painter.drawText(box.adjusted(4, box.height() * 0.66, -4, -2), Qt.AlignmentFlag.AlignCenter,
                         f"{chance:.0%}" if chance >= 0.005 else "")
        if probed:
            painter.setBrush(QBrush(outline))
            painter.setPen(QPen(palette.color(QPalette.ColorRole.Base), 2))
            painter.drawEllipse(QPointF(box.right() - 6, box.top() + 6), 7, 7)

    def _draw_legend(self, painter: QPainter, text: QColor) -> None:
        font = painter.font()
        font.setBold(False)
        font.setPointSizeF(8.5)
        painter.setFont(font)
        painter.setPen(text)
        painter.drawText(QRectF(6, self.height() - 20, self.width() - 12, 18), Qt.AlignmentFlag.AlignLeft,
                         "shade: chance of the fault   \u25cf outline: probes here   "
                         "solid: power  dashed: control")


def _fitting_font(font: QFont, text: str, box: QRectF) -> QFont:
    """The largest size (10.5 pt down to 6.5 pt) at which every word of ``text`` fits the box."""
    fitted = QFont(font)
    fitted.setBold(False)
    size = 10.5
    while size > 6.5:
        fitted.setPointSizeF(size)
        metrics = QFontMetricsF(fitted)
        widest = max(metrics.horizontalAdvance(word) for word in text.split())
        needed = metrics.boundingRect(box, int(Qt.TextFlag.TextWordWrap), text).height()
        if widest <= box.width() and needed <= box.height():
            break
        size -= 0.5
    return fitted


def _edge_point(box: QRectF, towards: QPointF) -> QPointF:
    """Where the line from the box centre to ``towards`` leaves the box."""
    c = box.center()
    dx, dy = towards.x() - c.x(), towards.y() - c.y()
    if dx == 0 and dy == 0:
        return c
    sx = (box.width() / 2) / abs(dx) if dx else float("inf")
    sy = (box.height() / 2) / abs(dy) if dy else float("inf")
    s = min(sx, sy)
    return QPointF(c.x() + dx * s, c.y() + dy * s)
