"""The demo shop's plan: fictional, deterministic, two years, comebacks and unrepairable units."""

from __future__ import annotations

from collections import Counter
from datetime import timedelta

import pytest

from fixbench.knowledge import load_knowledge
from fixbench.physics.ratings import parse_ratings
from fixbench.demo.plan import (MODELS, SHOP_DAYS, SHOP_END, TECHNICIANS, TRAINEES,
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


def test_outcomes_include_unrepairable_units_and_paces_are_plausible(catalogue):
    cases = plan_shop(1, catalogue)
    outcomes = Counter(c.outcome for c in cases)
    assert outcomes["repaired"] > len(cases) * 0.6
    assert outcomes["not_economical"] > 0 and outcomes["returned_unrepaired"] > 0
    paces = sorted(c.pace for c in cases)
    assert 0.4 < paces[0] and paces[-1] < 3.0 and 0.8 < paces[len(paces) // 2] < 1.3
    slowest = max(TECHNICIANS, key=lambda t: t[1])[0]
    fastest = min(TECHNICIANS, key=lambda t: t[1])[0]
    mean = lambda name: sum(c.pace for c in cases if c.technician == name) / sum(  # noqa: E731
        c.technician == name for c in cases)
    assert mean(slowest) > mean(fastest)


def test_every_unit_has_a_family_fault_and_ratings_the_engine_reads(catalogue):
    cases = plan_shop(1, catalogue)
    assert {c.device.family_id for c in cases} == {"pwm_flyback", "self_oscillating",
                                                   "primary_side"}
    for case in cases:
        assert case.fault.family_id == case.device.family_id
        ratings = parse_ratings(case.device.bench_ratings)
        assert ratings.bench_mains == 230.0 and ratings.mains_hz == 50.0
    labels = {(m.family_id, m.label["output"], m.label["current"], m.label["mains"])
              for m in MODELS}
    # The ratings the brief sets per family (self-oscillating on 230 V only, the others universal).
    assert ("self_oscillating", "5 V", "1 A", "230 V") in labels
    assert ("primary_side", "5 V", "2 A", "100-240 V") in labels
    assert {("pwm_flyback", "5 V", "2 A", "100-240 V"),
            ("pwm_flyback", "19 V", "3.4 A", "100-240 V")} <= labels
    assert any(f == "pwm_flyback" and out == "12 V" for f, out, _, _ in labels)


def test_days_limit_the_history_to_the_last_days_before_the_shop_end(catalogue):
    short = plan_shop(1, catalogue, days=60)
    assert 20 <= len(short) <= 120
    assert short[0].opened_at >= SHOP_END - timedelta(days=60)


def test_trainees_practise_weekly_easy_first_then_normal():
    rounds = plan_practice(1)
    assert {r.trainee for r in rounds} == set(TRAINEES)
    assert len(rounds) == 2 * (SHOP_DAYS // 7)
    assert {r.level_id for r in rounds if r.progress < 0.25} == {"easy"}
    assert {r.level_id for r in rounds if r.progress >= 0.25} == {"normal"}
    assert len({r.seed for r in rounds}) == len(rounds)
    assert plan_practice(1) == plan_practice(1) != plan_practice(2)
