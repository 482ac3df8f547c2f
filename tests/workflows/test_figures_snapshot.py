"""The Figures screen's data: figures counted together are row for row the store's own figures."""

from __future__ import annotations

from datetime import date

import pytest

from fixbench.store import owner_figures as store_figures
from fixbench.store.case_filters import CaseFilter, filter_choices
from fixbench.workflows.figures_snapshot import TOP_BARS, compute_figures, count_figures


def _scopes(store) -> list[CaseFilter]:
    choices = filter_choices(store)
    last = choices.last_opened.date()
    make, model = choices.devices[0]
    return [CaseFilter(),
            CaseFilter(since=date(last.year - 1, last.month, 1), until=last),
            CaseFilter(family=choices.families[0]),
            CaseFilter(make=make, model=model),
            CaseFilter(since=date(1990, 1, 1), until=date(1990, 12, 31))]  # no cases at all


def test_faults_parts_and_first_suspect_equal_the_store_figures(demo_store):
    for scope in _scopes(demo_store):
        snap = compute_figures(demo_store, scope)
        period = scope.closed()
        assert snap.faults.rows == store_figures.cases_by_fault(demo_store, period).rows[:TOP_BARS]
        assert snap.parts.rows == store_figures.cases_by_part(demo_store, period).rows[:TOP_BARS]
        assert snap.first_suspect == store_figures.first_suspect_hits(demo_store, period)
        assert snap.faults.columns == store_figures.cases_by_fault(demo_store, period).columns


def test_the_whole_period_rates_equal_the_store_rates(demo_store):
    for scope in _scopes(demo_store):
        snap = compute_figures(demo_store, scope)
        expected = store_figures.repair_rates(demo_store, scope.closed()).rows[0]
        shown = snap.rates.rows[0]
        assert shown[:2] == expected[:2]
        if expected[1]:
            assert shown[2:] == pytest.approx(expected[2:])
        else:
            assert shown[2:] == expected[2:] == (None, None)


def test_the_first_page_figures_are_counted_first(demo_store):
    names = [name for name, _figure in count_figures(demo_store, CaseFilter())]
    assert names[:2] == ["rates_by_month", "minutes_bands"]
    assert sorted(names) == sorted(["rates_by_month", "minutes_bands", "minutes", "faults",
                                    "parts", "first_suspect", "models", "technicians",
                                    "practice"])
