"""The Figures screen's pages and what each draws from the figures it is given.

Each page holds its charts and tables and knows which named figure (from
:mod:`fixbench.workflows.figures_snapshot`) each one is drawn from; the screen hands every figure
over as it arrives. Bars that list cases when clicked emit ``bar_clicked`` on their chart; the
screen turns a click into the History filter.
"""

from __future__ import annotations

from collections.abc import Callable

from PySide6.QtWidgets import (QGridLayout, QHeaderView, QLabel, QTableView, QVBoxLayout, QWidget)

from fixbench.ui.review.charts import AgeBars, BarChart, MinutesSpread, MonthLines
from fixbench.ui.review.figure_table_model import FigureTableModel
from fixbench.workflows.figures_snapshot import AGE_BANDS
from fixbench.workflows.money import money_text
from fixbench.workflows.review import MINUTES_BIN, Figure

PAGES = ("&Overview", "Faults and &parts", "&Comebacks", "Peop&le", "&Turnaround", "Mone&y")
PEOPLE_COLUMNS = ("name", "closed", "repaired", "first_time_fix_rate", "comeback_rate",
                  "median_minutes", "p25_minutes", "p75_minutes")


def _percent(value: float) -> str:
    return f"{value:.0f} %"


def _table(currency: str) -> tuple[QTableView, FigureTableModel]:
    view, model = QTableView(), FigureTableModel(currency=currency)
    view.setModel(model)
    view.verticalHeader().hide()
    header = view.horizontalHeader()
    header.setSectionResizeMode(QHeaderView.ResizeMode.ResizeToContents)
    header.setResizeContentsPrecision(40)  # widths from the first rows: a shop may have 400 models
    return view, model


def _grid(items) -> QWidget:
    page = QWidget()
    grid = QGridLayout(page)
    for widget, *place in items:
        grid.addWidget(widget, *place)
    return page


