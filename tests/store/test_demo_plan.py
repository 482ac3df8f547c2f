"""The demo shop's plan: fictional, deterministic, two years, comebacks and unrepairable units."""

from __future__ import annotations

from collections import Counter
from datetime import timedelta

import pytest

from fixbench.knowledge import load_knowledge
from fixbench.store.demo_plan import (SHOP_DAYS, SHOP_END, TECHNICIANS, TRAINEES,
                                      catalogue_from_knowledge, plan_practice, plan_shop)


@pytest.fixture(scope="module")
def catalogue():
    return catalogue_from_knowledge(load_knowledge())


def test_same_seed_same_history_other_seed_other_history(catalogue):
    assert plan_shop(3, catalogue) == plan_shop(3, catalogue)
    assert plan_shop(3, catalogue) != plan_shop(4, catalogue)


def test_about_two_years_of_several_hundred_cases_on_working_days(catalogue):
    cases = plan_shop(1, catalogue)
    assert 400 <= len(cases) <= 800
    assert cases[0].opened_at >= SHOP_END - timedelta(days=SHOP_DAYS)
    assert cases[-1].opened_at - cases[0].opened_at > timedelta(days=700)
    assert all(c.opened_at.weekday() < 5 for c in cases)
    assert [c.opened_at for c in cases] == sorted(c.opened_at for c in cases)
    assert len({c.ticket for c in cases}) == len(cases)


def test_four_technicians_share_the_work(catalogue):
    work = Counter(c.technician for c in plan_shop(1, catalogue))
    assert set(work) == {name for name, _ in TECHNICIANS} and len(TRAINEES) == 2
    assert min(work.values()) > len(plan_shop(1, catalogue)) / 8


def test_faults_follow_the_knowledge_base_priors(catalogue):
    cases = plan_shop(1, catalogue)
    drawn = Counter(c.fault.fault_id for c in cases if c.comeback_of is None)
    heaviest = max(catalogue, key=lambda c: c.weight)
    lightest = min(catalogue, key=lambda c: c.weight)
    assert drawn[heaviest.fault_id] > drawn[lightest.fault_id]
    assert set(drawn) <= {c.fault_id for c in catalogue}


def test_comebacks_are_the_same_unit_within_ninety_days_of_a_repair(catalogue):
    cases = plan_shop(1, catalogue)
    by_ticket = {c.ticket: c for c in cases}
    comebacks = [c for c in cases if c.comeback_of]
    assert len(comebacks) >= 5
    for case in comebacks:
        earlier = by_ticket[case.comeback_of]
        assert earlier.outcome == "repaired" and earlier.device == case.device
        assert timedelta(0) < case.opened_at - earlier.opened_at <= timedelta(days=90)


def test_outcomes_include_unrepairable_units_and_bench_minutes_are_plausible(catalogue):
    cases = plan_shop(1, catalogue)
    outcomes = Counter(c.outcome for c in cases)
    assert outcomes["repaired"] > len(cases) * 0.6
    assert outcomes["not_economical"] > 0 and outcomes["returned_unrepaired"] > 0
    minutes = sorted(c.bench_minutes for c in cases)
    assert 15 <= minutes[len(minutes) // 2] <= 60 and minutes[0] >= 5 and minutes[-1] < 300


def test_trainees_practise_and_improve(catalogue):
    rounds = plan_practice(1, catalogue)
    assert {r.trainee for r in rounds} == set(TRAINEES)
    first, last = rounds[: len(rounds) // 4], rounds[-len(rounds) // 4:]
    mean = lambda rs, key: sum(getattr(r, key) for r in rs) / len(rs)  # noqa: E731
    assert mean(last, "score") > mean(first, "score")
    assert mean(last, "safety_slips") < mean(first, "safety_slips")
