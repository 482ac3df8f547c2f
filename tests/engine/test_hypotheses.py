"""Hypotheses and their priors: knowledge-base weights pulled toward the shop's own history."""

from __future__ import annotations

import pytest

from fixbench.engine import start_diagnosis
from fixbench.engine.hypotheses import NO_FAULT, PRIOR_STRENGTH, build_hypotheses, root_weights


def _rank(state, fault):
    return [s.fault for s in state.suspects].index(fault)


def test_shop_history_moves_a_fault_up_the_ranking(family, ratings):
    plain = start_diagnosis(family, ratings)
    counted = start_diagnosis(family, ratings, prior_counts={"C2.dried": 200})
    before = {s.fault: s.probability for s in plain.suspects}
    after = {s.fault: s.probability for s in counted.suspects}
    assert after["C2.dried"] > before["C2.dried"]
    assert _rank(counted, "C2.dried") <= _rank(plain, "C2.dried")
    assert _rank(counted, "C2.dried") == 0


def test_a_fault_the_shop_sees_less_often_slips_down(family, ratings):
    plain = start_diagnosis(family, ratings)
    counted = start_diagnosis(family, ratings, prior_counts={"W1.open": 300})
    assert _rank(counted, "C2.dried") >= _rank(plain, "C2.dried")
    assert {s.fault: s.probability for s in counted.suspects}["C2.dried"] < \
        {s.fault: s.probability for s in plain.suspects}["C2.dried"]


@pytest.mark.parametrize("counts", [None, {}, {"C2.dried": 200}, {"Q1.short": 3, "W1.open": 40, "no_fault": 7}])
def test_root_weights_sum_to_one(family, counts):
    assert sum(root_weights(family, counts).values()) == pytest.approx(1.0, abs=1e-12)


def test_shop_counts_follow_the_dirichlet_posterior_mean(family):
    base = root_weights(family)
    counts = {"C2.dried": 20, "Q1.short": 10}
    updated = root_weights(family, counts)
    n = sum(counts.values())
    for fault, w in base.items():
        # (a * w_i + n_i) / (a + N) [src: conjugate Dirichlet-multinomial posterior mean]
        assert updated[fault] == pytest.approx((PRIOR_STRENGTH * w + counts.get(fault, 0)) / (PRIOR_STRENGTH + n))


def test_unknown_or_zero_counts_change_nothing(family):
    assert root_weights(family, {"no_such_fault": 50, "C2.dried": 0}) == root_weights(family)


def test_collateral_sets_share_their_root_prior(family):
    weights = root_weights(family)
    hypotheses = build_hypotheses(family)
    assert hypotheses[0].id == NO_FAULT and hypotheses[0].modes == ()
    for fault in family.faults:
        mine = [h for h in hypotheses if h.root == fault.id]
        assert mine, fault.id
        assert sum(h.prior for h in mine) == pytest.approx(weights[fault.id])
        assert all(h.modes[0] == (fault.part, fault.mode) for h in mine)


def test_shorted_mosfet_with_a_blown_fuse_is_its_likeliest_set(family):
    """A shorted switch nearly always takes the fuse [practice; trade primer section 6]."""
    sets = sorted((h for h in build_hypotheses(family) if h.root == "Q1.short"), key=lambda h: -h.prior)
    assert ("F1", "open") in sets[0].modes
