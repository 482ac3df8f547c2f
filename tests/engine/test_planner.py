"""The planner: the minimum-entropy rule when checks cost alike, and the safety rules always."""

from __future__ import annotations

import dataclasses

import numpy as np
import pytest

from fixbench.engine import cautions, planner, simulate_readings
from fixbench.engine.simulate import simulated_unit
from fixbench.physics.part_values import rated_voltage


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
    # units arrive charged: the bulk may hold a charge until a discharge reading says otherwise
    powered = True
    for r in state.readings:
        powered = True if family.check(r.check).power in ("live", "lamp") else (
            False if r.check == planner.DISCHARGE_CHECK else powered)
    for _ in range(max_steps):
        proposal = state.next_check
        if proposal is None:
            break
        proposals.append(proposal.check.id)
        short = float(state.posterior[state.model.primary_short].sum())
        if float(state.posterior[state.model.clamp_open].sum()) > planner.CLAMP_THRESHOLD:
            # an open clamp: the switch avalanches on the first cycles, lamp or not [practice]
            assert proposal.power not in ("live", "lamp"), proposals
        if proposal.power == "live" and family.has_check("series_lamp"):
            lamp = [r.outcome for r in state.readings if r.check == "series_lamp"]
            # a lamp that never flashed had no path through it: it proves nothing [trade primer 8]
            assert "flash" in lamp, proposals
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


@pytest.mark.parametrize("root", ["no_fault", "BD1.short", "C1.short", "Q1.short", "D3.open", "R4.open", "C2.dried",
                                  "U1.dead", "R1.open", "C1.dried", "W1.open", "F1.open", "U3.open"])
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


def test_units_arrive_charged_so_the_first_hand_on_the_primary_waits_for_the_discharge(start, family):
    # Reproduces issue 11: the discharge was confirmed only after fixbench had powered the unit.
    assert start.bulk_may_be_charged and not start.powered
    for check in family.checks:
        if _touches_primary_cold(family, check) and check.id != planner.DISCHARGE_CHECK:
            # the bulk capacitor can hold a lethal charge after unplugging [practice; trade primer 5]
            assert start.discharge_needed_before(check.id), check.id
    state = start
    while state.next_check is not None and not _touches_primary_cold(family, state.next_check.check):
        state = state.with_reading(state.next_check.check.id, "no" if state.next_check.check.unit is None
                                   and "no" in state.next_check.check.outcomes else "0 V")
    assert state.next_check.check.id == planner.DISCHARGE_CHECK
    assert "arrive charged" in state.next_check.reason
    discharged = state.with_reading(planner.DISCHARGE_CHECK, "0.3 V")
    assert not discharged.bulk_may_be_charged
    assert discharged.with_reading("series_lamp", "flash then dark").bulk_may_be_charged  # again after power


def test_a_lamp_that_never_flashed_does_not_clear_the_primary(start, family):
    # Reproduces issue 11: a lamp dark because the fuse is open counted as "no short".
    state = start.with_reading("look_fuse", "no").with_reading("series_lamp", "no flash")
    assert state.readings[-1].outcome == "no_flash"
    assert not planner.lamp_cleared(state.model, state.evidence)
    # no path through the lamp proves nothing about a short behind it [practice; trade primer 8]
    assert not state.live_allowed
    assert all(not planner.is_allowed(state.model, state.posterior, i, state.evidence)
               for i, c in enumerate(state.model.checks) if c.check.power == "live")
    flashed = start.with_reading("series_lamp", "flash then dark")
    assert planner.lamp_cleared(flashed.model, flashed.evidence)
    assert not planner.lamp_cleared(start.model, start.with_reading("series_lamp", "bright").evidence)


def test_no_power_up_while_an_open_clamp_is_plausible(start, family, ratings):
    # Reproduces issue 11: the planner read the clamp resistor open cold, then proposed a live
    # drain measurement to confirm it.
    unit = simulated_unit(family, ratings, "R4.open", 0, exact=True)
    state = start.with_reading(planner.DISCHARGE_CHECK, "0 V").with_reading("clamp_resistor",
                                                                              unit.measure("clamp_resistor"))
    assert planner.open_clamp_chance(state.model, state.posterior) > planner.CLAMP_THRESHOLD
    assert not state.power_up_allowed and not state.live_allowed
    for i, check_model in enumerate(state.model.checks):
        if check_model.check.power in ("live", "lamp"):
            # without the clamp the leakage spike avalanches the switch on the first cycles [practice]
            assert not planner.is_allowed(state.model, state.posterior, i, state.evidence), check_model.check.id
    path = []
    for _ in range(30):
        proposal = state.next_check
        if proposal is None:
            break
        path.append(proposal.check.id)
        assert proposal.power not in ("live", "lamp"), path
        state = state.with_reading(proposal.check.id, unit.measure(proposal.check.id))
    assert state.suspects[0].fault == "R4.open"


def test_the_clamp_is_read_cold_before_the_first_power_up(start, family, ratings):
    """Before any reading an open clamp is plausible, so the first power-up waits for a cold clamp
    reading that rules it out."""
    assert planner.open_clamp_chance(start.model, start.model.prior) > planner.CLAMP_THRESHOLD
    unit = simulated_unit(family, ratings, "U1.dead", 0, exact=True)
    state, taken = start, []
    while state.next_check is not None and state.next_check.power not in ("lamp", "live"):
        taken.append(state.next_check.check.id)
        state = state.with_reading(taken[-1], unit.measure(taken[-1]))
    assert {"clamp_diode_test", "clamp_resistor"} & set(taken), taken
    assert planner.open_clamp_chance(state.model, state.posterior) <= planner.CLAMP_THRESHOLD


def test_an_open_loop_unit_gets_an_over_voltage_caution_and_a_load_on_its_no_load_output(start, family, ratings):
    # Reproduces issue 11: the no-load output check of an open-loop unit carried no caution.
    state = start.with_reading("symptom_output_high", "yes").with_reading("symptom_dead", "no")
    proposal = state.proposal_for("output_board")
    warning = [c for c in proposal.cautions if c.startswith(cautions.OVERVOLTAGE)]
    assert warning, proposal.cautions
    rated = rated_voltage(family.parts_with_role("output_capacitor")[0], ratings, family.design)
    # open loop: the output rises well above its rating [practice; trade primer section 6], here past
    # the output capacitor's voltage rating (25 % headroom over the output [practice])
    assert max(op.values["output_voltage"] for op in state.model.operations) > rated
    assert "load on the output" in warning[0] and f"{rated:g} V" in warning[0]
    # the loaded check and a cold one carry no such caution
    assert not any(c.startswith(cautions.OVERVOLTAGE) for c in state.proposal_for("output_loaded").cautions)
    assert not any(c.startswith(cautions.OVERVOLTAGE) for c in state.proposal_for("output_cap_esr").cautions)


def test_the_series_lamp_step_names_the_lamp_from_the_units_ratings(start):
    how = start.proposal_for("series_lamp").how
    # 40-60 W at 230 V for chargers [practice; trade primer section 8]
    assert "40 W incandescent lamp" in how and "no flash at all" in how and "steady bright" in how
