"""The Figures screen's charts, drawn with pyqtgraph: labelled bars that can be clicked, lines by
month, and the spread of bench minutes. Each chart only draws what it is given.

Every value axis starts at zero and ends a little above the largest value (a rate of 5 % is drawn
on a scale that shows it, not flat on 0-100 %); the legend sits in the headroom kept above the
lines, top right, so it never covers a point."""

from __future__ import annotations

from collections.abc import Callable, Sequence

import pyqtgraph as pg
from PySide6.QtCore import QPointF, Signal
from PySide6.QtGui import QColor, QFont

from fixbench.ui.review.scales import HEADROOM, nice_top

BAR_COLOUR = QColor("#3f6f8f")
LINE_COLOURS = ("#3f6f8f", "#b5562b", "#4d8a4d", "#7b4f9a", "#8a7a2e")
LABEL_CHARS = 40

pg.setConfigOptions(antialias=True, background="w", foreground="#333333")


def _short(label: str) -> str:
    return label if len(label) <= LABEL_CHARS else label[:LABEL_CHARS - 1] + "\u2026"


class _Chart(pg.PlotWidget):
    def __init__(self, title: str, parent=None) -> None:
        # No context menu: asked for here, pyqtgraph never builds the view's menu at all.
        super().__init__(parent, enableMenu=False)
        self.setTitle(title, size="11pt", color="#222222")
        self.setMouseEnabled(x=False, y=False)
        self.hideButtons()
        self.showGrid(x=True, y=True, alpha=0.15)
        self.setMinimumHeight(180)
        font = QFont()
        font.setPointSize(9)
        for side in ("left", "bottom"):
            self.getAxis(side).setTickFont(font)


class BarChart(_Chart):
    """Horizontal bars, largest on top; a click on a bar emits its index in the given order."""

    bar_clicked = Signal(int)

    def __init__(self, title: str, parent=None,
                 value_text: Callable[[float], str] = lambda v: f"{v:g}") -> None:
        super().__init__(title, parent)
        self.value_text = value_text
        self.values: list[float] = []
        self.scene().sigMouseClicked.connect(self._clicked)
        self.setToolTip("Click a bar to list those cases on the History tab")

    def show_bars(self, labels: Sequence[str], values: Sequence[float]) -> None:
        self.clear()
        self.values = [float(v) for v in values]
        n = len(self.values)
        # Row i (0 = largest) sits at y = n - 1 - i so the first bar is drawn on top.
        ys = [n - 1 - i for i in range(n)]
        if n:
            self.addItem(pg.BarGraphItem(x0=0, y=ys, height=0.7, width=self.values,
                                         brush=BAR_COLOUR, pen=pg.mkPen(None)))
            for y, value in zip(ys, self.values):
                # Beyond the bar's end: right of a bar that goes right, left of one that goes left.
                text = pg.TextItem(self.value_text(value), color="#222222",
                                   anchor=(0, 0.5) if value >= 0 else (1, 0.5))
                text.setPos(value, y)
                self.addItem(text)
        self.getAxis("left").setTicks([[(y, _short(label)) for y, label in zip(ys, labels)]])
        self.setYRange(-0.6, max(n, 1) - 0.4, padding=0)
        low = min(0.0, min(self.values, default=0.0))
        high = max(0.0, max(self.values, default=0.0))
        span = (high - low) or 1.0
        # Room beyond each end for the value written there.
        self.setXRange(low - 0.3 * span * (low < 0), high + 0.3 * span * (high > 0 or low == 0),
                       padding=0)

    def bar_centre(self, index: int) -> QPointF:
        """Where bar ``index`` is on screen (widget coordinates), for keyboardless clicks in tests."""
        n = len(self.values)
        point = self.getPlotItem().vb.mapViewToScene(QPointF(self.values[index] / 2, n - 1 - index))
        return self.mapFromScene(point)

    def _clicked(self, event) -> None:
        if not self.values:
            return
        point = self.getPlotItem().vb.mapSceneToView(event.scenePos())
        n = len(self.values)
        index = n - 1 - round(point.y())
        if 0 <= index < n and abs(point.y() - (n - 1 - index)) <= 0.35 \
                and min(0.0, self.values[index]) <= point.x() <= max(0.0, self.values[index]):
            self.bar_clicked.emit(index)


