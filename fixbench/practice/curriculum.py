"""Where a trainee is weakest, and the next unit drawn there, with repetition spaced over days.

Each fault of each family is an item. A round on it went well when the verdict was right, with no
safety mistake and at most WASTE_OK checks that told nothing; otherwise it went badly, for one or
more reasons: the fault missed, a slip made, checks wasted. An item comes due again after a wait
that grows with each round in a row that went well (SPACING_DAYS, the Leitner schedule of spaced
repetition [src: S. Leitner, So lernt man lernen, 1972; the expanding intervals of H. Ebbinghaus,
Über das Gedächtnis, 1885]) and falls back to a day after a round that went badly.

The next unit is, in order: the weakest item that is due (its last round went badly; most bad
rounds first, then the longest unseen); else, if a kind of slip was made and not yet followed by
two rounds without one, a fault that puts
the trainee in the same spot (a primary short for plain mains, a primary-side fault found by
powering up and then probing the primary for a missed discharge); else an item due for a repeat
(reviews before new material, as spaced repetition has it); else a fault not yet practised, drawn
by the knowledge base's weights; else the item that comes due first. The clock is the caller's: days are day numbers
(``date.toordinal``) and ``today`` comes in, never read here.
"""

from __future__ import annotations

import random
from collections import Counter
from dataclasses import dataclass

from fixbench.engine.fault_model import cached_fault_model
from fixbench.engine.hypotheses import NO_FAULT, root_weights
from fixbench.knowledge.model import Family
from fixbench.practice.levels import Level
from fixbench.practice.progress import AttemptRecord
from fixbench.practice.safety import MAINS_ON_SHORT, MAINS_UNPROVEN, UNDISCHARGED
from fixbench.practice.scenario import Scenario, practice_ratings, scenario_with_fault

SPACING_DAYS = (1, 3, 7, 14, 30)  # wait before an item comes due, by rounds in a row that went well
WASTE_OK = 1  # checks that told nothing still allowed in a round that went well
CLEAN_AFTER_SLIP = 2  # rounds without a slip after the last slip of a kind that put it behind
MISSED, SLIPPED, WASTED, NEW, DUE = "missed", "slipped", "wasted", "new", "due"
WHY_BEFORE = {  # said before the round: never names the fault
    MISSED: "a fault you missed before, due again",
    SLIPPED: "a unit that puts you where you made a safety slip lately",
    WASTED: "a fault where you took checks that told nothing, due again",
    NEW: "a fault you have not practised yet",
    DUE: "a fault you know, due for a repeat",
}


@dataclass(frozen=True)
class ItemHistory:
    family_id: str
    fault_id: str
    rounds: int
    missed: int
    slipped: int
    wasted: int
    streak: int  # rounds in a row that went well, at the end
    last_seen: int  # day number (date.toordinal)

    @property
    def bad_rounds(self) -> int:
        return self.missed + self.slipped + self.wasted

    @property
    def due(self) -> int:
        """The day number it comes due again."""
        return self.last_seen + SPACING_DAYS[min(self.streak, len(SPACING_DAYS) - 1)]


@dataclass(frozen=True)
class Weaknesses:
    items: tuple[ItemHistory, ...]  # weakest first
    slips: dict[str, int]  # kind -> mistakes, over every kept round
    recent_slips: frozenset[str]  # kinds not yet followed by CLEAN_AFTER_SLIP rounds without a slip

    def weak_faults(self) -> tuple[ItemHistory, ...]:
        return tuple(item for item in self.items if item.missed)


@dataclass(frozen=True)
class NextUnit:
    scenario: Scenario
    why: str  # kind of reason (MISSED, SLIPPED...)

    @property
    def words(self) -> str:
        return WHY_BEFORE[self.why]


def _went_badly(a: AttemptRecord) -> tuple[bool, bool, bool]:
    return (a.fault_right is False, bool(a.slip_kinds) or a.safety_slips > 0,
            (a.checks_wasted or 0) > WASTE_OK)


