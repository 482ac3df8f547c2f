"""Replaying readings typed earlier: the ones this build reads are taken in order, exactly as
taking them one by one; the others are set aside with the reason, never silently dropped. The work
grows with the number of readings, not its square."""

from __future__ import annotations

import numpy as np

from fixbench.engine import planner, simulate_readings
from fixbench.engine.inference import posterior
from fixbench.engine.replay import replay_readings

TYPED = (("symptom_dead", "yes"), ("fuse_resistance", "0R2"), ("bulk_discharged", "3 V"))


def test_readings_that_read_are_taken_as_one_by_one(start):
    replayed = replay_readings(start, TYPED)
    by_hand = start
    for check_id, typed in TYPED:
        by_hand = by_hand.with_reading(check_id, typed)
    assert replayed.refused == ()
    assert replayed.state.readings == by_hand.readings
    assert replayed.state.evidence == by_hand.evidence


def test_an_unknown_check_and_an_unreadable_text_are_set_aside_with_the_reason(start):
    typed = (("symptom_dead", "yes"), ("no_such_check", "1"), ("fuse_resistance", "3,3"),
             ("look_fuse", "no"))
    replayed = replay_readings(start, typed)
    assert [r.check for r in replayed.state.readings] == ["symptom_dead", "look_fuse"]
    unknown, unreadable = replayed.refused
    assert (unknown.index, unknown.unknown_check) == (1, True)
    assert "unknown check 'no_such_check'" in unknown.reason
    assert (unreadable.index, unreadable.check_id, unreadable.typed) == (2, "fuse_resistance", "3,3")
    assert not unreadable.unknown_check and "use a point for decimals" in unreadable.reason

def _typed(family, ratings, root, seed=3):
    return list(simulate_readings(family, ratings, root, seed=seed, noise=True).items())


def test_a_simulated_unit_replayed_has_the_posterior_of_readings_taken_one_by_one(start, family, ratings):
    typed = _typed(family, ratings, "C2.dried")
    by_hand = start
    for check_id, text in typed:
        by_hand = by_hand.with_reading(check_id, text)
    np.testing.assert_allclose(replay_readings(start, typed).state.posterior, by_hand.posterior, rtol=1e-12)


def _naive_fragile(model, post, evidence):
    """The definition written out: recompute the posterior with each reading left out."""
    group, _ = planner.group_chances(model, post)[0]
    out = []
    for j, (check_index, _) in enumerate(evidence):
        without = posterior(model, evidence[:j] + evidence[j + 1:])
        if dict(planner.group_chances(model, without)).get(group, 0.0) < planner.FRAGILE_BELOW:
            out.append(check_index)
    return out


def test_fragile_readings_match_leaving_each_reading_out_in_turn(start, family, ratings):
    compared = 0
    for root in ("C2.dried", "Q1.short", "R1.open", "no_fault"):
        for seed in (1, 2, 3):
            state = replay_readings(start, _typed(family, ratings, root, seed)[:6]).state
            for n in range(1, len(state.evidence) + 1):
                evidence = state.evidence[:n]
                post = posterior(state.model, evidence)
                assert planner.fragile_readings(state.model, post, evidence) == \
                    _naive_fragile(state.model, post, evidence)
                compared += 1
    assert compared > 50


def test_leaving_readings_out_costs_one_posterior_per_distinct_reading(start, family, ratings, monkeypatch):
    # 5,100 readings took 32 s when every one was left out in turn: here 51 distinct readings
    # repeated 100 times are left out 51 times, not 5,100.
    typed = _typed(family, ratings, "C2.dried") * 100
    state = replay_readings(start, typed).state
    assert len(state.evidence) >= 5000
    calls = []
    real = planner.group_chances
    monkeypatch.setattr(planner, "group_chances", lambda *a: calls.append(1) or real(*a))
    planner.fragile_readings(state.model, state.posterior, state.evidence)
    assert len(calls) == len(set(state.evidence)) + 1