class MonthLines(_Chart):
    """One or more lines over months, with a legend; values may be None (no cases that month).
    ``scale`` turns a value into what the axis shows (100 for a rate shown in %), ``unit`` names
    the axis."""

    def __init__(self, title: str, scale: float = 1.0, unit: str = "", parent=None,
                 allow_negative: bool = False, ceiling: float | None = None,
                 legend: bool = True) -> None:
        super().__init__(title, parent)
        self.scale, self.allow_negative, self.ceiling = scale, allow_negative, ceiling
        # One line needs no legend: the title names it.
        self.legend = self.addLegend(offset=(-10, 5)) if legend else None
        self.points: list[tuple[float, float]] = []
        if unit:
            self.getAxis("left").setLabel(unit)

    def show_lines(self, months: Sequence[str], series: dict[str, Sequence[float | None]]) -> None:
        self.clear()
        self.points = []
        xs = list(range(len(months)))
        for colour, (name, values) in zip(LINE_COLOURS, series.items()):
            points = [(x, v * self.scale) for x, v in zip(xs, values) if v is not None]
            if points:
                self.points.extend(points)
                self.plot([p[0] for p in points], [p[1] for p in points], name=name,
                          pen=pg.mkPen(colour, width=2), symbol="o", symbolSize=5,
                          symbolBrush=colour, symbolPen=None)
        step = max(1, -(-len(months) // 7))  # at most seven month labels: they must not overlap
        self.getAxis("bottom").setTicks([[(x, _month_label(months[x])) for x in xs[::step]]])
        self.setXRange(-0.5, max(len(months), 1) - 0.5, padding=0.02)
        ys = [y for _x, y in self.points]
        low = min(0.0, min(ys, default=0.0)) if self.allow_negative else 0.0
        top = nice_top(max(ys, default=0.0))
        if self.ceiling is not None:  # a share or a score out of 100 is never over 100
            # The room above it, where the legend sits, carries no tick.
            top = min(top, self.ceiling if self.legend is None else self.ceiling * 1.3)
            self.getAxis("left").setTicks([[(self.ceiling * k / 4, f"{self.ceiling * k / 4:g}")
                                            for k in range(5)]])
        self.setYRange(low * HEADROOM, top, padding=0)


class MinutesSpread(_Chart):
    """How many cases took each band of bench minutes, as upright bars."""

    def __init__(self, title: str, parent=None) -> None:
        super().__init__(title, parent)
        self.getAxis("bottom").setLabel("bench minutes")
        self.getAxis("left").setLabel("cases")

    def show_bands(self, starts: Sequence[int], counts: Sequence[int], width: int) -> None:
        self.clear()
        if starts:
            self.addItem(pg.BarGraphItem(x0=list(starts), height=list(counts), width=width * 0.92,
                                         brush=BAR_COLOUR, pen=pg.mkPen(None)))
        self.setYRange(0, max(counts, default=1) * 1.1, padding=0)


class AgeBars(_Chart):
    """Upright bars with a label under each (open jobs by age band)."""

    def __init__(self, title: str, parent=None) -> None:
        super().__init__(title, parent)
        self.getAxis("left").setLabel("jobs")

    def show_bars(self, labels: Sequence[str], counts: Sequence[int]) -> None:
        self.clear()
        xs = list(range(len(labels)))
        if labels:
            self.addItem(pg.BarGraphItem(x=xs, height=list(counts), width=0.7, brush=BAR_COLOUR,
                                         pen=pg.mkPen(None)))
        self.getAxis("bottom").setTicks([list(zip(xs, labels))])
        self.setXRange(-0.6, max(len(labels), 1) - 0.4, padding=0)
        self.setYRange(0, max(max(counts, default=0), 1) * 1.2, padding=0)


MONTH_NAMES = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")


def _month_label(month: str) -> str:
    """'2024-07' -> 'Jul 24': short enough for a dozen months on a half-width chart."""
    try:
        year, number = month.split("-")[:2]
        return f"{MONTH_NAMES[int(number) - 1]} {year[-2:]}"
    except (ValueError, IndexError):
        return month
