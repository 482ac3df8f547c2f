"""The Figures screen: the shop's numbers for a chosen period, family or device model, as charts.

The figures are counted off the GUI thread, one query after another, and each chart is drawn as
soon as its figure arrives; when the last one is in, the screen holds them all as a
:class:`FiguresSnapshot`. Widgets forward clicks: a click on a fault, part, device-model or
technician bar emits :attr:`FiguresScreen.filter_requested` with the History filter for those
cases (connected to ``HistoryScreen.apply_filter``).
"""

from __future__ import annotations

from datetime import date

from PySide6.QtCore import QDate, QObject, Signal
from PySide6.QtWidgets import (QComboBox, QDateEdit, QGridLayout, QHBoxLayout, QHeaderView, QLabel,
                               QPushButton, QTableView, QTabWidget, QVBoxLayout, QWidget)

from fixbench.ui.context import AppContext
from fixbench.ui.review.busy import BusyStrip
from fixbench.ui.review.charts import BarChart, MinutesSpread, MonthLines
from fixbench.ui.review.figure_table_model import FigureTableModel
from fixbench.workflows.figures_snapshot import (FiguresSnapshot, count_figures, minutes_text,
                                             percent, snapshot_of)
from fixbench.workflows.trade_names import TradeNames, family_name
from fixbench.ui.review.report_actions import ReportActions
from fixbench.ui.workers import run_in_background
from fixbench.workflows.review import (MINUTES_BIN, CaseFilter, Figure, FilterChoices,
                                       filter_choices, newest_twelve_months)


class _FigureRelay(QObject):
    """Carries each figure from the counting thread to the screen the moment it is counted."""

    counted = Signal(int, object, str, object)  # generation, CaseFilter, figure name, Figure


