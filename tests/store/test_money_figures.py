"""Money figures, recomputed by hand from the plan of a small shop written in the test: revenue,
parts, labour at each job's own rate (the shop's rate now where none was kept), margin, and the
cost of comebacks."""

from __future__ import annotations

from collections import defaultdict

import pytest

from fixbench.store import money_figures as money
from fixbench.store.owner_figures import Period
from tests.store.money_shop import (PLAN, RATE_NOW, RETURNS, TECHNICIANS, closed_jobs, labour,
                                    model_of, write_money_shop)


@pytest.fixture
def shop(store):
    write_money_shop(store)
    return store


def _expected(jobs) -> tuple:
    revenue = sum(job.price or 0 for job in jobs)
    parts = sum(sum(job.parts) for job in jobs)
    work = labour(jobs)
    return (len(jobs), sum(job.price is None for job in jobs), revenue, parts, work,
            revenue - parts - work)


def _grouped(key) -> dict:
    groups = defaultdict(list)
    for job in closed_jobs():
        groups[key(job)].append(job)
    return {name: _expected(jobs) for name, jobs in groups.items()}


def test_money_by_month_equals_the_plan(shop):
    figure = money.money_by_month(shop, Period(), RATE_NOW)
    assert figure.columns[1:] == money.MONEY_COLUMNS
    assert {row[0]: row[1:] for row in figure.rows} == _grouped(lambda j: f"{j.opened:%Y-%m}")


def test_money_by_model_fault_and_technician_equal_the_plan(shop):
    by_model = {(r[0], r[1]): r[2:] for r in money.money_by_model(shop, Period(), RATE_NOW).rows}
    assert by_model == _grouped(model_of)
    by_fault = {(r[0], r[1]): r[2:] for r in money.money_by_fault(shop, Period(), RATE_NOW).rows}
    assert by_fault == {key: value for key, value in
                        _grouped(lambda j: (j.family, j.fault)).items() if key[1] is not None}
    by_person = {r[0]: r[1:] for r in money.money_by_technician(shop, Period(), RATE_NOW).rows}
    assert by_person == _grouped(lambda j: TECHNICIANS[j.tech])


def test_margin_is_revenue_less_parts_less_labour(shop):
    for row in money.money_by_month(shop, Period(), RATE_NOW).rows:
        _month, _jobs, _unpriced, revenue, parts, work, margin = row
        assert margin == revenue - parts - work


def test_a_job_without_a_kept_rate_is_costed_at_the_rate_now(shop):
    (m2,) = [job for job in PLAN if job.ticket == "M2"]
    assert m2.rate is None
    by_fault = {(r[0], r[1]): r for r in money.money_by_fault(shop, Period(), RATE_NOW).rows}
    c1 = [job for job in closed_jobs() if job.fault == "C1.dried"]
    # 25 min at 30.00 an hour plus M8's 45 min at 36.00: 12.50 + 27.00.
    assert by_fault[("pwm_flyback", "C1.dried")][6] == labour(c1) == 1250 + 2700


def test_cost_of_comebacks_is_the_time_and_parts_spent_again(shop):
    returns = [job for job in closed_jobs() if job.ticket in RETURNS]
    (row,) = money.comeback_cost(shop, Period(), RATE_NOW).rows
    parts = sum(sum(job.parts) for job in returns)
    assert row == (len(returns), sum(job.minutes for job in returns), parts, labour(returns),
                   parts + labour(returns), sum(job.price or 0 for job in returns))
