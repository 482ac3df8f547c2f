"""The owner's figures summed from the store's few counts, with faults and parts by what they are.

The store counts jobs per device model and per (family, fault id, part id)
(:func:`fixbench.store.chart_counts.model_fault_counts`), per month and per technician. Here those
small tables are summed into each figure the screens show. A fault or part is labelled and counted
by its title in its own family: "Q1.short" is "Switching MOSFET shorted" in a flyback and
"Switching transistor shorted" in a self-oscillating charger, two bars; a title two families share
is one bar. Each such row carries its (family, id) pairs, the History filter for its jobs.

Every row here equals what the store's own figure functions count (tests hold them row for row).
"""

from __future__ import annotations

from functools import cache

from fixbench.store.shop_terms import labour_cents as cents_of
from fixbench.store.owner_figures import Figure
from fixbench.workflows.trade_names import TradeNames

MONEY_COLUMNS = ("jobs", "unpriced", "revenue_cents", "parts_cents", "labour_cents",
                 "margin_cents")
TABLE_FAULTS = 6  # faults given their own column in the model x fault table


class _Tally:
    """Sums of some columns of the counted rows, and the (family, id) pairs summed into them."""

    __slots__ = ("values", "keys")

    def __init__(self, width: int) -> None:
        self.values = [0] * width
        self.keys: set = set()

    def add(self, values, key=None) -> None:
        self.values = [a + (b or 0) for a, b in zip(self.values, values)]
        if key is not None:
            self.keys.add(key)


