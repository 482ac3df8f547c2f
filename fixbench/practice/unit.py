"""The hidden unit a trainee measures: the engine's simulated unit with the level's quirks.

On the hard level a customer's answer may be wrong (a report of what they did not see), and a
fault that comes and goes is sometimes away while a reading is taken: that reading is what a
healthy unit gives. The quirks draw from their own random stream, so the same scenario gives
the same readings for the same checks in the same order.
"""

from __future__ import annotations

import random
from dataclasses import dataclass

from fixbench.engine.fault_model import FaultModel
from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.simulate import SimulatedUnit, simulated_unit
from fixbench.knowledge.model import Family
from fixbench.practice.levels import level as level_of
from fixbench.practice.scenario import Scenario

QUIRK_STREAM = 0x5EED  # offsets the quirks' random stream from the unit's own
REPORT_INSTRUMENTS = ("question",)  # what the customer tells, not what the technician sees


@dataclass(frozen=True)
class Answer:
    text: str  # the reading as the meter or the customer gives it
    fault_away: bool = False  # an intermittent fault was absent while this was read
    misleading: bool = False  # the customer's report was wrong


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
        check = self.family.check(check_id)
        if (self._twin is not None and check.power != "none"
                and self._quirks.random() < self.level.intermittent_away):
            return Answer(self._twin.measure(check_id), fault_away=True)
        text = self._unit.measure(check_id)
        if (check.instrument in REPORT_INSTRUMENTS and self.level.report_wrong_rate
                and self._quirks.random() < self.level.report_wrong_rate):
            others = [o for o in check.outcomes if o != text]
            if others:
                return Answer(self._quirks.choice(others), misleading=True)
        return Answer(text)
