"""The demo trainees' practice rounds, played with the practice package itself: the unit is drawn
by practice's own scenario draw, the trainee's checks are taken on a :class:`PracticeRound`, the
diagnosis is committed, and the debrief (with its score, slips and band) comes from practice's
own debrief and scoring against the engine's own path. Nothing here scores anything: a change to
the scoring rules shows in the demo shop the next time it is built.

A trainee is played by habits that change as their training goes on (``progress`` from 0 to 1):
how often they take the check a careful technician would take next (the engine's proposal), how
often they grab a live check too early (the habit that blows units up), how often they stop before
the picture is clear, name a near miss, or ask the coach. The habits are invented for the demo.
"""

from __future__ import annotations

import random
from dataclasses import dataclass

from fixbench.knowledge import KnowledgeBase
from fixbench.practice.debrief import Debrief, debrief_round
from fixbench.practice.engine_path import engine_path
from fixbench.practice.levels import level
from fixbench.practice.progress import attempt_fields
from fixbench.practice.round import PracticeRound
from fixbench.practice.scenario import draw_scenario
from fixbench.demo.plan import DemoPractice

MAX_CHECKS = 25  # a trainee gives up and commits after this many checks
MAX_ACTIONS = 40  # ... or after this many reaches for a check, stopped ones included
SURE = 0.6  # the first suspect's chance at which a hasty trainee stops and commits


@dataclass(frozen=True)
class Habits:
    follows_plan: float  # chance a step is the check the engine proposes now
    grabs_live: float  # chance a step is a live check taken on a hunch
    stops_when_sure: float  # chance of committing as soon as one suspect passes SURE
    near_miss: float  # chance of naming the second suspect instead of the first
    asks_coach: float


def habits(progress: float) -> Habits:
    """From a new trainee's habits (progress 0) to a bench-ready one's (progress 1)."""
    def between(new: float, ready: float) -> float:
        return new + (ready - new) * progress

    return Habits(follows_plan=between(0.55, 0.97), grabs_live=between(0.12, 0.0),
                  stops_when_sure=between(0.5, 0.05), near_miss=between(0.3, 0.03),
                  asks_coach=between(0.6, 0.1))


def _next_check(rng: random.Random, practice: PracticeRound, ways: Habits) -> str | None:
    proposal = practice.state.next_check
    if proposal is None:
        return None
    checks = [c for c in practice.family.checks if not c.procedure]
    roll = rng.random()
    if roll < ways.grabs_live:
        live = [c for c in checks if c.power == "live"]
        return rng.choice(live).id if live else proposal.check.id
    if roll < ways.grabs_live + ways.follows_plan:
        return proposal.check.id
    return rng.choice(checks).id


def play_round(knowledge: KnowledgeBase, planned: DemoPractice) -> tuple[PracticeRound, Debrief]:
    """One planned round played and debriefed by the practice package (same plan, same round)."""
    family = knowledge.family(planned.family_id)
    scenario = draw_scenario(family, level(planned.level_id), planned.seed)
    practice = PracticeRound(family, scenario)
    rng = random.Random(planned.seed)
    ways = habits(planned.progress)
    coach_at = rng.randrange(1, 6) if rng.random() < ways.asks_coach else None
    for _reach in range(MAX_ACTIONS):
        if len(practice.steps) >= MAX_CHECKS:
            break
        if coach_at is not None and len(practice.steps) == coach_at and not practice.coach_looks:
            practice.coach()
        top = practice.state.suspects[0]
        if top.probability >= SURE and rng.random() < ways.stops_when_sure:
            break
        check_id = _next_check(rng, practice, ways)
        if check_id is None:
            break
        practice.take(check_id)  # a check a colleague would stop is stopped, and counted
    suspects = practice.state.suspects
    named = suspects[1] if len(suspects) > 1 and rng.random() < ways.near_miss else suspects[0]
    replaced = {action.part for action in practice.state.final_conclusion().replace}
    if named is not suspects[0]:
        replaced = {named.part} if named.part else set()
    practice.commit(named.fault, replaced)
    return practice, debrief_round(practice, engine_path(family, scenario))


def practice_attempts(knowledge: KnowledgeBase, planned: list[DemoPractice]) -> list[dict]:
    """The store's fields of each planned round as played (the trainee and moment added)."""
    attempts = []
    for round_plan in planned:
        practice, debrief = play_round(knowledge, round_plan)
        attempts.append({**attempt_fields(practice, debrief), "attempted_at": round_plan.attempted_at})
    return attempts
