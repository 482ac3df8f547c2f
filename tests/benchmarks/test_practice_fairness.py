"""The practice benchmark's report: its documented figures are there, of the right kind, and the
engine's own play never slips. The fairness figure itself (top band >= 95 % at every level) is the
benchmark's: `fixbench benchmark practice`."""

from __future__ import annotations

import numbers

import pytest

from fixbench.benchmarks.practice_fairness import print_practice_report, run_practice_benchmark
from fixbench.knowledge import load_knowledge
from fixbench.practice.levels import LEVELS

BY_LEVEL = ("units_by_level", "multi_fault_units_by_level", "top_band_by_level", "top_band_multi_fault_by_level",
            "engine_fault_right_by_level", "mean_par_minutes_by_level", "engine_slips_by_level")


@pytest.fixture(scope="module")
def result():
    return run_practice_benchmark(seed=1, units_per_family=4, random_units=12)


def test_the_report_gives_every_figure_for_every_level(result):
    for key in BY_LEVEL:
        assert set(result[key]) == set(LEVELS), key
    for share in list(result["top_band_by_level"].values()) + [result["random_top_band"]]:
        assert isinstance(share, numbers.Real) and 0.0 <= share <= 1.0
    families = len(load_knowledge().families)
    assert all(n == 4 * families for n in result["units_by_level"].values())  # 4 units of each family
    assert sum(result["multi_fault_units_by_level"].values()) > 0  # units hiding several failed parts


def test_the_engines_own_play_never_slips(result):
    assert set(result["engine_slips_by_level"].values()) == {0}


def test_the_benchmark_is_repeatable_for_a_seed(result):
    again = run_practice_benchmark(seed=1, units_per_family=4, random_units=12)
    assert {k: v for k, v in again.items() if k != "seconds"} == {k: v for k, v in result.items() if k != "seconds"}


def test_the_report_prints_each_level_against_its_target(result, capsys):
    print_practice_report(result)
    out = capsys.readouterr().out
    assert all(f"{level:7} top band" in out for level in LEVELS) and "(target >= 95%)" in out
