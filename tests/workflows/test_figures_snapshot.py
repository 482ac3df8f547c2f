"""The Figures screen's data: figures summed from the shared counts are row for row the store's own
figures, with faults and parts counted by what they are in their family."""

from __future__ import annotations

from collections import defaultdict
from dataclasses import fields
from datetime import date

import pytest

from fixbench.store import comeback_figures, money_figures
from fixbench.store import owner_figures as store_figures
from fixbench.store.case_filters import CaseFilter, filter_choices
from fixbench.store.shop_terms import shop_terms
from fixbench.workflows.figures_snapshot import (TOP_BARS, FiguresSnapshot, compute_figures,
                                                 count_figures)
from fixbench.workflows.trade_names import TradeNames


def _scopes(store) -> list[CaseFilter]:
    choices = filter_choices(store)
    last = choices.last_opened.date()
    make, model = choices.devices[0]
    return [CaseFilter(),
            CaseFilter(since=date(last.year - 1, last.month, 1), until=last),
            CaseFilter(family=choices.families[0]),
            CaseFilter(make=make, model=model),
            CaseFilter(since=date(1990, 1, 1), until=date(1990, 12, 31))]  # no cases at all


def _by_title(rows, label) -> dict:
    """Store rows (family, id, values...) summed per title in the family."""
    totals = defaultdict(lambda: None)
    for family, ident, *values in rows:
        key = label(ident, family)
        totals[key] = values if totals[key] is None else [a + b for a, b in zip(totals[key], values)]
    return dict(totals)


def test_faults_parts_and_first_suspect_equal_the_store_figures(demo_store, knowledge):
    names = TradeNames(knowledge)
    for scope in _scopes(demo_store):
        snap = compute_figures(demo_store, knowledge, scope)
        period = scope.closed()
        faults = _by_title(store_figures.cases_by_fault(demo_store, period).rows,
                           names.fault_label)
        parts = _by_title(store_figures.cases_by_part(demo_store, period).rows, names.part_label)
        assert {r[0]: list(r[1:3]) for r in snap.faults.rows} == dict(
            sorted(faults.items(), key=lambda kv: (-kv[1][0], kv[0]))[:TOP_BARS])
        assert {r[0]: list(r[1:3]) for r in snap.parts.rows} == dict(
            sorted(parts.items(), key=lambda kv: (-kv[1][0], kv[0]))[:TOP_BARS])
        assert snap.first_suspect == store_figures.first_suspect_hits(demo_store, period)


def test_a_fault_title_stands_for_its_family_ids(demo_store, knowledge):
    """Every (family, id) pair behind a bar names that bar's title in its own family."""
    names = TradeNames(knowledge)
    snap = compute_figures(demo_store, knowledge, CaseFilter())
    for title, _cases, _repaired, key in snap.faults.rows:
        assert {names.fault_label(fault, family) for family, fault in key} == {title}


def test_the_whole_period_rates_equal_the_store_rates(demo_store, knowledge):
    for scope in _scopes(demo_store):
        snap = compute_figures(demo_store, knowledge, scope)
        expected = store_figures.repair_rates(demo_store, scope.closed()).rows[0]
        shown = snap.rates.rows[0]
        assert shown[:2] == expected[:2]
        if expected[1]:
            assert shown[2:] == pytest.approx(expected[2:])
        else:
            assert shown[2:] == expected[2:] == (None, None)


def test_money_and_comebacks_equal_the_store_figures(demo_store, knowledge):
    names = TradeNames(knowledge)
    rate = shop_terms(demo_store).labour_rate_cents
    for scope in _scopes(demo_store):
        snap = compute_figures(demo_store, knowledge, scope)
        period = scope.closed()
        assert snap.money_by_month.rows == money_figures.money_by_month(demo_store, period,
                                                                        rate).rows
        by_model = {f"{r[0]} {r[1]}": r[2:] for r in
                    money_figures.money_by_model(demo_store, period, rate).rows}
        assert {r[0]: r[1:] for r in snap.money_by_model.rows} == by_model
        assert snap.money_by_technician.rows == money_figures.money_by_technician(
            demo_store, period, rate).rows
        assert snap.comeback_cost.rows == money_figures.comeback_cost(demo_store, period,
                                                                      rate).rows
        people = comeback_figures.comebacks_by_technician(demo_store, period).rows
        assert [r[:3] for r in snap.comebacks_by_technician.rows] == [r[:3] for r in people]
        by_fault = _by_title([(f, i, rep, back) for f, i, rep, back, _rate in
                              comeback_figures.comebacks_by_fault(demo_store, period).rows],
                             names.fault_label)
        shown = {r[0]: [r[1], r[2]] for r in snap.comebacks_by_fault.rows}
        assert shown == {k: v for k, v in by_fault.items() if k in shown}
        assert len(shown) == min(TOP_BARS, len(by_fault))


def test_every_figure_is_counted_once(demo_store, knowledge):
    names = [name for name, _figure in count_figures(demo_store, knowledge, CaseFilter())]
    derived = {"scope", "by_month", "rates"}  # summed from the monthly counts, not counted
    assert len(names) == len(set(names))
    assert set(names) == {f.name for f in fields(FiguresSnapshot)} - derived
