"""Cold readings of every family from the network solve, healthy and faulty: the engine's predicted
reading of a cold check is the solve of the family's board with the hypothesis's parts failed."""

from __future__ import annotations

import math

import pytest

from fixbench.engine.fault_model import build_fault_model
from fixbench.engine.part_readings import cold_reading
from fixbench.knowledge import load_knowledge
from fixbench.physics.cold.family_board import family_board, probing_of
from fixbench.physics.cold.probing import reading
from fixbench.physics.ratings import parse_ratings

RATINGS = [parse_ratings({"mains": "230 V", "output": "5 V", "current": "2 A"}),
           parse_ratings({"mains": "120 V", "output": "12 V", "current": "1 A"})]
FAMILIES = ["primary_side", "pwm_flyback", "self_oscillating"]


@pytest.fixture(scope="module")
def knowledge():
    return load_knowledge()


def _cold_checks(family):
    return [c for c in family.checks if c.probes]


@pytest.mark.parametrize("family_id", FAMILIES)
def test_every_predicted_cold_reading_is_the_solve_of_the_whole_board(knowledge, family_id):
    family = knowledge.family(family_id)
    ratings = RATINGS[0]
    model = build_fault_model(family, ratings)
    board = family_board(family, ratings)
    for check in _cold_checks(family):
        index = model.check_index(check.id)
        for hypothesis, value in zip(model.hypotheses, model.checks[index].values):
            whole = reading(board.with_modes(dict(hypothesis.modes)), probing_of(check))
            assert value == pytest.approx(whole, rel=1e-6) or (math.isinf(value) and math.isinf(whole)), \
                (check.id, hypothesis.modes)


@pytest.mark.parametrize("ratings", RATINGS, ids=["230V-5V2A", "120V-12V1A"])
@pytest.mark.parametrize("family_id", FAMILIES)
def test_good_board_reads_inside_its_band_on_every_cold_check(knowledge, family_id, ratings):
    family = knowledge.family(family_id)
    model = build_fault_model(family, ratings)
    for check in _cold_checks(family):
        check_model = model.checks[model.check_index(check.id)]
        healthy = cold_reading(family, ratings, check, {})
        assert check_model.classes.classify(healthy) == check_model.classes.healthy, check.id


@pytest.mark.parametrize("family_id", FAMILIES)
def test_every_fault_but_a_dead_controller_shows_on_a_cold_check_of_its_part(knowledge, family_id):
    # A dead controller is the one failure an unpowered meter cannot see [practice].
    family = knowledge.family(family_id)
    ratings = RATINGS[0]
    model = build_fault_model(family, ratings)
    for fault in family.faults:
        if fault.mode == "dead":
            continue
        own = [c for c in _cold_checks(family) if c.target_id == fault.part]
        shown = [c.id for c in own
                 if model.checks[model.check_index(c.id)].classes.classify(
                     cold_reading(family, ratings, c, {fault.part: fault.mode})) != "ok"]
        assert shown, fault.id


def test_shorted_output_capacitor_reads_like_a_shorted_rectifier_until_a_leg_is_lifted(knowledge):
    family = knowledge.family("primary_side")
    ratings = RATINGS[0]
    in_circuit, lifted = family.check("output_diode_test"), family.check("output_diode_lifted")
    assert cold_reading(family, ratings, in_circuit, {"C3": "short"}) < 0.01
    assert cold_reading(family, ratings, in_circuit, {"D4": "short"}) < 0.01
    assert cold_reading(family, ratings, lifted, {"D4": "short"}) < 0.01
    assert 0.15 < cold_reading(family, ratings, lifted, {"C3": "short"}) < 0.45  # the Schottky alone [practice]
    model = build_fault_model(family, ratings)
    assert model.checks[model.check_index("output_diode_lifted")].informative
    assert not any({"C3.short", "D4.short"} <= set(group) for group in model.groups)


def test_shorted_aux_diode_or_vcc_capacitor_reads_like_a_shorted_controller(knowledge):
    # Issue 10: from the Vcc pin the three look alike, and the aux diode's own test reads shorted
    # through the winding when the Vcc capacitor is shorted; the ESR meter tells the capacitor.
    family = knowledge.family("pwm_flyback")
    ratings = RATINGS[0]
    vcc = family.check("controller_vcc_short")
    for part, mode in (("U1", "short"), ("C2", "short"), ("D2", "short")):
        assert cold_reading(family, ratings, vcc, {part: mode}) < 10.0, part
    assert cold_reading(family, ratings, family.check("aux_diode_test"), {"C2": "short"}) < 0.01
    model = build_fault_model(family, ratings)
    esr = model.checks[model.check_index("vcc_cap_esr")]
    assert esr.classes.classify(cold_reading(family, ratings, esr.check, {"C2": "short"})) == "low"
    assert esr.classes.classify(cold_reading(family, ratings, esr.check, {"D2": "short"})) == "ok"
    assert not any({"C2.short", "D2.short"} <= set(group) for group in model.groups)
