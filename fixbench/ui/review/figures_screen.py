"""The Figures screen: the shop's numbers for a chosen period, family or device model, as charts
and tables on six pages (overview, faults and parts, comebacks, people, turnaround, money).

The figures are counted off the GUI thread, one query after another, and each chart is drawn as
soon as its figure arrives (:mod:`fixbench.ui.review.figure_pages`); when the last one is in, the
screen holds them all as a :class:`FiguresSnapshot`. Widgets forward clicks: a click on a fault,
part, device-model or technician bar (or a comeback bar) emits
:attr:`FiguresScreen.filter_requested` with the History filter for those cases (connected to
``HistoryScreen.apply_filter``).
"""

from __future__ import annotations

from datetime import date

from PySide6.QtCore import QDate, QObject, Signal
from PySide6.QtWidgets import (QComboBox, QDateEdit, QHBoxLayout, QLabel, QPushButton, QTabWidget,
                               QVBoxLayout, QWidget)

from fixbench.ui.context import AppContext
from fixbench.ui.review.busy import BusyStrip
from fixbench.ui.review.figure_pages import PAGES, FigurePages
from fixbench.ui.review.report_actions import ReportActions
from fixbench.ui.workers import run_in_background
from fixbench.workflows.figures_snapshot import (FiguresSnapshot, count_figures, days_text,
                                                 minutes_text, percent, snapshot_of)
from fixbench.workflows.money import money_text
from fixbench.workflows.review import (CaseFilter, Figure, FilterChoices, filter_choices,
                                       newest_twelve_months)
from fixbench.workflows.shop import shop_terms
from fixbench.workflows.trade_names import family_name


class _FigureRelay(QObject):
    """Carries each figure from the counting thread to the screen the moment it is counted."""

    counted = Signal(int, object, str, object)  # generation, CaseFilter, figure name, Figure


