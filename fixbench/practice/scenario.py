"""What a practice round hides: the family, the unit's ratings, the root fault and every failed part.

A scenario is drawn from the knowledge base's fault weights for a family and level, or replayed
from a closed case of the shop. A replayed case keeps only what the diagnosis needs (family,
ratings, confirmed fault, the month it closed, and what the customer said when it came in): no
customer, ticket, device or technician.
"""

from __future__ import annotations

import random
from dataclasses import dataclass

from fixbench.engine.diagnosis import start_diagnosis
from fixbench.engine.hypotheses import NO_FAULT, root_weights
from fixbench.engine.simulate import draw_modes
from fixbench.knowledge.model import Family
from fixbench.physics.ratings import Ratings, parse_ratings
from fixbench.practice.levels import Level
from fixbench.quantities import ReadingError

# Invented units to practise on, by family: label ratings as a shop would read them.
PRACTICE_UNITS: dict[str, tuple[dict[str, str], ...]] = {
    "pwm_flyback": ({"mains": "universal", "bench_mains": "230 V", "output": "19 V", "current": "3.4 A"},
                    {"mains": "230 V", "output": "12 V", "current": "2 A"}),
    "primary_side": ({"mains": "universal", "bench_mains": "230 V", "output": "5 V", "current": "2 A"},
                     {"mains": "230 V", "output": "5 V", "current": "1 A"}),
    "self_oscillating": ({"mains": "230 V", "output": "5 V", "current": "1 A"},
                         {"mains": "230 V", "output": "12 V", "current": "0.5 A"}),
    "integrated_opto": ({"mains": "universal", "bench_mains": "230 V", "output": "12 V", "current": "1 A"},
                        {"mains": "230 V", "output": "5 V", "current": "2 A"}),
    "integrated_primary_side": ({"mains": "universal", "bench_mains": "230 V", "output": "5 V", "current": "1 A"},
                                {"mains": "230 V", "output": "5 V", "current": "0.6 A"}),
    "pwm_pfc": ({"mains": "universal", "bench_mains": "230 V", "output": "19.5 V", "current": "4.62 A"},
                {"mains": "universal", "bench_mains": "120 V", "output": "20 V", "current": "6 A"}),
}
SURE_COLLATERAL = 0.8  # collateral this likely is part of the fault's textbook picture
FALLBACK_UNIT = {"mains": "230 V", "output": "5 V", "current": "1 A"}


@dataclass(frozen=True)
class Scenario:
    family_id: str
    ratings: tuple[tuple[str, str], ...]  # label ratings as text, sorted by name
    fault_id: str  # the root fault, or NO_FAULT
    modes: tuple[tuple[str, str], ...]  # every failed part with its mode, root first
    level_id: str
    seed: int
    intermittent: bool  # the fault comes and goes while readings are taken
    source: str = "drawn"  # "drawn", "chosen" (by the curriculum) or "replay"
    closed: str = ""  # for a replay: the month the case closed, e.g. "2024-03"
    told: tuple[tuple[str, str], ...] = ()  # for a replay: the customer's answers as the shop kept them

    @property
    def id(self) -> str:
        """The scenario as the store keeps it: with the family and level, the seed draws the same unit."""
        return f"{self.source}:{self.level_id}:{self.family_id}:{self.fault_id}:s{self.seed}"

    def parsed_ratings(self) -> Ratings:
        return parse_ratings(dict(self.ratings))

    def failed_parts(self) -> dict[str, str]:
        return dict(self.modes)

    def describe(self) -> str:
        """What the trainee is told about the unit (never the fault)."""
        r = dict(self.ratings)
        mains = r.get("bench_mains", r.get("mains", ""))
        rating = f"{r.get('output', '?')} / {r.get('current', '?')} supply on {mains} mains"
        if self.source == "replay":
            return f"A closed case of the shop ({self.closed}), replayed: {rating}"
        return f"A {rating}"


@dataclass(frozen=True)
class PastCase:
    """A closed case as plain data, already stripped of who and whose."""

    family_id: str
    ratings: dict[str, str]
    confirmed_fault: str
    closed: str  # "YYYY-MM"
    told: tuple[tuple[str, str], ...] = ()  # (question check id, the customer's answer)


