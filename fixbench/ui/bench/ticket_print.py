"""Printing the intake ticket through Qt's printing: a label-sized page with the ticket number,
the unit, the customer's complaint, the date and the QR code the bench scans to open the case.

The same drawing goes to a printer chosen in Qt's print dialog or to a PDF file
(:func:`write_ticket_pdf`). The code is drawn module by module as filled squares, with the quiet
zone of four modules that ISO/IEC 18004 asks for around a QR code, at least 0.5 mm a module so a
handheld scanner reads it off a thermal label.
"""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import QMarginsF, QRectF, QSizeF, Qt
from PySide6.QtGui import QColor, QFont, QPageLayout, QPageSize, QPainter, QPdfWriter
from PySide6.QtPrintSupport import QPrintDialog, QPrinter
from PySide6.QtWidgets import QWidget

from fixbench.workflows.intake_ticket import IntakeTicket

LABEL_MM = (62.0, 100.0)  # a common label-printer roll width, and a ticket's length
MARGIN_MM = 3.0
QUIET_MODULES = 4  # ISO/IEC 18004: the light margin around the symbol, in modules
DPI = 300


def _label_layout() -> QPageLayout:
    return QPageLayout(QPageSize(QSizeF(*LABEL_MM), QPageSize.Unit.Millimeter, "Intake ticket"),
                       QPageLayout.Orientation.Portrait,
                       QMarginsF(MARGIN_MM, MARGIN_MM, MARGIN_MM, MARGIN_MM),
                       QPageLayout.Unit.Millimeter)


def draw_ticket(painter: QPainter, area: QRectF, ticket: IntakeTicket, dots_per_mm: float) -> None:
    """The ticket drawn in ``area`` (device pixels): text on top, the code below it."""
    painter.save()
    painter.setRenderHint(QPainter.RenderHint.Antialiasing, False)  # crisp module edges
    ink = QColor("#000000")
    painter.setPen(ink)

    def font(points: float, bold: bool = False) -> QFont:
        chosen = QFont("DejaVu Sans")
        chosen.setPixelSize(max(1, round(points / 72 * 25.4 * dots_per_mm)))
        chosen.setBold(bold)
        return chosen

    y = area.top()
    for text, size, bold in ((ticket.ticket, 16, True), (ticket.unit, 8, False),
                             (f"Taken in {ticket.taken_in:%d %b %Y %H:%M}", 8, False),
                             (ticket.warranty, 8, True), (ticket.complaint, 7, False)):
        if not text:
            continue
        painter.setFont(font(size, bold))
        box = painter.boundingRect(QRectF(area.left(), y, area.width(), area.height()),
                                   Qt.TextFlag.TextWordWrap, text)
        painter.drawText(QRectF(area.left(), y, area.width(), box.height()),
                         Qt.TextFlag.TextWordWrap, text)
        y += box.height() + 1.0 * dots_per_mm
    modules = ticket.modules
    count = len(modules) + 2 * QUIET_MODULES
    side = min(area.width(), area.bottom() - y)
    module = int(side // count)  # whole device pixels: every module the same size
    if module < 0.5 * dots_per_mm:
        raise ValueError("the ticket has no room for a code a scanner can read")
    left = area.left() + (area.width() - module * count) / 2 + QUIET_MODULES * module
    top = y + QUIET_MODULES * module
    for r, row in enumerate(modules):
        for c, dark in enumerate(row):
            if dark:
                painter.fillRect(QRectF(left + c * module, top + r * module, module, module), ink)
    painter.restore()


def _paint(device, ticket: IntakeTicket, resolution: int) -> None:
    painter = QPainter(device)
    if not painter.isActive():
        raise OSError("cannot print the ticket: the printer or file could not be opened")
    try:
        page = device.pageLayout().paintRectPixels(resolution)
        draw_ticket(painter, QRectF(0, 0, page.width(), page.height()), ticket, resolution / 25.4)
    finally:
        painter.end()


def write_ticket_pdf(ticket: IntakeTicket, path: str | Path) -> Path:
    """The ticket as a one-page PDF of label size."""
    writer = QPdfWriter(str(path))
    writer.setResolution(DPI)
    writer.setTitle(f"Intake ticket {ticket.ticket}")
    writer.setCreator("fixbench")
    writer.setPageLayout(_label_layout())
    _paint(writer, ticket, DPI)
    return Path(path)


def print_ticket(parent: QWidget, ticket: IntakeTicket) -> bool:
    """Ask which printer (or a PDF file) in Qt's print dialog, then print; False if cancelled."""
    printer = QPrinter(QPrinter.PrinterMode.HighResolution)
    printer.setPageLayout(_label_layout())
    printer.setDocName(f"Intake ticket {ticket.ticket}")
    dialog = QPrintDialog(printer, parent)
    dialog.setWindowTitle("Print the intake ticket")
    if dialog.exec() != QPrintDialog.DialogCode.Accepted:
        return False
    _paint(printer, ticket, printer.resolution())
    return True
