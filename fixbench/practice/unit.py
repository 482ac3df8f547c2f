"""The hidden unit a trainee measures: the engine's simulated unit with the level's quirks.

The customer's complaint is asked once, when the unit comes in: the answers to the family's
questions for the customer (for a replayed case, what its customer said, as the shop kept it).
Asked again, the customer tells the same story. On the hard level one complaint in four has one
answer wrong (a report of what they did not see).

A fault that comes and goes is sometimes away while the unit is powered (series lamp or mains):
that reading is what a healthy unit gives. Cold readings show the part as it is: a dried
electrolytic reads its high ESR whether or not it starts the unit today, and a lead broken in its
jacket reads open when flexed along its length while the meter watches [practice].

The quirks draw from their own random stream, so the same scenario gives the same readings for the
same checks in the same order.
"""

from __future__ import annotations

import random
from dataclasses import dataclass

from fixbench.engine.fault_model import FaultModel
from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.simulate import SimulatedUnit, simulated_unit
from fixbench.knowledge.model import Check, Family
from fixbench.practice.levels import level as level_of
from fixbench.practice.scenario import Scenario

QUIRK_STREAM = 0x5EED  # offsets the quirks' random stream from the unit's own
REPORT_INSTRUMENTS = ("question",)  # what the customer tells, not what the technician sees
POWERED = ("lamp", "live")


@dataclass(frozen=True)
class Answer:
    text: str  # the reading as the meter or the customer gives it
    fault_away: bool = False  # an intermittent fault was absent while this was read
    misleading: bool = False  # the customer's report was wrong


def complaint_checks(family: Family) -> tuple[Check, ...]:
    """The questions the customer answers when the unit comes in, in the family's order."""
    return tuple(c for c in family.checks if c.instrument in REPORT_INSTRUMENTS)


class HiddenUnit:
    def __init__(self, family: Family, scenario: Scenario) -> None:
        self.family = family
        self.scenario = scenario
        self.level = level_of(scenario.level_id)
        ratings = scenario.parsed_ratings()
        self._unit: SimulatedUnit = simulated_unit(
            family, ratings, scenario.fault_id, scenario.seed, exact=self.level.exact,
            wrong_rate=self.level.wrong_rate, modes=scenario.failed_parts())
        self._quirks = random.Random(scenario.seed + QUIRK_STREAM)
        self._twin: SimulatedUnit | None = None
        if scenario.intermittent:
            self._twin = simulated_unit(family, ratings, NO_FAULT, scenario.seed + 1, exact=self.level.exact,
                                        modes={})
        # The complaint is taken first, in a fixed order, so every copy of the unit hears the same.
        self.complaint: tuple[tuple[str, Answer], ...] = self._take_complaint()
        self._told = dict(self.complaint)

    @property
    def model(self) -> FaultModel:
        return self._unit.model

    @property
    def failed_parts(self) -> dict[str, str]:
        """Every failed part now, including a fuse the trainee blew."""
        return dict(self._unit.modes)

    @property
    def fuse_would_blow(self) -> bool:
        return self._unit.fuse_would_blow

    @property
    def fuse_blown_on_bench(self) -> bool:
        return "fuse_blown" in self._unit.events

    def measure(self, check_id: str) -> Answer:
        if check_id in self._told:
            return self._told[check_id]  # the customer tells the same story again
        check = self.family.check(check_id)
        if (self._twin is not None and check.power in POWERED
                and self._quirks.random() < self.level.intermittent_away):
            return Answer(self._twin.measure(check_id), fault_away=True)
        return Answer(self._unit.measure(check_id))

    def _take_complaint(self) -> tuple[tuple[str, Answer], ...]:
        """The customer's answers; on the hard level one complaint in four gets one detail wrong."""
        checks = complaint_checks(self.family)
        answers = [Answer(self._unit.measure(check.id)) for check in checks]
        kept = dict(self.scenario.told)
        if kept:  # a replayed case: what its customer really said, as the shop kept it
            return tuple((c.id, Answer(kept[c.id]) if c.id in kept else a) for c, a in zip(checks, answers))
        if checks and self.level.report_wrong_rate and self._quirks.random() < self.level.report_wrong_rate:
            i = self._quirks.randrange(len(checks))
            others = [o for o in checks[i].outcomes if o != answers[i].text]
            if others:
                answers[i] = Answer(self._quirks.choice(others), misleading=True)
        return tuple((check.id, answer) for check, answer in zip(checks, answers))