def weaknesses(attempts: list[AttemptRecord]) -> Weaknesses:
    """Attempts oldest first; those kept without a date are left out of the spacing."""
    items: dict[tuple[str, str], ItemHistory] = {}
    for a in attempts:
        if a.day is None:
            continue
        missed, slipped, wasted = _went_badly(a)
        key = (a.family, a.fault)
        old = items.get(key)
        good = not (missed or slipped or wasted)
        items[key] = ItemHistory(a.family, a.fault, (old.rounds if old else 0) + 1,
                                 (old.missed if old else 0) + missed, (old.slipped if old else 0) + slipped,
                                 (old.wasted if old else 0) + wasted,
                                 ((old.streak if old else 0) + 1) if good else 0, a.day)
    slips = Counter(kind for a in attempts for kind in a.slip_kinds)
    recent = set()
    for kind in slips:
        last = max(i for i, a in enumerate(attempts) if kind in a.slip_kinds)
        if sum(not a.slip_kinds and not a.safety_slips for a in attempts[last + 1:]) < CLEAN_AFTER_SLIP:
            recent.add(kind)
    order = sorted(items.values(), key=lambda i: (-i.bad_rounds, i.streak, i.last_seen))
    return Weaknesses(tuple(order), dict(slips), frozenset(recent))


def slip_faults(family: Family, kind: str) -> list[str]:
    """Faults of the family that put a trainee where this kind of slip is made."""
    model = cached_fault_model(family, practice_ratings(family), ())
    shorts = {model.hypotheses[h].root for h in range(len(model.hypotheses)) if model.primary_short[h]}
    if kind in (MAINS_ON_SHORT, MAINS_UNPROVEN):
        return sorted(shorts - {NO_FAULT})
    primary = {f.id for f in family.faults
               if family.stage(family.part(f.part).stage).side == "primary"} - shorts
    return sorted(primary) if kind == UNDISCHARGED else []


def next_unit(families: list[Family], attempts: list[AttemptRecord], level: Level, today: int,
              seed: int) -> NextUnit:
    """The next unit for this trainee at this level (``families`` in a stable order; ``today`` a
    day number, as date.toordinal gives it)."""
    rng = random.Random(seed)
    known = {f.id: f for f in families}
    found = weaknesses(attempts)
    items = [i for i in found.items if i.family_id in known
             and (i.fault_id == NO_FAULT or i.fault_id in {f.id for f in known[i.family_id].faults})]
    due = [i for i in items if i.due <= today]
    weak = [i for i in due if i.bad_rounds and i.streak == 0]
    if weak:
        item = weak[0]
        why = MISSED if item.missed else SLIPPED if item.slipped else WASTED
        return _unit(known[item.family_id], item.fault_id, level, seed, why)
    seen = {(i.family_id, i.fault_id) for i in items}
    waiting = {(i.family_id, i.fault_id) for i in items if i.due > today}
    for kind in sorted(found.recent_slips):
        choices = [(f, fault) for f in families for fault in slip_faults(f, kind) if (f.id, fault) not in waiting]
        if choices:
            family, fault = rng.choice(choices)
            return _unit(family, fault, level, seed, SLIPPED)
    if due:
        item = min(due, key=lambda i: i.due)
        return _unit(known[item.family_id], item.fault_id, level, seed, DUE)
    fresh = [(f, fault, w) for f in families for fault, w in root_weights(f).items()
             if (f.id, fault) not in seen and not (fault == NO_FAULT and level.id == "easy")]
    if fresh:
        family, fault, _ = rng.choices(fresh, weights=[w for *_, w in fresh])[0]
        return _unit(family, fault, level, seed, NEW)
    item = min(items, key=lambda i: i.due)
    return _unit(known[item.family_id], item.fault_id, level, seed, DUE)


def _unit(family: Family, fault_id: str, level: Level, seed: int, why: str) -> NextUnit:
    return NextUnit(scenario_with_fault(family, level, fault_id, seed), why)
