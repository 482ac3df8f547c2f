"""A demo case played by the engine: its own proposals, its suspects, its conclusion, the proof."""

from __future__ import annotations

import pytest

from fixbench.engine import start_diagnosis
from fixbench.engine.simulate import simulated_unit
from fixbench.knowledge import load_knowledge
from fixbench.physics.ratings import parse_ratings
from fixbench.store.cases import RankedSuspect
from fixbench.demo.bench_play import (KEPT_SUSPECTS, TEST_MINUTES, WRONG_READING_RATE,
                                       engine_bench_session, value_fitted)
from fixbench.demo.plan import MODELS

KB = load_knowledge()
RATINGS = {m.family_id: {**m.label, "bench_mains": "230 V"} for m in MODELS}


@pytest.mark.parametrize("family_id,fault_id", [("pwm_flyback", "Q1.short"),
                                                ("self_oscillating", "R1.open"),
                                                ("primary_side", "C3.dried")])
def test_readings_and_suspects_are_the_engines_own_walk_on_the_simulated_unit(family_id,
                                                                               fault_id):
    family = KB.families[family_id]
    played = engine_bench_session(family, RATINGS[family_id], fault_id, seed=11)
    # Replay independently: the same unit (same seed and misread rate), the engine's proposals.
    ratings = parse_ratings(RATINGS[family_id])
    state = start_diagnosis(family, ratings)
    unit = simulated_unit(family, ratings, fault_id, 11, wrong_rate=WRONG_READING_RATE)
    for step in played.steps:
        assert step.check_id == state.next_check.check.id
        assert step.minutes == state.next_check.minutes
        assert step.typed == unit.measure(step.check_id)
        state = state.with_reading(step.check_id, step.typed)
        assert step.suspects == tuple(RankedSuspect.from_engine(s)
                                      for s in state.suspects[:KEPT_SUSPECTS])
    assert state.next_check is None  # the walk ended where the engine concluded
    assert played.concluded == state.conclusion.faults


def test_repair_follows_the_conclusion_and_the_last_verification_passes():
    family = KB.families["pwm_flyback"]
    played = engine_bench_session(family, RATINGS["pwm_flyback"], "Q1.short", seed=3)
    fresh = start_diagnosis(family, parse_ratings(RATINGS["pwm_flyback"]))
    first = played.rounds[0]
    replaced = {w.part_id for w in first.work if w.action == "replaced"}
    assert "Q1" in replaced and played.confirmed_fault == "Q1.short"
    for work in first.work:
        if work.action == "replaced":
            assert work.cost_cents == round(family.part(work.part_id).cost * 100)
            assert work.test_passed is None
            assert work.value_fitted == value_fitted(family.part(work.part_id),
                                                     parse_ratings(RATINGS["pwm_flyback"]),
                                                     family.design)
        else:
            assert (work.cost_cents, work.minutes) == (0, TEST_MINUTES)
            assert work.test_passed in (True, False) and work.value_fitted is None
    verify_checks = [v.check for v in fresh.final_conclusion().verify]
    assert [v.check_id for v in played.rounds[-1].verification] == verify_checks
    assert played.rounds[-1].passed


def test_a_part_that_fails_its_test_is_kept_failed_and_replaced_right_after():
    family = KB.families["pwm_flyback"]
    failed_tests = 0
    for seed in range(8):
        played = engine_bench_session(family, RATINGS["pwm_flyback"], "Q1.short", seed)
        for repair in played.rounds:
            work = list(repair.work)
            for done, after in zip(work, work[1:] + [None]):
                if done.action == "tested" and done.test_passed is False:
                    failed_tests += 1
                    assert (after.part_id, after.action) == (done.part_id, "replaced")
                    assert after.note == "failed its test before power-up"
            passed = {w.part_id for w in work if w.test_passed}
            assert not passed & {w.part_id for w in work if w.action == "replaced"}
    assert failed_tests  # the collateral damage of a shorted MOSFET shows in some units


def test_the_value_fitted_is_the_parts_marking_as_a_technician_writes_it():
    family = KB.families["pwm_flyback"]
    ratings = parse_ratings(RATINGS["pwm_flyback"])
    # C2 is "22 uF" rated "50 V" in knowledge/families/pwm_flyback.toml.
    assert value_fitted(family.part("C2"), ratings, family.design) == "22 uF 50 V"
    assert value_fitted(family.part("R2"), ratings, family.design) == "22 ohm"
    assert value_fitted(family.part("Q1"), ratings, family.design) is None  # bought by type
    assert value_fitted(family.part("T1"), ratings, family.design) is None  # a winding resistance


def test_a_healthy_unit_is_concluded_healthy_and_gets_no_repair():
    family = KB.families["self_oscillating"]
    played = engine_bench_session(family, RATINGS["self_oscillating"], "no_fault", seed=4,
                                  repair=False)
    assert played.concluded == ("no_fault",) and played.rounds == ()
    assert played.confirmed_fault is None and played.steps


def test_over_many_units_the_engine_is_mostly_right_and_misses_show_in_verification():
    family = KB.families["pwm_flyback"]
    faults = [f.id for f in family.faults]
    played = [engine_bench_session(family, RATINGS["pwm_flyback"], fault, seed)
              for seed in range(2) for fault in faults]
    right = sum(p.confirmed_fault == fault for p, fault in zip(played, faults * 2))
    assert right >= 0.85 * len(played)
    assert all(p.rounds[-1].passed for p in played)
    for p in played:
        if len(p.rounds) > 1:  # a second round only follows a failed verification
            assert not p.rounds[0].passed
    minutes = sorted(p.diagnosis_minutes + p.repair_minutes for p in played)
    assert 10 <= minutes[len(minutes) // 2] <= 90


def test_same_seed_same_session():
    family = KB.families["primary_side"]
    assert (engine_bench_session(family, RATINGS["primary_side"], "R1.open", 9)
            == engine_bench_session(family, RATINGS["primary_side"], "R1.open", 9))
