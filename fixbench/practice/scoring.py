"""Scoring a committed round: right fault, right parts, minutes against the engine's par, safety,
and the coach.

Out of 100: the fault is worth 50 (any fault of the true fault's group counts, since no check can
tell those apart); the parts 20, less 30 % of that for each failed part left in the unit and 15 %
for each good part replaced; the minutes 30, in full up to the par (the engine's own minutes on the
same unit, its careful checks before power-up included) plus some slack, then falling as par over
minutes. Minutes earn nothing when the fault is wrong: a quick wrong answer is not efficient.

Each safety mistake takes 10 points, once per mistake (the round counts a repeat of the same
mistake once), and caps the band: no slip is allowed in the top band, and blowing a unit up on
plain mains puts the round in the bottom band whatever else went right. Asking the coach takes
points (the first look the most) and keeps the round out of the top band: Bench-ready is earned
alone.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from dataclasses import dataclass

from fixbench.practice.safety import MAINS_ON_SHORT, Slip

FAULT_POINTS = 50.0
PARTS_POINTS = 20.0
EFFORT_POINTS = 30.0
MISSED_PART_SHARE = 0.3
EXTRA_PART_SHARE = 0.15
SLIP_POINTS = 10.0
COACH_FIRST_POINTS = 8.0  # the first look at the ranked suspects
COACH_MORE_POINTS = 1.0  # each look after it
COACH_MAX_POINTS = 15.0
PAR_SLACK_SHARE = 0.25  # minutes over par that still earn full effort points, as a share of par
PAR_SLACK_MIN = 3.0  # ... and at least this many minutes

READY = "Bench-ready"
NEARLY = "Nearly there"
PRACTISE = "Keep practising"
BANDS = ((85.0, READY), (60.0, NEARLY), (0.0, PRACTISE))  # lowest score of each band, top first


@dataclass(frozen=True)
class Score:
    fault_right: bool
    parts_needed: frozenset[str]
    parts_named: frozenset[str]
    minutes: float
    par: float
    fault_points: float
    parts_points: float
    effort_points: float
    slip_points: float
    coach_points: float
    total: float
    band: str
    capped_by_slip: bool
    capped_by_coach: bool = False

    @property
    def parts_missed(self) -> frozenset[str]:
        return self.parts_needed - self.parts_named

    @property
    def parts_extra(self) -> frozenset[str]:
        return self.parts_named - self.parts_needed


def band_of(total: float) -> str:
    return next(name for low, name in BANDS if total >= low)


def effort_share(minutes: float, par: float) -> float:
    allowed = par + max(PAR_SLACK_MIN, PAR_SLACK_SHARE * par)
    return 1.0 if minutes <= allowed else allowed / minutes


def coach_cost(looks: int) -> float:
    if looks <= 0:
        return 0.0
    return min(COACH_MAX_POINTS, COACH_FIRST_POINTS + COACH_MORE_POINTS * (looks - 1))


def score_round(*, true_group: Iterable[str], failed_parts: Mapping[str, str], fault_named: str,
                parts_named: Iterable[str], minutes: float, par: float, slips: Iterable[Slip],
                coach_looks: int = 0) -> Score:
    """The score of one round. ``slips`` are the mistakes, each once (as a round counts them)."""
    slips = tuple(slips)
    needed, named = frozenset(failed_parts), frozenset(parts_named)
    fault_right = fault_named in set(true_group)
    fault_points = FAULT_POINTS if fault_right else 0.0
    parts_share = 1.0 - MISSED_PART_SHARE * len(needed - named) - EXTRA_PART_SHARE * len(named - needed)
    parts_points = PARTS_POINTS * max(0.0, parts_share)
    effort_points = EFFORT_POINTS * effort_share(minutes, par) if fault_right else 0.0
    slip_points = SLIP_POINTS * len(slips)
    coach_points = coach_cost(coach_looks)
    total = max(0.0, fault_points + parts_points + effort_points - slip_points - coach_points)
    band = band_of(total)
    by_slip = by_coach = False
    if any(s.kind == MAINS_ON_SHORT for s in slips) and band != PRACTISE:
        band, by_slip = PRACTISE, True
    elif slips and band == READY:
        band, by_slip = NEARLY, True
    elif coach_looks and band == READY:
        band, by_coach = NEARLY, True
    return Score(fault_right, needed, named, minutes, par, fault_points, parts_points, effort_points,
                 slip_points, coach_points, round(total, 1), band, by_slip, by_coach)