def intermittent_fault(family: Family, fault_id: str) -> bool:
    """Faults that come and go on the bench: a lead broken inside its jacket, a dried-out
    electrolytic that starts the unit some days and not others [practice]."""
    if fault_id == NO_FAULT:
        return False
    fault = family.fault(fault_id)
    part = family.part(fault.part)
    return (part.role == "lead" and fault.mode == "open") or (part.kind == "electrolytic" and fault.mode == "dried")


def _modes(family: Family, fault_id: str, level: Level, rng: random.Random) -> tuple[tuple[str, str], ...]:
    if fault_id == NO_FAULT:
        return ()
    if not level.collateral:
        # One clear fault: the root with only the damage that nearly always goes with it (the fuse
        # a short takes out), so the unit shows the textbook picture.
        fault = family.fault(fault_id)
        sure = tuple((c.part, c.mode) for c in fault.collateral
                     if c.probability >= SURE_COLLATERAL and c.part != fault.part)
        return ((fault.part, fault.mode),) + sure
    return tuple(draw_modes(family, fault_id, rng).items())


def draw_scenario(family: Family, level: Level, seed: int) -> Scenario:
    """A unit of this family with a fault drawn from the knowledge base's weights."""
    rng = random.Random(seed)
    units = PRACTICE_UNITS.get(family.id, (FALLBACK_UNIT,))
    ratings = rng.choice(units)
    weights = root_weights(family)
    if level.id == "easy":
        weights.pop(NO_FAULT)  # easy rounds always hide a fault
    chances = [w * (level.intermittent_boost if intermittent_fault(family, f) else 1.0) for f, w in weights.items()]
    fault_id = rng.choices(list(weights), weights=chances)[0]
    return _scenario(family, ratings, fault_id, level, rng, seed)


def scenario_with_fault(family: Family, level: Level, fault_id: str, seed: int) -> Scenario:
    """A unit of this family hiding the given fault (the curriculum's choice), its damage drawn
    as the level draws it."""
    if fault_id != NO_FAULT:
        family.fault(fault_id)  # an unknown fault fails loudly here
    rng = random.Random(seed)
    ratings = rng.choice(PRACTICE_UNITS.get(family.id, (FALLBACK_UNIT,)))
    return _scenario(family, ratings, fault_id, level, rng, seed, "chosen")


def practice_ratings(family: Family) -> Ratings:
    """The first practice unit of the family, for questions about the family as a whole."""
    return parse_ratings(PRACTICE_UNITS.get(family.id, (FALLBACK_UNIT,))[0])


def replay_scenario(family: Family, case: PastCase, level: Level, seed: int) -> Scenario:
    """A closed case of the shop as a round: its unit and confirmed fault, collateral drawn anew."""
    if case.confirmed_fault != NO_FAULT and case.confirmed_fault not in {f.id for f in family.faults}:
        raise ValueError(f"case fault '{case.confirmed_fault}' is not a fault of family '{family.id}'")
    rng = random.Random(seed)
    return _scenario(family, case.ratings, case.confirmed_fault, level, rng, seed, "replay", case.closed,
                     _answers_read(family, case))


def _answers_read(family: Family, case: PastCase) -> tuple[tuple[str, str], ...]:
    """The customer's answers kept with the case, as the outcomes they read as (any that no longer
    reads, under a changed knowledge file, is left for the unit to answer)."""
    state = start_diagnosis(family, parse_ratings(case.ratings))
    kept = []
    for check_id, typed in case.told:
        if not family.has_check(check_id):
            continue
        try:
            kept.append((check_id, state.with_reading(check_id, typed).readings[-1].outcome))
        except ReadingError:
            continue
    return tuple(kept)


def _scenario(family: Family, ratings: dict[str, str], fault_id: str, level: Level, rng: random.Random,
              seed: int, source: str = "drawn", closed: str = "",
              told: tuple[tuple[str, str], ...] = ()) -> Scenario:
    modes = _modes(family, fault_id, level, rng)
    intermittent = level.intermittent_away > 0 and intermittent_fault(family, fault_id)
    return Scenario(family.id, tuple(sorted(ratings.items())), fault_id, modes, level.id, seed,
                    intermittent, source, closed, told)