class FiguresScreen(QWidget):
    filter_requested = Signal(dict)

    def __init__(self, context: AppContext, parent=None) -> None:
        super().__init__(parent)
        self.context = context
        self.names = TradeNames(context.knowledge)
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
        self.volume = MonthLines("Closed cases, by month taken in")
        self.rates = MonthLines("First-time fix and comeback rate per month (%)", percent=True)
        self.minutes = MinutesSpread("Bench minutes per case")
        self.faults, self.parts = BarChart("Most frequent confirmed faults"), BarChart("Parts most often at fault")
        self.models = BarChart("Cases by device model")
        self.people = BarChart("Closed cases per technician")
        self.practice = MonthLines("Trainees' practice: mean score per month (%)", percent=True)
        self.people_table = QTableView()
        self.people_model = FigureTableModel(self)
        self.people_table.setModel(self.people_model)
        self.people_table.horizontalHeader().setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
        self.pages = QTabWidget()
        self.pages.addTab(self._grid([(self.volume, 0, 0), (self.rates, 0, 1),
                                      (self.minutes, 1, 0, 1, 2)]), "&Overview")
        self.pages.addTab(self._grid([(self.faults, 0, 0), (self.parts, 0, 1),
                                      (self.models, 1, 0, 1, 2)]), "Faults and &parts")
        self.pages.addTab(self._grid([(self.people_table, 0, 0), (self.people, 0, 1),
                                      (self.practice, 1, 0, 1, 2)]), "Peop&le")
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
        self.faults.bar_clicked.connect(lambda i: self._bar("fault", self.snapshot.faults, i))
        self.parts.bar_clicked.connect(lambda i: self._bar("part", self.snapshot.parts, i))
        self.models.bar_clicked.connect(self._model_bar)
        self.people.bar_clicked.connect(self._person_bar)
        self.busy.set_busy(True)
        self._draw = {"rates_by_month": self._draw_months, "minutes_bands": self._draw_minutes,
                      "faults": self._draw_faults, "parts": self._draw_parts,
                      "models": self._draw_models, "technicians": self._draw_people,
                      "practice": self._draw_practice}

    @staticmethod
    def _grid(items) -> QWidget:
        page = QWidget()
        grid = QGridLayout(page)
        for widget, *place in items:
            grid.addWidget(widget, *place)
        return page

    def _count(self, scope: CaseFilter | None) -> None:
        """Count the figures of ``scope`` off the GUI thread; ``None`` is the first count, of the
        twelve months up to the newest case, after which the filter lists are filled (so the two
        do not compete for the database while the owner waits for the charts)."""
        self.generation += 1
        generation, store, relay = self.generation, self.context.store, self.relay

        def work():
            chosen = scope if scope is not None else newest_twelve_months(store)
            counted = {}
            for name, figure in count_figures(store, chosen):
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
        self.headline.setText(
            f"<b>{head['closed']}</b> closed cases, <b>{head['repaired']}</b> repaired. "
            f"First-time fix <b>{percent(head['first_time_fix_rate'])}</b>, came back "
            f"<b>{percent(head['comeback_rate'])}</b>. Bench time median "
            f"<b>{minutes_text(head['median_minutes'])}</b> (middle half "
            f"{minutes_text(head['p25_minutes'])} to {minutes_text(head['p75_minutes'])}). "
            f"Engine's first suspect was the confirmed fault in "
            f"<b>{percent(head['first_suspect_rate'])}</b> of {head['first_suspect_confirmed']} cases.")

    def _draw_figure(self, generation: int, scope: CaseFilter, name: str, figure: Figure) -> None:
        if generation == self.generation and name in self._draw:
            self._draw[name](figure, scope)
            self.pages.setUpdatesEnabled(True)

    def _draw_months(self, monthly: Figure, _scope: CaseFilter) -> None:
        months = [row[0] for row in monthly.rows]
        self.volume.show_lines(months, {"closed": [row[1] for row in monthly.rows],
                                        "repaired": [row[2] for row in monthly.rows]})
        self.rates.show_lines(months, {"first-time fix": [row[3] for row in monthly.rows],
                                       "came back": [row[4] for row in monthly.rows]})

    def _draw_minutes(self, bands: Figure, _scope: CaseFilter) -> None:
        self.minutes.show_bands([r[0] for r in bands.rows], [r[1] for r in bands.rows],
                                MINUTES_BIN)

    def _draw_faults(self, faults: Figure, scope: CaseFilter) -> None:
        self.faults.show_bars([self.names.fault_label(r[0], scope.family) for r in faults.rows],
                              [r[1] for r in faults.rows])

    def _draw_parts(self, parts: Figure, scope: CaseFilter) -> None:
        self.parts.show_bars([f"{r[0]}: {self.names.part(r[0], scope.family)}" for r in parts.rows],
                             [r[1] for r in parts.rows])

    def _draw_models(self, models: Figure, _scope: CaseFilter) -> None:
        self.models.show_bars([f"{r[0]} {r[1]}" for r in models.rows], [r[2] for r in models.rows])

    def _draw_people(self, technicians: Figure, _scope: CaseFilter) -> None:
        self.people_model.show_figure(technicians)
        self.people.show_bars([r[0] for r in technicians.rows], [r[1] for r in technicians.rows])

    def _draw_practice(self, practice: Figure, _scope: CaseFilter) -> None:
        trainees: dict[str, dict[str, float]] = {}
        for trainee, month, _rounds, score, *_ in practice.rows:
            trainees.setdefault(trainee, {})[month] = score
        months = sorted({row[1] for row in practice.rows})
        self.practice.show_lines(months, {
            name: [scores.get(m) for m in months] for name, scores in trainees.items()})

    def _failed(self, err: Exception) -> None:
        self.pages.setUpdatesEnabled(True)
        self.busy.set_busy(False)
        self.busy.warn(f"The figures could not be counted: {err}")

    # Bar clicks: the History filter for the cases behind the bar.
    def _emit(self, **extra) -> None:
        self._connect_history()
        self.filter_requested.emit({**self.snapshot.scope.as_dict(), **extra})

    def _bar(self, key: str, figure, index: int) -> None:
        self._emit(**{key: figure.rows[index][0]})

    def _model_bar(self, index: int) -> None:
        make, model = self.snapshot.models.rows[index][:2]
        self._emit(make=make, model=model)

    def _person_bar(self, index: int) -> None:
        name = self.snapshot.technicians.rows[index][0]
        if self.choices is None:
            self.busy.tell("The lists are still loading; click again in a moment.")
            return
        ids = [pid for pid, person in self.choices.technicians if person == name]
        if ids:
            self._emit(technician_id=ids[0])

    def _connect_history(self) -> None:
        """Reach the History screen through the main window's screens, once, if it is there."""
        screens = getattr(self.window(), "screens", None)
        history = screens.get("History") if isinstance(screens, dict) else None
        if history is not None and not getattr(self, "_history_wired", False):
            self.filter_requested.connect(history.apply_filter)
            self._history_wired = True
