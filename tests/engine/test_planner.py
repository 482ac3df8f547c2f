"""The planner: the minimum-entropy rule when checks cost alike, and the safety rules always."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from fixbench.engine import planner, simulate_readings
from fixbench.engine.simulate import simulated_unit


def _root_entropy(model, p_hypothesis: np.ndarray) -> float:
    p_root = np.zeros(len(model.roots))
    for h, p in enumerate(p_hypothesis):
        p_root[model.root_of[h]] += p
    p_root = p_root[p_root > 0]
    return float(-(p_root * np.log2(p_root)).sum())


def expected_root_entropy(model, p_hypothesis: np.ndarray, check_index: int) -> float:
    """sum over outcomes o of P(o) * H(R | o), from the model's tables by Bayes' rule, written out
    here without the engine's information function."""
    table = model.checks[check_index].table
    total = 0.0
    for k in range(table.shape[1]):
        joint = p_hypothesis * table[:, k]
        p_outcome = joint.sum()
        if p_outcome > 0:
            total += p_outcome * _root_entropy(model, joint / p_outcome)
    return total


def _equal_minutes(model):
    checks = tuple(dataclasses.replace(c, check=dataclasses.replace(c.check, minutes=1.0)) for c in model.checks)
    return dataclasses.replace(model, checks=checks)


def _states_on_real_units(start, family, ratings):
    """The start and the planner's own states on exact units of a few common faults."""
    states = [start]
    for root in ("C2.dried", "R1.open", "Q1.short", "C3.dried", "U3.open", "no_fault"):
        readings = simulate_readings(family, ratings, root, seed=3, noise=False)
        state = start
        for _ in range(4):
            if state.next_check is None:
                break
            state = state.with_reading(state.next_check.check.id, readings[state.next_check.check.id])
            states.append(state)
    return states


def test_equal_cost_choice_follows_the_minimum_entropy_rule_of_de_kleer_and_williams_1987(start, family, ratings):
    compared = 0
    for state in _states_on_real_units(start, family, ratings):
        model = _equal_minutes(state.model)
        p = state.posterior
        plan = planner.PlanState(frozenset(model.check_index(r.check) for r in state.readings), False)
        scored = planner.scored_candidates(model, p, plan)
        candidates = [i for _, _, i in scored]
        entropies = {i: expected_root_entropy(model, p, i) for i in candidates}
        best = min(entropies.values())
        # minimum-entropy rule of de Kleer & Williams 1987: the chosen check minimises the expected
        # posterior entropy of the fault [src: de Kleer & Williams, Artificial Intelligence 32, 1987]
        assert entropies[candidates[0]] == pytest.approx(best, abs=1e-9)
        # ... and the whole ranking is by expected entropy [src: de Kleer & Williams 1987]
        ranked = [entropies[i] for i in candidates]
        assert all(a <= b + 1e-9 for a, b in zip(ranked, ranked[1:]))
        # bits = H(R) - E[H(R | O)] [src: Cover & Thomas, Elements of Information Theory, ch. 2]
        prior_entropy = _root_entropy(model, p)
        for _, bits, i in scored:
            assert bits == pytest.approx(prior_entropy - entropies[i], abs=1e-9)
        compared += 1
    assert compared >= 10


def test_cheaper_check_wins_when_it_tells_as_much(model):
    """Score is bits per minute: of two checks with the same information, the quicker goes first."""
    scored = planner.scored_candidates(model, model.prior, planner.PlanState(frozenset(), False))
    for score, bits, i in scored:
        assert score == pytest.approx(bits / (model.checks[i].check.minutes + planner.COST_FLOOR))
    assert [s for s, _, _ in scored] == sorted((s for s, _, _ in scored), reverse=True)


def _touches_primary_cold(family, check) -> bool:
    return check.power == "cold" and family.touches_primary(check)


def _walk_checking_safety(state, unit, family, max_steps=60):
    """Follow the planner, answer from ``unit``, assert the safety rules at every proposal.
    Returns (steps where a primary short was plausible, proposals made)."""
    plausible_short, proposals = 0, []
    powered = any(family.check(r.check).power in ("live", "lamp") for r in state.readings)
    for _ in range(max_steps):
        proposal = state.next_check
        if proposal is None:
            break
        proposals.append(proposal.check.id)
        short = float(state.posterior[state.model.primary_short].sum())
        if short > planner.SHORT_THRESHOLD:
            plausible_short += 1
            # no plain mains while a shorted primary is plausible [practice: series lamp first]
            assert proposal.power != "live", (proposal.check.id, short)
        if powered and _touches_primary_cold(family, proposal.check):
            # the bulk capacitor can hold a lethal charge: confirm it is discharged first [practice]
            assert proposal.check.id == planner.DISCHARGE_CHECK, proposals
        if proposal.power in ("live", "lamp"):
            assert proposal.cautions, proposal.check.id
            if family.touches_primary(proposal.check):
                # mains-connected primary is energy source class 3 [src: IEC 62368-1 Table 4]
                assert proposal.hazard == "ES3", proposal.check.id
        text = unit.measure(proposal.check.id)
        state = state.with_reading(proposal.check.id, text)
        if proposal.power in ("live", "lamp"):
            powered = True
        elif proposal.check.id == planner.DISCHARGE_CHECK:
            powered = False
    return plausible_short, proposals


