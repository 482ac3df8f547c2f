"""Simulated faulty units: their readings are the model's predictions, and power is real."""

from __future__ import annotations

import math

import pytest

from fixbench.engine import simulate_readings
from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.readings import read
from fixbench.engine.simulate import draw_modes, simulated_unit
from fixbench.quantities import parse_quantity


def test_plain_mains_on_a_shorted_mosfet_blows_the_fuse_for_good(family, ratings):
    unit = simulated_unit(family, ratings, "Q1.short", 0, exact=True, modes={"Q1": "short"})
    assert unit.measure("fuse_resistance") != "OL"
    assert unit.fuse_would_blow
    unit.measure("bulk_voltage")  # plain mains
    assert "fuse_blown" in unit.events
    # a shorted switch blows the fuse [practice; trade primer section 6]
    assert math.isinf(parse_quantity(unit.measure("fuse_resistance"), "ohm").value)
    assert unit.measure("series_lamp") == "no_flash"


def test_series_lamp_does_not_blow_the_fuse(family, ratings):
    unit = simulated_unit(family, ratings, "Q1.short", 0, exact=True, modes={"Q1": "short"})
    assert unit.measure("series_lamp") == "bright"  # the lamp limits the current [practice; trade primer section 5]
    assert "fuse_blown" not in unit.events


def test_readings_of_a_unit_as_it_came_in_do_not_inherit_a_blown_fuse(family, ratings, model):
    readings = simulate_readings(family, ratings, "BD1.short", seed=0, noise=False)
    unit = simulated_unit(family, ratings, "BD1.short", 0, exact=True)
    fuse_as_came_in = read(model.checks[model.check_index("fuse_resistance")], readings["fuse_resistance"])
    expected = "open" if unit.modes.get("F1") == "open" else "ok"
    assert fuse_as_came_in.outcome == expected


@pytest.mark.parametrize("root", ["C2.dried", "R1.open", "U3.short", "W1.open", NO_FAULT])
def test_exact_readings_fall_in_the_class_the_model_predicts(family, ratings, model, root):
    unit = simulated_unit(family, ratings, root, 5, exact=True)
    hypothesis = next(i for i, h in enumerate(model.hypotheses) if dict(h.modes) == unit.modes)
    readings = simulate_readings(family, ratings, root, seed=5, noise=False)
    for check_model in model.checks:
        outcome = read(check_model, readings[check_model.check.id]).outcome
        k = check_model.classes.names.index(outcome)
        assert check_model.predicted[hypothesis, k] > 0.5, (root, check_model.check.id, outcome)


def test_collateral_damage_is_drawn_at_its_rate(family):
    import random

    rng = random.Random(11)
    draws = [draw_modes(family, "Q1.short", rng) for _ in range(4000)]
    fuse = sum(d.get("F1") == "open" for d in draws) / len(draws)
    assert all(d["Q1"] == "short" for d in draws)
    assert fuse == pytest.approx(0.9, abs=0.03)  # knowledge-base rate (binomial sd 0.005)


def test_noisy_readings_scatter_around_the_exact_ones(family, ratings):
    exact = simulate_readings(family, ratings, NO_FAULT, seed=2, noise=False)
    noisy = simulate_readings(family, ratings, NO_FAULT, seed=2, noise=True)
    bulk_exact = parse_quantity(exact["bulk_voltage"], "V").value
    bulk_noisy = parse_quantity(noisy["bulk_voltage"], "V").value
    assert bulk_noisy == pytest.approx(bulk_exact, rel=0.1)
