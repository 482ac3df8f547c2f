"""Turnaround (intake to handed back) and the backlog of open jobs by age, recomputed from the
plan of a small shop."""

from __future__ import annotations

import math
from datetime import timedelta

import pytest

from fixbench.store import turnaround_figures as turnaround
from fixbench.store.models import Case
from fixbench.store.owner_figures import Period
from tests.store.money_shop import PLAN, T0, closed_jobs, write_money_shop


@pytest.fixture
def shop(store):
    write_money_shop(store)
    return store


def _nearest_rank(values, p):
    # Hyndman & Fan definition 2 family, as the store documents: rank = ceil(p * n)
    s = sorted(values)
    return s[math.ceil(p * len(s)) - 1]


def _median(values):
    s = sorted(values)
    n = len(s)
    return (s[(n + 1) // 2 - 1] + s[(n + 2) // 2 - 1]) / 2


def test_turnaround_in_whole_hours_median_and_quartiles(shop):
    hours = [math.floor(job.hours) for job in closed_jobs()]
    (row,) = turnaround.turnaround(shop).rows
    assert row == (len(hours), _median(hours), _nearest_rank(hours, 0.25),
                   _nearest_rank(hours, 0.75))


def test_turnaround_by_month(shop):
    months = {}
    for job in closed_jobs():
        months.setdefault(f"{job.opened:%Y-%m}", []).append(math.floor(job.hours))
    rows = {r[0]: (r[1], r[2]) for r in turnaround.turnaround_by_month(shop).rows}
    assert rows == {m: (len(h), _median(h)) for m, h in months.items()}


@pytest.mark.parametrize("days_after", [3, 46, 160])
def test_backlog_counts_jobs_open_at_the_moment_by_age(shop, days_after):
    as_of = T0 + timedelta(days=days_after)
    ages = []
    for job in PLAN:
        closed = None if job.hours is None else job.opened + timedelta(hours=job.hours)
        if job.opened < as_of and (closed is None or closed >= as_of):
            ages.append(int((as_of - job.opened).total_seconds() // 3600) // 24)
    bands = [low for low, _name in turnaround.AGE_BANDS]
    expected = {}
    for age in ages:
        band = max(low for low in bands if age >= low)
        expected[band] = expected.get(band, 0) + 1
    figure = turnaround.backlog_by_age(shop, as_of, Case.id.is_not(None))
    assert dict(figure.rows) == expected
    assert ages  # each moment chosen has a job waiting


def test_no_backlog_when_every_job_taken_in_is_back(shop):
    assert turnaround.backlog_by_age(shop, T0 + timedelta(days=21), Case.id.is_not(None)).rows == ()


def test_period_limits_turnaround_to_its_jobs(shop):
    first = Period(T0, T0 + timedelta(days=10))
    (row,) = turnaround.turnaround(shop, first).rows
    assert row[0] == sum(1 for job in closed_jobs() if job.opened < T0 + timedelta(days=10))
