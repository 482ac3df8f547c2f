"""The exact optimum on the reduced model: a lower bound for the greedy planner."""

from __future__ import annotations

import pytest

from fixbench.engine.optimal import REDUCED_CHECKS, REDUCED_FAULTS, reduced_comparison


@pytest.fixture(scope="module")
def comparison(family, ratings):
    return reduced_comparison(family, ratings)


def test_optimal_minutes_never_exceed_the_greedy_planner(comparison):
    # exhaustive search over policies is a lower bound [src: Pattipati & Alexandridis, IEEE SMC 20(4), 1990]
    assert comparison["optimal_minutes"] <= comparison["greedy_minutes"] + 1e-9
    assert comparison["optimal_minutes"] > 0 and comparison["greedy_minutes"] > 0
    assert comparison["ratio"] == pytest.approx(comparison["greedy_minutes"] / comparison["optimal_minutes"])


def test_reduced_model_has_the_documented_size(comparison, family):
    assert comparison["faults"] == min(REDUCED_FAULTS, len(family.faults) + 1)
    assert comparison["checks"] <= REDUCED_CHECKS
    assert len(set(comparison["check_ids"])) == comparison["checks"]
    assert "no_fault" in comparison["fault_ids"] or len(comparison["fault_ids"]) == REDUCED_FAULTS


def test_optimum_is_a_lower_bound_on_every_family(knowledge):
    from fixbench.benchmarks.engine_figures import BENCH_RATINGS, DEFAULT_RATINGS
    from fixbench.physics.ratings import parse_ratings

    for family in knowledge.families.values():
        c = reduced_comparison(family, parse_ratings(BENCH_RATINGS.get(family.id, DEFAULT_RATINGS)))
        # [src: Pattipati & Alexandridis 1990]
        assert 0 < c["optimal_minutes"] <= c["greedy_minutes"] + 1e-9, family.id
