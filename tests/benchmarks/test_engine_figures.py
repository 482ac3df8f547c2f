"""The engine benchmark's report: its documented figures are there, of the right kind, and safe."""

from __future__ import annotations

import numbers

import pytest

from fixbench.benchmarks.engine_figures import run_benchmark

FRACTIONS = ("top1_exact", "top1_noisy", "top3_noisy")
RATIOS = ("minutes_vs_fixed_order", "minutes_vs_optimal", "entropy_bound_checks")


@pytest.fixture(scope="module")
def result():
    return run_benchmark(seed=1, units_per_family=10)


def test_benchmark_reports_its_documented_figures(result):
    for key in FRACTIONS + RATIOS + ("unsafe_proposals", "step_ms_median", "hypotheses", "checks"):
        assert key in result, key
    for key in FRACTIONS:
        assert isinstance(result[key], numbers.Real) and 0.0 <= result[key] <= 1.0, key
    for key in RATIOS:
        assert isinstance(result[key], numbers.Real) and result[key] > 0.0, key
    assert isinstance(result["unsafe_proposals"], int)
    assert isinstance(result["hypotheses"], int) and result["hypotheses"] > 0
    assert isinstance(result["checks"], int) and result["checks"] > 0
    assert result["step_ms_median"] is None or isinstance(result["step_ms_median"], numbers.Real)
    assert result["replayed_readings"] == 5100 and result["replay_ms"] > 0


def test_benchmark_finds_no_unsafe_proposal(result):
    assert result["unsafe_proposals"] == 0


def test_top_three_is_at_least_top_one(result):
    assert result["top3_noisy"] >= result["top1_noisy"]


def test_engine_never_beats_the_exact_optimum(result):
    # the exhaustive search is a lower bound on expected minutes [src: Pattipati & Alexandridis 1990]
    assert result["minutes_vs_optimal"] >= 1.0 - 1e-9


def test_benchmark_is_repeatable_for_a_seed(result):
    again = run_benchmark(seed=1, units_per_family=10)
    for key in FRACTIONS + RATIOS + ("unsafe_proposals",):
        assert again[key] == result[key], key


def test_benchmark_reports_every_family_on_its_own(result):
    from fixbench.knowledge import load_knowledge

    per_family = result["per_family"]
    assert set(per_family) == set(load_knowledge().families)
    for fid, figures in per_family.items():
        for key in FRACTIONS:
            assert 0.0 <= figures[key] <= 1.0, (fid, key)
        assert figures["top3_noisy"] >= figures["top1_noisy"], fid
        assert figures["unsafe_proposals"] == 0, fid
    # the overall figures are the families' weighted by their units
    assert sum(f["units"] for f in per_family.values()) == result["units"]
    for key in FRACTIONS:
        weighted = sum(f[key] * f["units"] for f in per_family.values()) / result["units"]
        assert weighted == pytest.approx(result[key]), key


def test_each_safety_rule_broken_counts_as_unsafe():
    """The counter behind unsafe_proposals sees each rule of issue 11 broken, and passes the same
    step made safely."""
    import dataclasses

    from fixbench.benchmarks.engine_figures import breaks_safety_rule
    from fixbench.engine import start_diagnosis
    from fixbench.engine.cautions import OVERVOLTAGE
    from fixbench.engine.simulate import simulated_unit
    from fixbench.knowledge import load_knowledge
    from fixbench.physics.ratings import parse_ratings

    family = load_knowledge().family("pwm_flyback")
    ratings = parse_ratings({"mains": "230 V", "output": "5 V", "current": "2 A"})
    start = start_diagnosis(family, ratings)
    # a hand on the primary of a unit as it arrives: charged [practice; trade primer section 5]
    assert breaks_safety_rule(start, start.proposal_for("mosfet_drain_source")) == 1
    discharged = start.with_reading("bulk_discharged", "0.2 V")
    assert breaks_safety_rule(discharged, discharged.proposal_for("mosfet_drain_source")) == 0
    # a power-up, even through the lamp, while an open clamp is plausible [practice]
    assert breaks_safety_rule(discharged, discharged.proposal_for("series_lamp")) == 1
    clamp_good = (discharged.with_reading("clamp_resistor", simulated_unit(family, ratings, "no_fault", 0, exact=True)
                                          .measure("clamp_resistor"))
                  .with_reading("clamp_diode_test", "0.55 V"))
    assert breaks_safety_rule(clamp_good, clamp_good.proposal_for("series_lamp")) == 0
    # plain mains after a lamp that never flashed (no path: proves nothing) [trade primer section 8]
    healthy = simulated_unit(family, ratings, "no_fault", 0, exact=True)
    cold = clamp_good
    for check in ("fuse_resistance", "bridge_diode_test", "mosfet_drain_source", "bulk_capacitance"):
        cold = cold.with_reading(check, healthy.measure(check))
    no_flash = cold.with_reading("series_lamp", "no flash")
    assert breaks_safety_rule(no_flash, no_flash.proposal_for("bulk_voltage")) == 1
    flashed = cold.with_reading("series_lamp", "flash then dark")
    assert flashed.live_allowed
    assert breaks_safety_rule(flashed, flashed.proposal_for("bulk_voltage")) == 0
    # a no-load output reading of a possibly open-loop unit without its over-voltage caution
    high = flashed.with_reading("symptom_output_high", "yes")
    proposal = high.proposal_for("output_board")
    assert breaks_safety_rule(high, proposal) == 0
    stripped = dataclasses.replace(proposal, cautions=tuple(c for c in proposal.cautions
                                                            if not c.startswith(OVERVOLTAGE)))
    assert breaks_safety_rule(high, stripped) == 1