class FiguresScreen(QWidget):
    filter_requested = Signal(dict)

    def __init__(self, context: AppContext, parent=None, first_page: int = 0) -> None:
        super().__init__(parent)
        self.context = context
        self.currency = shop_terms(context.store).currency
        self.snapshot: FiguresSnapshot | None = None
        self.choices: FilterChoices | None = None
        self.generation = 0
        # Not a child of the screen: the counting thread may still emit on it after a close.
        self.relay = _FigureRelay()
        self.relay.counted.connect(self._draw_figure)
        # Start counting before the charts are built: nothing is delivered before the event loop
        # runs again, and by then every chart exists.
        self._count(None)
        self.since, self.until = QDateEdit(calendarPopup=True), QDateEdit(calendarPopup=True)
        for edit in (self.since, self.until):
            edit.setDisplayFormat("yyyy-MM-dd")
        self.family, self.device = QComboBox(), QComboBox()
        for combo in (self.family, self.device):
            combo.setSizeAdjustPolicy(QComboBox.SizeAdjustPolicy.AdjustToContents)
        self.show_button = QPushButton("&Show figures")
        self.busy = BusyStrip()
        self.actions = ReportActions(context, self, self.busy)
        self.summary_button = QPushButton("&Monthly summary (PDF)...")
        bar = QHBoxLayout()
        for label, widget in (("&From", self.since), ("&To", self.until), ("Fa&mily", self.family),
                              ("&Device", self.device)):
            caption = QLabel(label)
            caption.setBuddy(widget)
            bar.addWidget(caption)
            bar.addWidget(widget)
        bar.addWidget(self.show_button)
        bar.addStretch(1)
        bar.addWidget(self.summary_button)
        self.headline = QLabel(wordWrap=True)
        self.headline.setStyleSheet("font-size: 11pt; padding: 4px 2px;")
        self.charts = FigurePages(self.currency)
        self.pages = QTabWidget()
        for page, title in zip(self.charts.widgets, PAGES):
            self.pages.addTab(page, title)
        self.pages.setCurrentIndex(first_page)
        layout = QVBoxLayout(self)
        layout.addLayout(bar)
        layout.addWidget(self.busy)
        layout.addWidget(self.headline)
        layout.addWidget(self.pages, 1)
        # Empty charts are not worth painting (pyqtgraph paints each a few times as it settles);
        # the pages are painted once the first figure is drawn on them.
        self.pages.setUpdatesEnabled(False)
        self.show_button.clicked.connect(self.refresh)
        self.summary_button.clicked.connect(lambda: self.actions.monthly_summary(self._qdate(self.until)))
        charts = self.charts
        charts.faults.bar_clicked.connect(lambda i: self._key_bar("fault", self.snapshot.faults, i))
        charts.parts.bar_clicked.connect(lambda i: self._key_bar("part", self.snapshot.parts, i))
        charts.models.bar_clicked.connect(self._model_bar)
        charts.people.bar_clicked.connect(
            lambda i: self._person_bar(charts.people.rows[i][0]))
        charts.comeback_people.bar_clicked.connect(
            lambda i: self._person_bar(charts.comeback_people.rows[i][0], returns="came_back"))
        charts.comeback_models.bar_clicked.connect(self._comeback_model_bar)
        charts.comeback_faults.bar_clicked.connect(
            lambda i: self._emit(fault=charts.comeback_faults.rows[i][4], returns="came_back"))
        self.busy.set_busy(True)

    def _count(self, scope: CaseFilter | None) -> None:
        """Count the figures of ``scope`` off the GUI thread; ``None`` is the first count, of the
        twelve months up to the newest case, after which the filter lists are filled (so the two
        do not compete for the database while the owner waits for the charts)."""
        self.generation += 1
        self.drawn: set[str] = set()  # the figures drawn for the newest count
        generation, store, relay = self.generation, self.context.store, self.relay
        knowledge = self.context.knowledge

        def work():
            chosen = scope if scope is not None else newest_twelve_months(store)
            counted = {}
            for name, figure in count_figures(store, knowledge, chosen):
                counted[name] = figure
                relay.counted.emit(generation, chosen, name, figure)
            return generation, snapshot_of(chosen, counted)

        def done(result) -> None:
            counted_generation, snap = result
            if scope is None:
                if counted_generation == self.generation:
                    for edit, day in ((self.since, snap.scope.since),
                                      (self.until, snap.scope.until)):
                        edit.setDate(QDate(day.year, day.month, day.day))
                run_in_background(lambda: filter_choices(store), self._set_choices, self._failed)
            self._show(counted_generation, snap)

        run_in_background(work, done, self._failed)

    def _set_choices(self, choices: FilterChoices) -> None:
        self.choices = choices
        self.family.addItem("Every family", None)
        for family in choices.families:
            self.family.addItem(family_name(family), family)
        self.device.addItem("Every device", None)
        for make, model in choices.devices:
            self.device.addItem(f"{make} {model}", f"{make}\t{model}")

    @staticmethod
    def _qdate(edit: QDateEdit) -> date:
        chosen = edit.date()
        return date(chosen.year(), chosen.month(), chosen.day())

    def scope(self) -> CaseFilter:
        device = self.device.currentData()
        make, model = device.split("\t", 1) if device else (None, None)
        return CaseFilter(since=self._qdate(self.since), until=self._qdate(self.until),
                          family=self.family.currentData(), make=make, model=model)

    def refresh(self) -> None:
        self.busy.set_busy(True)
        self.busy.tell("Counting...")
        self._count(self.scope())

    def _show(self, generation: int, snap: FiguresSnapshot) -> None:
        """Every figure is in (and its chart drawn): keep them and write the headline."""
        if generation != self.generation:
            return
        self.busy.set_busy(False)
        self.busy.tell("")
        self.snapshot = snap
        head = snap.headline()
        money = (f" Charged <b>{money_text(head['revenue_cents'], self.currency)}</b>, margin "
                 f"<b>{money_text(head['margin_cents'], self.currency)}</b>.")
        self.headline.setText(
            f"<b>{head['closed']}</b> closed cases, <b>{head['repaired']}</b> repaired. "
            f"First-time fix <b>{percent(head['first_time_fix_rate'])}</b>, came back "
            f"<b>{percent(head['comeback_rate'])}</b>. Bench time median "
            f"<b>{minutes_text(head['median_minutes'])}</b> (middle half "
            f"{minutes_text(head['p25_minutes'])} to {minutes_text(head['p75_minutes'])}); "
            f"intake to handed back <b>{days_text(head['median_turnaround_days'])}</b>; "
            f"<b>{head['open_jobs']}</b> open at the end.{money} "
            f"Engine's first suspect was the confirmed fault in "
            f"<b>{percent(head['first_suspect_rate'])}</b> of {head['first_suspect_confirmed']} cases.")

    def _draw_figure(self, generation: int, _scope: CaseFilter, name: str, figure: Figure) -> None:
        if generation == self.generation and self.charts.draw(name, figure):
            self.drawn.add(name)
            self.pages.setUpdatesEnabled(True)

    def _failed(self, err: Exception) -> None:
        self.pages.setUpdatesEnabled(True)
        self.busy.set_busy(False)
        self.busy.warn(f"The figures could not be counted: {err}")

    # Bar clicks: the History filter for the cases behind the bar.
    def _emit(self, **extra) -> None:
        self._connect_history()
        self.filter_requested.emit({**self.snapshot.scope.as_dict(), **extra})

    def _key_bar(self, key: str, figure, index: int) -> None:
        """A fault or part bar: the (family, id) pairs behind its name."""
        self._emit(**{key: figure.rows[index][-1]})

    def _model_bar(self, index: int) -> None:
        make, model = self.snapshot.models.rows[index][:2]
        self._emit(make=make, model=model)

    def _comeback_model_bar(self, index: int) -> None:
        label = self.charts.comeback_models.rows[index][0]
        if self.choices is None:
            self.busy.tell("The lists are still loading; click again in a moment.")
            return
        found = [(m, n) for m, n in self.choices.devices if f"{m} {n}" == label]
        if found:
            self._emit(make=found[0][0], model=found[0][1], returns="came_back")

    def _person_bar(self, name: str, **extra) -> None:
        if self.choices is None:
            self.busy.tell("The lists are still loading; click again in a moment.")
            return
        ids = [pid for pid, person in self.choices.technicians if person == name]
        if ids:
            self._emit(technician_id=ids[0], **extra)

    def _connect_history(self) -> None:
        """Reach the History screen through the main window's screens, once, if it is there."""
        screens = getattr(self.window(), "screens", None)
        history = screens.get("History") if isinstance(screens, dict) else None
        if history is not None and not getattr(self, "_history_wired", False):
            self.filter_requested.connect(history.apply_filter)
            self._history_wired = True