def quantiles(counts: dict[int, int]) -> tuple:
    """Jobs, median, lower and upper quartile of whole-number values given as value -> jobs,
    by the store's rule (:func:`fixbench.store.owner_figures._quantiles`): the median by the
    midpoint rule, quartiles at nearest rank ceil(p * n) (Hyndman & Fan 1996, definition 2
    family); all None when there are none."""
    n = sum(counts.values())
    if not n:
        return (None, None, None, None)
    values = sorted(counts.items())

    def at(rank: int) -> int:
        running = 0
        for value, jobs in values:
            running += jobs
            if running >= rank:
                return value
        raise ValueError(rank)

    return (n, (at((n + 1) // 2) + at((n + 2) // 2)) / 2.0, at((n + 3) // 4),
            at((3 * n + 3) // 4))


def minutes_figures(counted: Figure, people: Figure, bin_minutes: int) -> dict[str, Figure]:
    """Bench minutes as bands, as a median and quartiles, and per technician (the columns of
    ``owner_figures.per_technician`` first, then comebacks and money), from the jobs counted per
    technician and whole minute."""
    whole: dict[int, int] = {}
    bands: dict[int, int] = {}
    per_person: dict[int, dict[int, int]] = {}
    for technician, minutes, jobs in counted.rows:
        whole[minutes] = whole.get(minutes, 0) + jobs
        band = minutes // bin_minutes * bin_minutes
        bands[band] = bands.get(band, 0) + jobs
        mine = per_person.setdefault(technician, {})
        mine[minutes] = mine.get(minutes, 0) + jobs
    technicians = tuple((*row[:5], *quantiles(per_person.get(row[10], {}))[1:], *row[5:10])
                        for row in people.rows)
    return {
        "minutes_bands": Figure("Bench minutes", ("from_minutes", "cases"),
                                tuple(sorted(bands.items()))),
        "minutes": Figure("Bench minutes", ("cases", "median_minutes", "p25_minutes",
                                            "p75_minutes"), (quantiles(whole),)),
        "technicians": Figure("Per technician", (
            "name", "closed", "repaired", "first_time_fix_rate", "comeback_rate",
            "median_minutes", "p25_minutes", "p75_minutes", "comebacks", "unpriced",
            "revenue_cents", "parts_cents", "labour_cent_minutes"), technicians)}


def turnaround_figures(counted: Figure) -> dict[str, Figure]:
    """Hours from intake to handed back, over the period and per month taken in."""
    whole: dict[int, int] = {}
    months: dict[str, dict[int, int]] = {}
    for month, hours, jobs in counted.rows:
        whole[hours] = whole.get(hours, 0) + jobs
        mine = months.setdefault(month, {})
        mine[hours] = mine.get(hours, 0) + jobs
    return {
        "turnaround": Figure("Turnaround (hours)", ("cases", "median_hours", "p25_hours",
                                                     "p75_hours"), (quantiles(whole),)),
        "turnaround_by_month": Figure(
            "Turnaround by month (hours)", ("month", "cases", "median_hours", "p25_hours",
                                            "p75_hours"),
            tuple((month, *quantiles(months[month])) for month in sorted(months)))}


def _rate(part: int, whole: int) -> float | None:
    return part / whole if whole else None


def _money(unpriced: int, revenue: int, parts: int, cent_minutes: int, jobs: int) -> tuple:
    labour = cents_of(cent_minutes)
    return (jobs, unpriced, revenue, parts, labour, revenue - parts - labour)


class FigureTables:
    """The figures of one period from its three counts. The model-and-fault count is summed in one
    pass, by fault title, part title, model, and model and fault title together."""

    def __init__(self, names: TradeNames, model_fault: Figure, technicians: Figure,
                 months: Figure) -> None:
        self.names = names
        self.people = technicians.rows
        self.months = months.rows
        fault_label, part_label = cache(names.fault_label), cache(names.part_label)
        self.faults: dict[str, _Tally] = {}
        self.parts: dict[str, _Tally] = {}
        self.by_model: dict[tuple[str, str], _Tally] = {}
        self.crossed: dict[tuple[str, str | None], int] = {}
        self.confirmed = [0, 0]  # cases with a confirmed fault, first-suspect hits among them
        # Each row: make, model, family, fault, part, cases, repaired, hits, came_back, unpriced,
        # revenue, parts, labour cent-minutes, returns, return minutes.
        for row in model_fault.rows:
            family, fault, part, cases = row[2], row[3], row[4], row[5]
            self.by_model.setdefault((row[0], row[1]), _Tally(10)).add(row[5:15])
            model = f"{row[0]} {row[1]}"
            title = fault_label(fault, family) if fault else None
            self.crossed[(model, title)] = self.crossed.get((model, title), 0) + cases
            if title is not None:
                self.faults.setdefault(title, _Tally(8)).add(row[5:13], (family, fault))
                self.confirmed[0] += cases
                self.confirmed[1] += row[7] or 0
            if part:
                self.parts.setdefault(part_label(part, family), _Tally(2)).add(
                    row[5:7], (family, part))

    def _models_named(self) -> dict[str, _Tally]:
        return {f"{make} {model}": t for (make, model), t in self.by_model.items()}

    # --- what goes wrong ------------------------------------------------------------------------

    def by_what(self, what: str) -> Figure:
        """Cases and repaired per fault (or part) title, most first; the last column is the
        (family, id) pairs behind each title."""
        totals = self.faults if what == "fault" else self.parts
        rows = sorted(((name, t.values[0], t.values[1], tuple(sorted(t.keys)))
                       for name, t in totals.items()), key=lambda r: (-r[1], r[0]))
        return Figure(f"Cases by confirmed {what}", (what, "cases", "repaired", "key"),
                      tuple(rows))

    def first_suspect(self) -> Figure:
        cases, hits = self.confirmed
        return Figure("Engine's first suspect was the confirmed fault",
                      ("confirmed", "hits", "hit_rate"),
                      ((cases, hits if self.faults else None, hits / cases if cases else None),))

    def models(self) -> Figure:
        rows = sorted(((*model, t.values[0], t.values[1]) for model, t in self.by_model.items()),
                      key=lambda r: (-r[2], r[0], r[1]))
        return Figure("Cases by device model", ("make", "model", "cases", "repaired"), tuple(rows))

    def model_faults(self, columns: int = TABLE_FAULTS) -> Figure:
        """Rows: models, most cases first; columns: the most frequent faults, the rest, total."""
        top = [row[0] for row in self.by_what("fault").rows[:columns]]
        table: dict[str, dict[str, int]] = {}
        for (model, fault), cases in self.crossed.items():
            column = fault if fault in top else ("other faults" if fault else "no fault confirmed")
            counts = table.setdefault(model, {})
            counts[column] = counts.get(column, 0) + cases
        heads = (*top, "other faults", "no fault confirmed")
        rows = sorted(((model, *(c.get(h, 0) for h in heads), sum(c.values()))
                       for model, c in table.items()), key=lambda r: (-r[-1], r[0]))
        return Figure("Faults by device model", ("model", *heads, "cases"), tuple(rows))

    # --- comebacks ------------------------------------------------------------------------------

    def comebacks_by(self, what: str) -> Figure:
        """Repaired, came back and the comeback rate per model, fault title or technician, the
        highest rate first."""
        if what == "technician":
            rows = [(r[0], r[2], r[8], _rate(r[8], r[2])) for r in self.people]
            return Figure("Comebacks by technician",
                          ("technician", "repaired", "came_back", "comeback_rate"), tuple(rows))
        # repaired and came back: columns 1 and 3 of either tally
        totals = self._models_named() if what == "model" else self.faults
        rows = [(name, t.values[1], t.values[3], _rate(t.values[3], t.values[1]))
                + ((tuple(sorted(t.keys)),) if what == "fault" else ())
                for name, t in totals.items()]
        rows.sort(key=lambda r: (-(r[3] or 0), -r[1], r[0]))
        columns = (what, "repaired", "came_back", "comeback_rate") + (
            ("key",) if what == "fault" else ())
        return Figure(f"Comebacks by {what}", columns, tuple(rows))

    def model_comebacks(self) -> Figure:
        """Per model: repaired, came back, the rate, warranty returns taken in, their minutes."""
        rows = sorted(((model, t.values[1], t.values[3], _rate(t.values[3], t.values[1]),
                        t.values[8], t.values[9]) for model, t in self._models_named().items()),
                      key=lambda r: (-r[2], -r[1], r[0]))
        return Figure("Comebacks by device model", ("model", "repaired", "came_back",
                                                   "comeback_rate", "returns", "return_minutes"),
                      tuple(rows))

    # --- money ---------------------------------------------------------------------------------

    def money_by(self, what: str) -> Figure:
        """Jobs, unpriced, revenue, parts, labour and margin (cents) per month, model, fault
        title or technician."""
        if what == "month":
            rows = [(r[0], *_money(r[7], r[8], r[9], r[10], r[1])) for r in self.months]
        elif what == "technician":
            rows = [(r[0], *_money(r[9], r[10], r[11], r[12], r[1])) for r in self.people]
        else:
            # jobs 0, unpriced 4, revenue 5, parts 6, labour cent-minutes 7 of either tally
            totals = self._models_named() if what == "model" else self.faults
            rows = [(name, *_money(t.values[4], t.values[5], t.values[6], t.values[7],
                                   t.values[0])) for name, t in totals.items()]
            rows.sort(key=lambda r: (-r[-1], r[0]))
        return Figure(f"Money by {what}", (what, *MONEY_COLUMNS), tuple(rows))

    def comeback_cost(self) -> Figure:
        """The period's warranty returns: returns, minutes, parts, labour, cost, charged."""
        returns = sum(r[11] for r in self.months)
        minutes = sum(r[12] for r in self.months)
        parts = sum(r[13] for r in self.months)
        labour = cents_of(sum(r[14] for r in self.months))
        charged = sum(r[15] for r in self.months)
        return Figure("The cost of comebacks", ("returns", "minutes", "parts_cents",
                                                "labour_cents", "cost_cents", "charged_cents"),
                      ((returns, minutes, parts, labour, parts + labour, charged),))