class FigurePages:
    """Every chart and table of the Figures screen, on its pages."""

    def __init__(self, currency: str = "") -> None:
        self.currency = currency
        money = lambda v: money_text(round(v * 100), currency)  # noqa: E731 - bars are in units
        self.volume = MonthLines("Closed cases, by month taken in", unit="cases")
        self.first_time = MonthLines("First-time fix, % of repairs", scale=100, unit="%",
                                     ceiling=100, legend=False)
        self.came_back = MonthLines("Came back under warranty, % of repairs", scale=100, unit="%",
                                    ceiling=100, legend=False)
        self.minutes = MinutesSpread("Bench minutes per case")
        self.faults = BarChart("Most frequent confirmed faults")
        self.parts = BarChart("Parts most often at fault")
        self.models = BarChart("Cases by device model")
        self.model_faults, self.model_faults_model = _table(currency)
        self.comeback_people = BarChart("Came back, % of each technician's repairs",
                                        value_text=_percent)
        self.comeback_models = BarChart("Came back, % of repairs by model", value_text=_percent)
        self.comeback_faults = BarChart("Came back, % of repairs by fault", value_text=_percent)
        self.model_comebacks, self.model_comebacks_model = _table(currency)
        self.comeback_cost = QLabel(wordWrap=True)
        self.people_table, self.people_model = _table(currency)
        self.people = BarChart("Median bench minutes per case, by technician")
        self.practice = MonthLines("Trainees' practice: mean score per month (out of 100)",
                                   unit="score", ceiling=100)
        self.turnaround = MonthLines("Median days from intake to handed back, by month taken in",
                                     unit="days", legend=False)
        self.backlog = AgeBars("Jobs still open at the end of the period, by days waiting")
        self.money_months = MonthLines("Money by month taken in", scale=0.01,
                                       unit=currency or "amount", allow_negative=True)
        self.margins = BarChart("Margin by device model", value_text=money)
        self.money_people, self.money_people_model = _table(currency)
        comebacks = QWidget()
        column = QVBoxLayout(comebacks)
        column.setContentsMargins(0, 0, 0, 0)
        column.addWidget(self.model_comebacks, 1)
        column.addWidget(self.comeback_cost)
        self.widgets = [
            _grid([(self.volume, 0, 0), (self.first_time, 0, 1), (self.came_back, 1, 0),
                   (self.minutes, 1, 1)]),
            _grid([(self.faults, 0, 0), (self.parts, 0, 1), (self.models, 1, 0),
                   (self.model_faults, 1, 1)]),
            _grid([(self.comeback_people, 0, 0), (self.comeback_models, 0, 1),
                   (self.comeback_faults, 1, 0), (comebacks, 1, 1)]),
            _grid([(self.people_table, 0, 0), (self.people, 0, 1), (self.practice, 1, 0, 1, 2)]),
            _grid([(self.turnaround, 0, 0), (self.backlog, 0, 1)]),
            _grid([(self.money_months, 0, 0, 1, 2), (self.margins, 1, 0),
                   (self.money_people, 1, 1)]),
        ]
        self.drawers: dict[str, Callable[[Figure], None]] = {
            "rates_by_month": self._months, "minutes_bands": self._minutes,
            "faults": lambda f: self.faults.show_bars([r[0] for r in f.rows], [r[1] for r in f.rows]),
            "parts": lambda f: self.parts.show_bars([r[0] for r in f.rows], [r[1] for r in f.rows]),
            "models": lambda f: self.models.show_bars([f"{r[0]} {r[1]}" for r in f.rows],
                                                      [r[2] for r in f.rows]),
            "model_faults": self.model_faults_model.show_figure,
            "comebacks_by_technician": lambda f: self._rates(self.comeback_people, f),
            "comebacks_by_model": lambda f: self._rates(self.comeback_models, f),
            "comebacks_by_fault": lambda f: self._rates(self.comeback_faults, f),
            "model_comebacks": self.model_comebacks_model.show_figure,
            "comeback_cost": self._comeback_cost,
            "technicians": self._people, "practice": self._practice,
            "turnaround_by_month": self._turnaround, "backlog": self._backlog,
            "money_by_month": self._money_months,
            "money_by_model": lambda f: self.margins.show_bars(
                [r[0] for r in f.rows], [r[6] / 100 for r in f.rows]),
            "money_by_technician": self.money_people_model.show_figure,
        }

    def draw(self, name: str, figure: Figure) -> bool:
        drawer = self.drawers.get(name)
        if drawer is not None:
            drawer(figure)
        return drawer is not None

    def _months(self, monthly: Figure) -> None:
        months = [row[0] for row in monthly.rows]
        self.volume.show_lines(months, {"closed": [row[1] for row in monthly.rows],
                                        "repaired": [row[2] for row in monthly.rows]})
        self.first_time.show_lines(months, {"first-time fix": [row[3] for row in monthly.rows]})
        self.came_back.show_lines(months, {"came back": [row[4] for row in monthly.rows]})

    def _minutes(self, bands: Figure) -> None:
        self.minutes.show_bands([r[0] for r in bands.rows], [r[1] for r in bands.rows],
                                MINUTES_BIN)

    @staticmethod
    def _rates(chart: BarChart, figure: Figure) -> None:
        rows = [r for r in figure.rows if r[3] is not None]
        chart.show_bars([f"{r[0]} ({r[2]} of {r[1]})" for r in rows], [r[3] * 100 for r in rows])
        chart.rows = rows

    def _comeback_cost(self, cost: Figure) -> None:
        returns, minutes, parts, labour, total, charged = cost.rows[0]
        self.comeback_cost.setText(
            f"<b>The cost of comebacks:</b> {returns} warranty returns taken in; {minutes} bench "
            f"minutes and {money_text(parts, self.currency)} of parts spent again "
            f"({money_text(labour, self.currency)} of labour, "
            f"{money_text(total, self.currency)} in all); "
            f"{money_text(charged, self.currency)} charged for them.")

    def _people(self, technicians: Figure) -> None:
        self.people_model.show_figure(technicians, PEOPLE_COLUMNS)
        rows = [r for r in technicians.rows if r[5] is not None]
        self.people.show_bars([r[0] for r in rows], [r[5] for r in rows])
        self.people.rows = rows

    def _practice(self, practice: Figure) -> None:
        trainees: dict[str, dict[str, float]] = {}
        for trainee, month, _rounds, score, *_ in practice.rows:
            trainees.setdefault(trainee, {})[month] = score
        months = sorted({row[1] for row in practice.rows})
        self.practice.show_lines(months, {
            name: [scores.get(m) for m in months] for name, scores in trainees.items()})

    def _turnaround(self, by_month: Figure) -> None:
        self.turnaround.show_lines([r[0] for r in by_month.rows],
                                   {"median": [r[2] / 24 for r in by_month.rows]})

    def _backlog(self, backlog: Figure) -> None:
        counts = dict(backlog.rows)
        self.backlog.show_bars([name for _low, name in AGE_BANDS],
                               [counts.get(low, 0) for low, _name in AGE_BANDS])

    def _money_months(self, money: Figure) -> None:
        months = [r[0] for r in money.rows]
        self.money_months.show_lines(months, {
            "charged": [r[3] for r in money.rows], "parts": [r[4] for r in money.rows],
            "labour": [r[5] for r in money.rows], "margin": [r[6] for r in money.rows]})
