"""Order of trial replacements: decreasing probability over cost is the cheapest order on average."""

from __future__ import annotations

import itertools
import random

import pytest

from fixbench.engine.repair_order import RepairStep, expected_cost, order_by_ratio


def _random_steps(rng: random.Random, n: int) -> list[RepairStep]:
    weights = [rng.random() + 1e-3 for _ in range(n)]
    # Probabilities sum to at most 1: the rest is a fault no step repairs.
    total = rng.uniform(0.3, 1.0)
    scale = total / sum(weights)
    return [RepairStep(f"F{k}.open", f"P{k}", w * scale, rng.uniform(0.5, 40.0)) for k, w in enumerate(weights)]


def test_expected_cost_charges_each_step_only_while_the_unit_is_still_faulty():
    a, b = RepairStep("A.open", "A", 0.5, 1.0), RepairStep("B.open", "B", 0.3, 2.0)
    # 1 + 2 * (1 - 0.5) [src: Kadane & Simon 1977, expected cost of a search sequence]
    assert expected_cost([a, b]) == pytest.approx(2.0)
    # 2 + 1 * (1 - 0.3) [src: Kadane & Simon 1977]
    assert expected_cost([b, a]) == pytest.approx(2.7)


@pytest.mark.parametrize("seed", range(40))
def test_probability_over_cost_order_is_the_cheapest_of_all_orders(seed):
    rng = random.Random(seed)
    steps = _random_steps(rng, rng.randint(1, 8))
    best = min(expected_cost(list(order)) for order in itertools.permutations(steps))
    # [src: Kadane & Simon 1977; Heckerman, Breese & Rommelse 1995]
    assert expected_cost(order_by_ratio(steps)) == pytest.approx(best, abs=1e-9)


@pytest.mark.parametrize("seed", range(5))
def test_eight_steps_in_ratio_order_match_the_exhaustive_optimum(seed):
    rng = random.Random(100 + seed)
    steps = _random_steps(rng, 8)
    best = min(expected_cost(list(order)) for order in itertools.permutations(steps))
    # [src: Kadane & Simon 1977; Heckerman, Breese & Rommelse 1995]
    assert expected_cost(order_by_ratio(steps)) == pytest.approx(best, abs=1e-9)


def test_uncertain_conclusion_lists_trials_in_ratio_order(start):
    """A dead unit with nothing measured yet: the conclusion's trial order is by p / c."""
    state = start.with_reading("symptom_dead", "yes")
    conclusion = state.final_conclusion()
    assert not conclusion.certain and conclusion.repair_order
    ratios = [s.probability / s.cost for s in conclusion.repair_order]
    # [src: Kadane & Simon 1977; Heckerman, Breese & Rommelse 1995]
    assert ratios == sorted(ratios, reverse=True)
