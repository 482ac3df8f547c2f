"""Charts inside a printed report, drawn with QPainter as vector shapes at print time.

A chart is an object in the QTextDocument (a QTextObjectInterface handler), so it flows with the
text, and the PDF writer receives lines, rectangles and text instead of a bitmap: sharp at any
zoom. Works without widgets, so a report can be laid out off the GUI thread.
"""

from __future__ import annotations

from dataclasses import dataclass

from PySide6.QtCore import QPointF, QRectF, QSizeF, Qt
from PySide6.QtGui import (QColor, QFont, QPainter, QPen, QPyTextObject, QTextCharFormat,
                           QTextCursor, QTextFormat)

from fixbench.ui.review.scales import nice_top

CHART_OBJECT = QTextFormat.ObjectTypes.UserObject + 1
CHART_KEY = QTextFormat.Property.UserProperty + 1
BAR = QColor("#3f6f8f")
LINES = (QColor("#3f6f8f"), QColor("#b5562b"), QColor("#4d8a4d"), QColor("#7b4f9a"))
INK = QColor("#222222")


@dataclass(frozen=True)
class BarsSpec:
    title: str
    labels: tuple[str, ...]
    values: tuple[float, ...]


@dataclass(frozen=True)
class LinesSpec:
    title: str
    months: tuple[str, ...]
    series: tuple[tuple[str, tuple[float | None, ...]], ...]
    percent: bool = False


class ChartObjects(QPyTextObject):
    """Holds the charts of one document and draws them where the layout puts them."""

    def __init__(self, points_to_device: float, width_pt: float = 480, height_pt: float = 190):
        super().__init__()
        self.scale = points_to_device
        self.size = QSizeF(width_pt * self.scale, height_pt * self.scale)
        self.charts: list[BarsSpec | LinesSpec] = []

    def insert(self, cursor: QTextCursor, chart: BarsSpec | LinesSpec) -> None:
        self.charts.append(chart)
        fmt = QTextCharFormat()
        fmt.setObjectType(CHART_OBJECT)
        fmt.setProperty(CHART_KEY, len(self.charts) - 1)
        cursor.insertText("\ufffc", fmt)

    def intrinsicSize(self, doc, pos_in_document, fmt) -> QSizeF:
        return self.size

    def drawObject(self, painter: QPainter, rect: QRectF, doc, pos_in_document, fmt) -> None:
        chart = self.charts[int(fmt.property(CHART_KEY))]
        painter.save()
        painter.setRenderHint(QPainter.RenderHint.Antialiasing)
        font = QFont("DejaVu Sans")
        font.setPixelSize(round(8 * self.scale))
        painter.setFont(font)
        title = QRectF(rect.left(), rect.top(), rect.width(), 14 * self.scale)
        bold = QFont(font)
        bold.setBold(True)
        painter.setFont(bold)
        painter.setPen(INK)
        painter.drawText(title, Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter,
                         chart.title)
        painter.setFont(font)
        body = rect.adjusted(0, 18 * self.scale, 0, 0)
        if isinstance(chart, BarsSpec):
            self._bars(painter, body, chart)
        else:
            self._lines(painter, body, chart)
        painter.restore()

    def _bars(self, painter: QPainter, area: QRectF, chart: BarsSpec) -> None:
        if not chart.values:
            painter.drawText(area, Qt.AlignmentFlag.AlignCenter, "no cases in this period")
            return
        label_w = area.width() * 0.45
        row_h = area.height() / max(len(chart.values), 1)
        top = max(chart.values) or 1
        for i, (label, value) in enumerate(zip(chart.labels, chart.values)):
            y = area.top() + i * row_h
            painter.setPen(INK)
            painter.drawText(QRectF(area.left(), y, label_w - 6 * self.scale, row_h),
                             Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter,
                             painter.fontMetrics().elidedText(label, Qt.TextElideMode.ElideRight,
                                                              int(label_w - 8 * self.scale)))
            length = (area.width() - label_w - 30 * self.scale) * value / top
            painter.fillRect(QRectF(area.left() + label_w, y + row_h * 0.15, length, row_h * 0.7),
                             BAR)
            painter.drawText(QRectF(area.left() + label_w + length + 3 * self.scale, y,
                                    30 * self.scale, row_h),
                             Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter, f"{value:g}")

    def _lines(self, painter: QPainter, area: QRectF, chart: LinesSpec) -> None:
        plot = area.adjusted(28 * self.scale, 0, -4 * self.scale, -14 * self.scale)
        values = [v for _, series in chart.series for v in series if v is not None]
        # From zero to a round value above the largest, so a small rate is not drawn flat.
        top = nice_top(max(values, default=0.0))
        if chart.percent:
            top = min(top, 1.0)  # a share is never over 100 %
        painter.setPen(QPen(QColor("#bbbbbb"), 0.5 * self.scale))
        for k in range(5):
            y = plot.bottom() - plot.height() * k / 4
            painter.drawLine(QPointF(plot.left(), y), QPointF(plot.right(), y))
            tick = top * k / 4
            painter.setPen(INK)
            painter.drawText(QRectF(area.left(), y - 6 * self.scale, 25 * self.scale, 12 * self.scale),
                             Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter,
                             f"{tick * 100:g} %" if chart.percent else f"{tick:g}")
            painter.setPen(QPen(QColor("#bbbbbb"), 0.5 * self.scale))
        n = len(chart.months)

        def x_of(i: int) -> float:
            return plot.left() + (plot.width() * (i + 0.5) / max(n, 1))

        painter.setPen(INK)
        step = max(1, n // 12)
        for i in range(0, n, step):
            painter.drawText(QRectF(x_of(i) - 20 * self.scale, plot.bottom() + 2 * self.scale,
                                    40 * self.scale, 12 * self.scale),
                             Qt.AlignmentFlag.AlignCenter, chart.months[i])
        for k, (name, series) in enumerate(chart.series):
            colour = LINES[k % len(LINES)]
            painter.setPen(QPen(colour, 1.6 * self.scale))
            points = [QPointF(x_of(i), plot.bottom() - plot.height() * v / top)
                      for i, v in enumerate(series) if v is not None]
            for a, b in zip(points, points[1:]):
                painter.drawLine(a, b)
            for p in points:
                painter.drawEllipse(p, 1.5 * self.scale, 1.5 * self.scale)
            # The names go above the plot, outside it: they never cover a point.
            painter.drawText(QRectF(plot.right() - 120 * (k + 1) * self.scale,
                                    area.top() - 16 * self.scale, 118 * self.scale,
                                    11 * self.scale),
                             Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter,
                             f"\u2014 {name}")
