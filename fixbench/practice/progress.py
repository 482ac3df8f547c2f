"""A trainee's progress from their kept attempts, and what one attempt is kept as.

An attempt is kept as its scenario id (source, level, family, root fault, seed), with ":coach"
added when the coach was asked and ":blown" when the trainee blew the fuse on plain mains (that
slip caps the band lowest, so progress must know it), the checks taken, the bench minutes, the
score and the slips.
"""

from __future__ import annotations

import statistics
from dataclasses import dataclass

from fixbench.practice.debrief import Debrief
from fixbench.practice.round import PracticeRound
from fixbench.practice.scoring import NEARLY, PRACTISE, READY, band_of

COACH_MARK = "coach"
BLOWN_MARK = "blown"
RECENT = 5  # rounds that count as "recent" for the trend


@dataclass(frozen=True)
class AttemptRecord:
    scenario: str
    checks_used: int
    minutes: float
    score: float
    safety_slips: int

    @property
    def level(self) -> str:
        parts = self.scenario.split(":")
        return parts[1] if len(parts) > 1 else "?"

    @property
    def family(self) -> str:
        parts = self.scenario.split(":")
        return parts[2] if len(parts) > 2 else "?"

    @property
    def coached(self) -> bool:
        return COACH_MARK in self.scenario.split(":")[5:]

    @property
    def band(self) -> str:
        if BLOWN_MARK in self.scenario.split(":")[5:]:
            return PRACTISE
        band = band_of(self.score)
        return NEARLY if band == READY and self.safety_slips else band


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
    """Keyword arguments for the store's add_practice_attempt (without the trainee)."""
    marks = [COACH_MARK] if practice.coach_looks else []
    if any(slip.blew_fuse for slip in debrief.slips):
        marks.append(BLOWN_MARK)
    scenario = ":".join([practice.scenario.id] + marks)
    return {"scenario": scenario, "checks_used": len(practice.steps), "minutes": practice.clock,
            "score": debrief.score.total, "safety_slips": len(debrief.slips)}


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
        coached_rounds=sum(a.coached for a in attempts),
    )
