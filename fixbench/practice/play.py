"""Playing a whole round along a given path and scoring it, in one call.

For everything that plays rounds without a person at the screen: the fairness benchmark (the
engine's own path played as a trainee), the demo shop's practice history (trainees' rounds played
along made-up paths), and reopening a kept round (its actions played again, which the hidden unit's
seeded streams make exact).
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass

from fixbench.knowledge.model import Family
from fixbench.practice.debrief import Debrief, debrief_round
from fixbench.practice.engine_path import EnginePath, engine_path
from fixbench.practice.round import COACH, TAKE, PracticeRound
from fixbench.practice.scenario import Scenario


@dataclass(frozen=True)
class PlayedRound:
    practice: PracticeRound
    engine: EnginePath
    debrief: Debrief


def play_round(family: Family, scenario: Scenario, actions: Iterable[tuple[str, str] | str], fault_id: str,
               parts: Iterable[str], engine: EnginePath | None = None) -> PlayedRound:
    """Take ``actions`` in order (a check id, or ("take", check id) / ("coach", "")), commit
    ``fault_id`` with ``parts``, and debrief against the engine's path (worked out unless given).
    A check a colleague would stop is stopped and counted, as at the screen."""
    practice = PracticeRound(family, scenario)
    for action in actions:
        kind, check_id = (TAKE, action) if isinstance(action, str) else action
        if kind == COACH:
            practice.coach()
        else:
            practice.take(check_id)
    practice.commit(fault_id, frozenset(parts))
    engine = engine if engine is not None else engine_path(family, scenario)
    return PlayedRound(practice, engine, debrief_round(practice, engine))


def engine_as_trainee(family: Family, scenario: Scenario) -> PlayedRound:
    """The engine's own path played as a trainee would play it, and scored."""
    engine = engine_path(family, scenario)
    return play_round(family, scenario, [s.check_id for s in engine.steps], engine.fault_id, engine.parts, engine)
