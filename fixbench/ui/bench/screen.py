"""The Bench screen: who is at the bench and which case is open on top, one page below for where
the case is (open cases, intake, cautions, guided checks, repair, verification, close).

The screen only switches pages and hands the controller's view to the page that shows it.
"""

from __future__ import annotations

from PySide6.QtCore import Qt, Signal
from PySide6.QtWidgets import QHBoxLayout, QLabel, QPushButton, QStackedWidget, QVBoxLayout, QWidget

from fixbench.ui.bench.cautions_panel import CautionsPanel
from fixbench.ui.bench.controller import BenchController
from fixbench.ui.bench.guided import GuidedPanel
from fixbench.ui.bench.intake import IntakePanel
from fixbench.ui.bench.look import CAUTION_HUE, SUSPECT_HUE, banner, bind_keys, heading, paint_banner
from fixbench.ui.bench.open_cases import OpenCasesPanel
from fixbench.ui.bench.repair import RepairPanel
from fixbench.ui.bench.technician import TechnicianPicker
from fixbench.ui.bench.verify_close import ClosePanel, VerifyPanel
from fixbench.ui.context import AppContext
from fixbench.ui.workers import run_in_background
from fixbench.workflows.intake_ticket import intake_ticket


class BenchScreen(QWidget):
    demo_wanted = Signal()

    def __init__(self, context: AppContext, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.context = context
        self.controller = BenchController(context, self)
        self.technician = TechnicianPicker(context)
        self.case_banner = banner(CAUTION_HUE)
        banner_layout = QHBoxLayout(self.case_banner)
        banner_layout.setContentsMargins(8, 2, 8, 2)
        self.case_label = heading("", factor=1.1)
        self.power_badge = heading("", factor=1.1)
        self.power_badge.setAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        banner_layout.addWidget(self.case_label, 1)
        banner_layout.addWidget(self.power_badge)
        self.case_banner.setVisible(False)
        self.status = QLabel()
        self.status.setWordWrap(True)
        self.busy = QLabel("")

        self.pages = QStackedWidget()
        self.panels = {
            "cases": OpenCasesPanel(self.controller),
            "intake": IntakePanel(self.controller),
            "cautions": CautionsPanel(self.controller),
            "guided": GuidedPanel(self.controller),
            "repair": RepairPanel(self.controller),
            "verify": VerifyPanel(self.controller),
            "close": ClosePanel(self.controller),
        }
        for panel in self.panels.values():
            self.pages.addWidget(panel)
        self._add_demo_offer()

        top = QHBoxLayout()
        top.addWidget(self.technician)
        top.addStretch(1)
        top.addWidget(self.busy)
        layout = QVBoxLayout(self)
        layout.addLayout(top)
        layout.addWidget(self.case_banner)
        layout.addWidget(self.pages, 1)
        layout.addWidget(self.status)

        c = self.controller
        c.page_wanted.connect(self.show_page)
        c.view_changed.connect(self._show_view)
        c.cases_changed.connect(self.panels["cases"].refresh)
        c.failed.connect(lambda text: self._status(f"\u26a0 {text}", error=True))
        c.ratings_to_correct.connect(self._correct_ratings)
        c.busy_changed.connect(lambda busy: self.busy.setText("saving\u2026" if busy else "all steps saved"))
        self.panels["guided"].card.field.escaped.connect(self._escape_from_step)
        self.panels["cautions"].ticket_wanted.connect(self.print_intake_ticket)
        self.panels["cases"].refresh()
        self.show_page("cases")

    def _correct_ratings(self, kept) -> None:
        from fixbench.ui.bench.ratings_dialog import RatingsDialog

        dialog = RatingsDialog(kept.ticket, kept.ratings, kept.problem, self)
        if dialog.exec() == RatingsDialog.DialogCode.Accepted:
            self.controller.correct_ratings(kept.case_id, dialog.ratings)

    # --- pages ---------------------------------------------------------------------------------

    @property
    def page(self) -> str:
        current = self.pages.currentWidget()
        return next(name for name, panel in self.panels.items() if panel is current)

    def show_page(self, name: str) -> None:
        panel = self.panels[name]
        if name == "intake":
            panel.reset()
        elif name == "cases":
            self.case_banner.setVisible(False)
            self._offer_demo_if_empty()
        elif hasattr(panel, "show_view"):
            panel.show_view(self.controller.view)
        self.pages.setCurrentWidget(panel)
        panel.setFocus()

    def _show_view(self, view) -> None:
        self._show_banner(view)
        if view.notice:
            self._status(view.notice)
        current = self.pages.currentWidget()
        if hasattr(current, "show_view"):
            current.show_view(view)

    def _show_banner(self, view) -> None:
        if view.case is None:
            self.case_banner.setVisible(False)
            return
        self.case_label.setText(view.case.heading)
        check_id = self.controller.current_check_id()
        power = view.state.family.check(check_id).power if check_id and view.state is not None else "none"
        live = power in ("live", "lamp")
        self.power_badge.setText("\u26a1 LIVE STEP: mains present" if live else
                                 "unplugged step" if power == "cold" else "")
        paint_banner(self.case_banner, SUSPECT_HUE if live else CAUTION_HUE, 0.35 if live else 0.12)
        self.case_banner.setVisible(True)

    def _status(self, text: str, error: bool = False) -> None:
        self.status.setText(text)
        font = self.status.font()
        font.setBold(error)
        self.status.setFont(font)

    def _escape_from_step(self) -> None:
        field = self.panels["guided"].card.field
        if field.text():
            field.set_text("")
        else:
            self.controller.back_to_cases()

    # --- the intake ticket ------------------------------------------------------------------------

    def print_intake_ticket(self, path: str | None = None) -> None:
        """Print the open case's ticket (Qt's print dialog), or write it to ``path`` as a PDF."""
        case = self.controller.view.case
        if case is None:
            return
        store = self.context.store

        def printed(ticket) -> None:
            from fixbench.ui.bench.ticket_print import print_ticket, write_ticket_pdf

            try:
                if path is not None:
                    write_ticket_pdf(ticket, path)
                elif not print_ticket(self, ticket):
                    return
            except (OSError, ValueError) as err:
                self._status(f"\u26a0 The ticket was not printed: {err}", error=True)
                return
            self._status(f"Intake ticket {ticket.ticket} printed.")

        run_in_background(lambda: intake_ticket(store, case.id), printed,
                          lambda err: self._status(f"\u26a0 The ticket was not printed: {err}",
                                                   error=True))

    # --- first start ---------------------------------------------------------------------------

    def _add_demo_offer(self) -> None:
        offer = self.panels["cases"].empty_offer
        layout = QVBoxLayout(offer)
        box = banner(CAUTION_HUE)
        inner = QVBoxLayout(box)
        inner.addWidget(heading("This shop has no records yet", factor=1.15))
        text = QLabel("Open the demo shop to look around: a made-up shop with made-up people and "
                      "units, about two years of cases. Or add your name above and press Ctrl+N to "
                      "take in the first real unit.")
        text.setWordWrap(True)
        inner.addWidget(text)
        self.demo_button = QPushButton("Open the demo shop (Alt+D)")
        self.demo_button.setToolTip("Switch this window to the demo shop's database")
        bind_keys(self.demo_button, "Alt+D")
        self.demo_button.clicked.connect(self.demo_wanted)
        inner.addWidget(self.demo_button, 0, Qt.AlignmentFlag.AlignLeft)
        layout.addWidget(box)

    def _offer_demo_if_empty(self) -> None:
        from fixbench.workflows.shop import has_records

        self.panels["cases"].empty_offer.setVisible(not has_records(self.context.store))
