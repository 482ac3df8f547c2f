"""Replaying readings typed earlier: a kept case resumed at the bench, a case file given to
`fixbench diagnose`, a closed case run through today's engine.

Each reading is taken in order as it was typed. One that this build cannot take (its check is no
longer in the family's knowledge file, or its text no longer reads) is set aside with the reason,
and the others are still taken; the caller decides whether a refusal is an error (a case file) or
a note to show (a kept case, whose record stays as it was).
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass

from fixbench.engine.diagnosis import DiagnosisState
from fixbench.engine.readings import read
from fixbench.quantities import ReadingError


@dataclass(frozen=True)
class RefusedReading:
    index: int  # position in the readings given
    check_id: str
    typed: str
    reason: str
    unknown_check: bool  # the check itself is unknown, rather than the text not reading


@dataclass(frozen=True)
class Replayed:
    state: DiagnosisState
    refused: tuple[RefusedReading, ...] = ()


def replay_readings(state: DiagnosisState, readings: Iterable[tuple[str, str]]) -> Replayed:
    """Take ``(check id, text as typed)`` pairs in order on ``state``: each is read against its
    check, then all are taken at once, so the work grows with the number of readings, not its
    square."""
    refused, taken = [], []
    model = state.model
    for index, (check_id, typed) in enumerate(readings):
        if not state.family.has_check(check_id):
            refused.append(RefusedReading(index, check_id, typed,
                                          f"unknown check '{check_id}' for family "
                                          f"'{state.family.id}'", True))
            continue
        try:
            taken.append(read(model.checks[model.check_index(check_id)], typed))
        except ReadingError as err:
            refused.append(RefusedReading(index, check_id, typed, str(err), False))
    return Replayed(state.with_readings(taken), tuple(refused))
