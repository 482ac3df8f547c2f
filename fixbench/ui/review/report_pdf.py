"""Printing a report document to PDF with Qt's own writer: A4 pages, the shop's footer and page
numbers on every page. No widgets and no browser engine, so it runs off the GUI thread."""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import QMarginsF, QRectF, QSizeF, Qt
from PySide6.QtGui import (QFont, QPageLayout, QPageSize, QPainter, QPdfWriter, QTextCursor,
                           QTextDocument)

from fixbench.ui.review.report_charts import CHART_OBJECT, ChartObjects

DPI = 300
CHART_MARK = "@@chart-"
MARGIN_MM = 16
FOOTER_PT = 28  # room kept at the bottom of each page for the footer


class ReportDocument:
    """A QTextDocument laid out for A4 at the writer's resolution, with a chart handler."""

    def __init__(self, title: str) -> None:
        self.title = title
        self.writer_size = _page_size_px()
        self.points = DPI / 72.0
        self.doc = QTextDocument()
        self.doc.setDocumentMargin(0)
        font = QFont("DejaVu Sans")
        font.setPixelSize(round(9.5 * self.points))
        self.doc.setDefaultFont(font)
        self.doc.setDefaultStyleSheet(
            f"h1 {{ font-size: {round(17 * self.points)}px; color: #1d3a52; }}"
            f"h2 {{ font-size: {round(12 * self.points)}px; color: #1d3a52; }}"
            "td, th { padding: 4px; } th { background: #e4ebf1; text-align: left; }")
        width, height = self.writer_size
        self.page_height = height - FOOTER_PT * self.points
        self.doc.setPageSize(QSizeF(width, self.page_height))
        self.charts = ChartObjects(self.points, width_pt=width / self.points)
        self.doc.documentLayout().registerHandler(CHART_OBJECT, self.charts)
        self.parts: list[str] = []
        self.specs: list = []

    def html(self, text: str) -> None:
        self.parts.append(text)

    def chart(self, spec) -> None:
        # A marker paragraph, swapped for the chart object once the HTML is in the document.
        self.parts.append(f"<p>{CHART_MARK}{len(self.specs)}</p>")
        self.specs.append(spec)

    def _compose(self) -> None:
        self.doc.setHtml("".join(self.parts))
        for number, spec in enumerate(self.specs):
            cursor = self.doc.find(f"{CHART_MARK}{number}")
            while not cursor.isNull() and cursor.selectedText() != f"{CHART_MARK}{number}":
                cursor = self.doc.find(f"{CHART_MARK}{number}", cursor)
            cursor.movePosition(QTextCursor.MoveOperation.EndOfBlock,
                                QTextCursor.MoveMode.KeepAnchor)
            cursor.removeSelectedText()
            self.charts.insert(cursor, spec)

    def write(self, path: str | Path, footer: str) -> int:
        """Write the PDF; returns its number of pages."""
        self._compose()
        writer = QPdfWriter(str(path))
        writer.setResolution(DPI)
        writer.setTitle(self.title)
        writer.setCreator("fixbench")
        writer.setPageLayout(QPageLayout(QPageSize(QPageSize.PageSizeId.A4),
                                         QPageLayout.Orientation.Portrait,
                                         QMarginsF(MARGIN_MM, MARGIN_MM, MARGIN_MM, MARGIN_MM),
                                         QPageLayout.Unit.Millimeter))
        width = writer.width()
        pages = self.doc.pageCount()
        painter = QPainter(writer)
        if not painter.isActive():
            raise OSError(f"cannot write {path}: check the folder exists and is writable")
        small = QFont("DejaVu Sans")
        small.setPixelSize(round(7.5 * self.points))
        try:
            for page in range(pages):
                if page:
                    writer.newPage()
                painter.save()
                painter.translate(0, -page * self.page_height)
                self.doc.drawContents(painter, QRectF(0, page * self.page_height, width,
                                                      self.page_height))
                painter.restore()
                painter.setFont(small)
                band = QRectF(0, self.page_height + 8 * self.points, width, 16 * self.points)
                painter.drawLine(band.topLeft(), band.topRight())
                painter.drawText(band, Qt.AlignmentFlag.AlignLeft | Qt.AlignmentFlag.AlignVCenter
                                 | Qt.TextFlag.TextWordWrap, footer)
                painter.drawText(band, Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter,
                                 f"page {page + 1} of {pages}")
        finally:
            painter.end()
        return pages


def _page_size_px() -> tuple[float, float]:
    """The printable A4 area at DPI, in device pixels (what the writer's painter draws in)."""
    mm = 25.4
    return ((210 - 2 * MARGIN_MM) / mm * DPI, (297 - 2 * MARGIN_MM) / mm * DPI)
