"""A simulated faulty unit: the readings a unit with a given fault gives, for practice rounds, the
benchmark and `fixbench simulate`.

The fault's collateral damage is drawn with the probabilities the knowledge base gives, the unit is
run through the same operating model the inference uses, and each reading gets meter tolerance.
With ``wrong_rate`` some readings are replaced by a reading of another class (a misread or bad probe
contact). Power is real: plain mains on a unit with a shorted primary blows the fuse (again), and
every later reading is of that unit.
"""

from __future__ import annotations

import math
import random
from dataclasses import dataclass, field

from fixbench.knowledge.model import Family
from fixbench.physics.ratings import Ratings
from fixbench.quantities import format_quantity

from fixbench.engine.fault_model import FaultModel, cached_fault_model
from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.operating import Operation, operate
from fixbench.engine.part_readings import cold_reading

METER_TOLERANCE = 0.015  # relative sigma of a handheld meter reading with part tolerance [practice]


def draw_modes(family: Family, fault_id: str, rng: random.Random) -> dict[str, str]:
    """The failed parts of one unit with this root fault: the root plus drawn collateral."""
    if fault_id == NO_FAULT:
        return {}
    fault = family.fault(fault_id)
    modes = {fault.part: fault.mode}
    for item in fault.collateral:
        if rng.random() < item.probability and item.part not in modes:
            modes[item.part] = item.mode
    return modes


@dataclass
class SimulatedUnit:
    """A unit on the simulated bench. ``measure`` gives what the technician would read."""

    model: FaultModel
    modes: dict[str, str]
    rng: random.Random
    exact: bool = False
    wrong_rate: float = 0.0
    events: list[str] = field(default_factory=list)

    def __post_init__(self) -> None:
        self._operation: Operation = self._run()

    def _run(self) -> Operation:
        return operate(self.model.family, self.model.ratings, self.model.healthy, self.modes)

    @property
    def fuse_would_blow(self) -> bool:
        return self._operation.fuse_blows

    def live_operation(self, commit: bool = True) -> Operation:
        """The unit on plain mains. A shorted primary takes the fuse with it; with ``commit`` the
        blown fuse stays blown for every later reading."""
        if not self._operation.fuse_blows:
            return self._operation
        blown = {**self.modes, **dict(self._operation.damage)}  # a switch an open clamp killed
        for fuse in self.model.family.parts_with_role("fuse"):
            blown[fuse.id] = "open"
        operation = operate(self.model.family, self.model.ratings, self.model.healthy, blown)
        if commit:
            self.modes = blown
            self._operation = operation
            self.events.append("fuse_blown")
        return operation

    def measure(self, check_id: str, commit_power: bool = True) -> str:
        index = self.model.check_index(check_id)
        check_model = self.model.checks[index]
        check = check_model.check
        operation = self.live_operation(commit_power) if check.power == "live" else self._operation
        if check.unit is None:
            chances = operation.outcomes[check.target_id]
            names = list(check_model.classes.names)
            if self.exact:
                outcome = max(names, key=lambda n: (chances.get(n, 0.0), -names.index(n)))
            else:
                outcome = self.rng.choices(names, weights=[chances.get(n, 0.0) for n in names])[0]
            if self.wrong_rate and self.rng.random() < self.wrong_rate:
                outcome = self.rng.choice([n for n in names if n != outcome] or names)
            return outcome
        if check.target_kind == "part":
            value = cold_reading(self.model.family, self.model.ratings, check, self.modes)
        else:
            value = operation.values[check.target_id]
        if self.wrong_rate and self.rng.random() < self.wrong_rate:
            true_class = check_model.classes.classify(value)
            others = [n for n in check_model.classes.names if n != true_class]
            if others:
                value = check_model.classes.representative(self.rng.choice(others), check_model.healthy)
        elif not self.exact and not math.isinf(value):
            value *= 1.0 + self.rng.gauss(0.0, METER_TOLERANCE)
        return format_quantity(value, check.unit, 3)


def simulated_unit(family: Family, ratings: Ratings, fault_id: str, seed: int = 0, exact: bool = False,
                   wrong_rate: float = 0.0, modes: dict[str, str] | None = None) -> SimulatedUnit:
    rng = random.Random(seed)
    model = cached_fault_model(family, ratings)
    drawn = dict(modes) if modes is not None else draw_modes(family, fault_id, rng)
    return SimulatedUnit(model, drawn, rng, exact=exact, wrong_rate=wrong_rate)


def simulate_readings(family: Family, ratings: Ratings, fault_id: str, seed: int = 0,
                      noise: bool = True, wrong_rate: float = 0.0) -> dict[str, str]:
    """The reading of every check of the family on one unit with this fault (each on the
    unit as it came in: a live reading of a shorted unit shows the blown fuse, but later readings
    do not inherit it).
    """
    unit = simulated_unit(family, ratings, fault_id, seed, exact=not noise, wrong_rate=wrong_rate)
    return {c.check.id: unit.measure(c.check.id, commit_power=False) for c in unit.model.checks}
