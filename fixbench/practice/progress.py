"""A trainee's progress from their kept attempts, and what one attempt is kept as.

An attempt is kept as its scenario id (source, level, family, root fault, seed), the checks taken,
the bench minutes, the score, the slips, whether the coach was asked, and whether the trainee blew
the fuse on plain mains (that slip caps the band lowest, so progress must know it); and what it
taught: whether the verdict was right, the kinds of safety mistake made, the checks that told
nothing, and the round's record (see :mod:`fixbench.practice.record`) to open its debrief again.
"""

from __future__ import annotations

import statistics
from dataclasses import dataclass

from fixbench.practice.debrief import Debrief
from fixbench.practice.record import round_record
from fixbench.practice.round import PracticeRound
from fixbench.practice.scoring import NEARLY, PRACTISE, READY, band_of

RECENT = 5  # rounds that count as "recent" for the trend


@dataclass(frozen=True)
class AttemptRecord:
    scenario: str
    checks_used: int
    minutes: float
    score: float
    safety_slips: int
    coach_used: bool = False
    fuse_blown: bool = False
    attempt_id: int | None = None
    day: int | None = None  # the day it was played, as a day number (date.toordinal); no clock here
    played_on: str = ""  # the same day as the shop writes dates, for showing
    fault_right: bool | None = None  # None: kept before the verdict was
    slip_kinds: tuple[str, ...] = ()
    checks_wasted: int | None = None
    can_reopen: bool = False

    def _field(self, i: int) -> str:
        parts = self.scenario.split(":")
        return parts[i] if len(parts) > i else "?"

    @property
    def level(self) -> str:
        return self._field(1)

    @property
    def family(self) -> str:
        return self._field(2)

    @property
    def fault(self) -> str:
        return self._field(3)

    @property
    def band(self) -> str:
        if self.fuse_blown:
            return PRACTISE
        band = band_of(self.score)
        if band == READY and (self.safety_slips or self.coach_used):
            return NEARLY
        return band


@dataclass(frozen=True)
class Progress:
    rounds: int
    mean_score: float | None
    recent_mean: float | None  # the last RECENT rounds
    earlier_mean: float | None  # the rounds before those
    ready_rounds: int  # rounds in the top band
    rounds_with_slips: int
    coached_rounds: int


def attempt_fields(practice: PracticeRound, debrief: Debrief) -> dict:
    """Keyword arguments for the store's add_practice_attempt (without the trainee and date)."""
    return {"scenario": practice.scenario.id, "checks_used": len(practice.steps),
            "minutes": practice.clock, "score": debrief.score.total,
            "safety_slips": len(debrief.slips), "coach_used": bool(practice.coach_looks),
            "fuse_blown": any(slip.blew_fuse for slip in debrief.slips),
            "fault_right": debrief.right, "slip_kinds": ",".join(s.kind for s in debrief.slips),
            "checks_wasted": len(debrief.told_nothing), "record": round_record(practice)}


def progress_of(attempts: list[AttemptRecord]) -> Progress:
    """Attempts oldest first."""
    scores = [a.score for a in attempts]
    recent, earlier = scores[-RECENT:], scores[:-RECENT]
    return Progress(
        rounds=len(attempts),
        mean_score=statistics.fmean(scores) if scores else None,
        recent_mean=statistics.fmean(recent) if recent else None,
        earlier_mean=statistics.fmean(earlier) if earlier else None,
        ready_rounds=sum(a.band == READY for a in attempts),
        rounds_with_slips=sum(a.safety_slips > 0 for a in attempts),
        coached_rounds=sum(a.coach_used for a in attempts),
    )