@pytest.mark.parametrize("seed", range(8))
def test_no_plain_mains_while_a_shorted_primary_is_plausible(start, family, ratings, seed):
    unit = simulated_unit(family, ratings, "Q1.short", seed, exact=True)
    state = start.with_reading("look_fuse", "yes").with_reading("fuse_resistance", "OL")
    assert float(state.posterior[state.model.primary_short].sum()) > planner.SHORT_THRESHOLD
    plausible, proposals = _walk_checking_safety(state, unit, family)
    assert plausible >= 1 and proposals


def test_lamp_power_up_is_followed_by_discharge_before_a_cold_primary_check(start, family, ratings):
    """After the series lamp, the next cold check on the primary is the discharge confirmation."""
    unit = simulated_unit(family, ratings, "C2.dried", 0, exact=True)
    state = start.with_reading("series_lamp", unit.measure("series_lamp"))
    seen_discharge = False
    for _ in range(40):
        proposal = state.next_check
        if proposal is None:
            break
        if _touches_primary_cold(family, proposal.check):
            # the bulk capacitor can hold a lethal charge after power [practice]
            assert proposal.check.id == planner.DISCHARGE_CHECK
            seen_discharge = True
            break
        state = state.with_reading(proposal.check.id, unit.measure(proposal.check.id))
    assert seen_discharge or state.next_check is None


def test_cold_primary_check_after_a_live_reading_waits_for_discharge(start, family, ratings):
    state = start.with_reading("output_board", "0 V")
    for check in family.checks:
        if not _touches_primary_cold(family, check) or check.id == planner.DISCHARGE_CHECK:
            continue
        i = state.model.check_index(check.id)
        done = frozenset(j for j, c in enumerate(state.model.checks) if j != i and c.check.id != planner.DISCHARGE_CHECK)
        plan = planner.PlanState(done | {state.model.check_index("output_board")}, True)
        chosen = planner.choose(state.model, state.posterior, plan)
        if chosen is not None:
            # [practice: confirm the bulk is discharged before touching the primary]
            assert state.model.checks[chosen].check.id == planner.DISCHARGE_CHECK, check.id


@pytest.mark.parametrize("root", ["no_fault", "BD1.short", "C1.short", "Q1.short", "D3.open", "C2.dried",
                                  "U1.dead", "R1.open", "C1.dried", "W1.open"])
def test_safety_rules_hold_on_every_walk(start, family, ratings, root):
    for seed in range(4):
        unit = simulated_unit(family, ratings, root, seed, exact=True)
        _walk_checking_safety(start, unit, family)
        noisy = simulated_unit(family, ratings, root, seed, exact=False, wrong_rate=0.05)
        _walk_checking_safety(start, noisy, family)


def test_live_checks_are_allowed_once_the_primary_is_cleared(start, family, ratings):
    """The rule is not a blanket ban: a dead controller, which no cold check sees, is found live."""
    unit = simulated_unit(family, ratings, "U1.dead", 0, exact=True)
    _, proposals = _walk_checking_safety(start, unit, family)
    assert any(family.check(c).power == "live" for c in proposals)


def test_skipped_check_is_not_proposed_again(start):
    state = start
    skipped = []
    for _ in range(10):
        proposal = state.next_check
        if proposal is None:
            break
        skipped.append(proposal.check.id)
        state = state.skip(proposal.check.id)
        assert state.next_check is None or state.next_check.check.id not in skipped


def test_unit_whose_fuse_would_blow_is_never_offered_plain_mains(start, family, ratings):
    """Ground truth, not the model's belief: a unit that would blow its fuse on plain mains is only
    ever powered through the series lamp."""
    offered = []
    for root in ("Q1.short", "BD1.short", "C1.short", "D3.open"):
        for seed in range(20):
            unit = simulated_unit(family, ratings, root, seed, exact=True)
            state = start
            for _ in range(60):
                proposal = state.next_check
                if proposal is None:
                    break
                if unit.fuse_would_blow and proposal.power == "live":
                    offered.append((root, seed, proposal.check.id))
                    break
                state = state.with_reading(proposal.check.id, unit.measure(proposal.check.id))
    # power up through the series lamp while a short on the primary is possible [practice; trade primer section 5]
    assert offered == []
