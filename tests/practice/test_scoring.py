"""Scoring: the fault, the parts, the minutes against par, slips (once per mistake) and the coach,
each taking points and capping the band."""

from __future__ import annotations

from fixbench.practice.safety import MAINS_ON_SHORT, UNDISCHARGED, Slip
from fixbench.practice.scoring import (COACH_FIRST_POINTS, COACH_MAX_POINTS, NEARLY, PRACTISE, READY,
                                       coach_cost, effort_share, score_round)

GROUP = ("Q1.short",)
FAILED = {"Q1": "short", "F1": "open"}


def score(**changes):
    args = dict(true_group=GROUP, failed_parts=FAILED, fault_named="Q1.short", parts_named={"Q1", "F1"},
                minutes=10.0, par=10.0, slips=())
    args.update(changes)
    return score_round(**args)


def slip(kind):
    return Slip(kind, 1, "bulk_voltage", "what", "why")


def test_right_fault_and_parts_at_par_is_full_marks_in_the_top_band():
    result = score()
    assert result.total == 100.0
    assert result.band == READY


def test_wrong_fault_earns_no_minutes_however_quick():
    result = score(fault_named="C3.dried", parts_named={"C3"}, minutes=0.0)
    assert not result.fault_right
    assert result.effort_points == 0.0
    assert result.band == PRACTISE


def test_a_fault_of_the_same_group_counts_as_right():
    assert score(true_group=("U2.open", "R5.open"), fault_named="R5.open").fault_right


def test_missed_and_needless_parts_cost_points():
    missed = score(parts_named={"Q1"})
    needless = score(parts_named={"Q1", "F1", "R3"})
    assert missed.parts_missed == {"F1"} and missed.parts_points < 20.0
    assert needless.parts_extra == {"R3"} and missed.parts_points < needless.parts_points < 20.0


def test_minutes_over_par_with_slack_cost_points():
    assert effort_share(12.0, 10.0) == 1.0  # within the slack
    assert score(minutes=40.0).effort_points < score(minutes=20.0).effort_points < 30.0


def test_each_mistake_costs_ten_points_and_keeps_a_round_out_of_the_top_band():
    result = score(slips=(slip(UNDISCHARGED),))
    assert result.total == 90.0
    assert result.band == NEARLY and result.capped_by_slip


def test_blowing_the_fuse_on_plain_mains_puts_the_round_in_the_bottom_band():
    result = score(slips=(slip(MAINS_ON_SHORT),))
    assert result.band == PRACTISE and result.capped_by_slip


def test_the_coach_costs_points_and_the_top_band():
    # Reproduces the issue: with the coach asked, score and band were those of a round alone.
    alone, coached = score(), score(coach_looks=1)
    assert coached.coach_points == COACH_FIRST_POINTS and coached.total == alone.total - COACH_FIRST_POINTS
    assert alone.band == READY and coached.band == NEARLY and coached.capped_by_coach
    assert score(coach_looks=3).total < coached.total  # each further look costs a little
    assert coach_cost(100) == COACH_MAX_POINTS and coach_cost(0) == 0.0
