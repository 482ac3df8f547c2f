"""The fault model of one unit: every hypothesis run through the operating model, and for every
check the outcome each hypothesis predicts.

Built once per family, ratings and prior counts (it takes a few milliseconds) and then shared by
inference, planning, simulation and the benchmark. The prediction table P[h, k] gives the chance
that check c reads class k if hypothesis h is true; it spreads a predicted value over neighbouring
classes by the meter and part tolerance, and mixes in a small chance that the reading is simply
wrong (misread, bad probe contact), so one bad reading never rules the true fault out.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from fixbench.knowledge.model import Check, Family
from fixbench.physics.expectation import Expectation
from fixbench.physics.healthy import HealthyUnit, healthy_unit
from fixbench.physics.parts import cold_expectation
from fixbench.physics.ratings import Ratings

from fixbench.engine.hypotheses import NO_FAULT, Hypothesis, build_hypotheses
from fixbench.engine.operating import Operation, operate
from fixbench.engine.outcomes import OutcomeClasses, numeric_classes, outcome_classes
from fixbench.engine.part_readings import cold_reading

# Chance that a reading is wrong, by instrument: customers' reports are the least reliable
# [practice; the 5 % wrong-reading rate of the engine benchmark sits above the meters' figure].
WRONG_READING = {"question": 0.10, "eyes": 0.06, "ears": 0.08, "nose": 0.10, "series_lamp": 0.03}
WRONG_READING_METER = 0.04
OPEN_CLAMP_ROLES = ("clamp_diode", "clamp_resistor")  # open, the switch avalanches when powered [practice]
TOLERANCE = 0.03  # relative spread of a predicted value: meter accuracy plus part tolerance [practice]


class EngineError(ValueError):
    """A family that the model cannot run (a check on a signal the family does not produce)."""


@dataclass(frozen=True)
class CheckModel:
    """What one check can read and what each hypothesis predicts it reads."""

    check: Check
    classes: OutcomeClasses
    healthy: Expectation | None  # numeric checks
    healthy_outcome: str | None  # outcome checks
    predicted: np.ndarray  # P[h, k] without wrong readings
    table: np.ndarray  # P[h, k] with wrong readings mixed in
    values: tuple[float | None, ...]  # predicted numeric value per hypothesis (None: outcome check)
    informative: bool


@dataclass(frozen=True)
class FaultModel:
    family: Family
    ratings: Ratings
    healthy: HealthyUnit
    hypotheses: tuple[Hypothesis, ...]
    operations: tuple[Operation, ...]
    checks: tuple[CheckModel, ...]
    roots: tuple[str, ...]  # root faults in order, NO_FAULT first
    root_of: np.ndarray  # hypothesis index -> root index
    prior: np.ndarray  # over hypotheses
    groups: tuple[tuple[str, ...], ...]  # roots no check can tell apart, each a group
    primary_short: np.ndarray  # bool per hypothesis
    clamp_open: np.ndarray  # bool per hypothesis: the switch's clamp (diode or resistor) open

    def check_index(self, check_id: str) -> int:
        for i, model in enumerate(self.checks):
            if model.check.id == check_id:
                return i
        raise KeyError(f"unknown check '{check_id}' for family '{self.family.id}'")

    def group_of(self, root: str) -> tuple[str, ...]:
        return next(g for g in self.groups if root in g)


def _class_probabilities(classes: OutcomeClasses, value: float) -> np.ndarray:
    """Spread a predicted value over the classes by the tolerance (normal, relative sigma)."""
    probabilities = np.zeros(len(classes.names))
    if math.isinf(value) or value == 0.0:
        probabilities[classes.names.index(classes.classify(value))] = 1.0
        return probabilities
    sigma = TOLERANCE * abs(value)
    bounds = [-math.inf, *classes.edges, math.inf]
    cdf = [0.0 if b == -math.inf else 1.0 if b == math.inf else
           0.5 * (1.0 + math.erf((b - value) / (sigma * math.sqrt(2.0)))) for b in bounds]
    for k in range(len(classes.names)):
        probabilities[k] = max(cdf[k + 1] - cdf[k], 0.0)
    return probabilities / probabilities.sum()


def _check_model(family: Family, ratings: Ratings, healthy: HealthyUnit, check: Check,
                 hypotheses: tuple[Hypothesis, ...], operations: tuple[Operation, ...]) -> CheckModel:
    rows, values = [], []
    if check.target_kind == "part":
        expect = cold_expectation(family, check, ratings)
        classes = numeric_classes(check.instrument, expect)
        for hypothesis in hypotheses:
            value = cold_reading(family, ratings, check, dict(hypothesis.modes))
            values.append(value)
            rows.append(_class_probabilities(classes, value))
        healthy_outcome = None
    elif check.unit is not None:
        signal = check.target_id
        if signal not in healthy.numeric:
            raise EngineError(f"{family.source_file}: check '{check.id}' reads '{signal}', which the "
                              f"'{family.design.drive}' model does not produce")
        expect = healthy.numeric[signal]
        classes = numeric_classes(check.instrument, expect)
        for operation in operations:
            value = operation.values[signal]
            values.append(value)
            rows.append(_class_probabilities(classes, value))
        healthy_outcome = None
    else:
        signal = check.target_id
        expect = None
        healthy_outcome = healthy.outcome.get(signal)
        classes = outcome_classes(check.outcomes, healthy_outcome or check.outcomes[0])
        for operation in operations:
            if signal not in operation.outcomes:
                raise EngineError(f"{family.source_file}: check '{check.id}' reads '{signal}', which the "
                                  f"'{family.design.drive}' model does not produce")
            chances = operation.outcomes[signal]
            rows.append(np.array([chances.get(name, 0.0) for name in classes.names]))
            values.append(None)
    predicted = np.vstack(rows)
    wrong = WRONG_READING.get(check.instrument, WRONG_READING_METER)
    k = predicted.shape[1]
    table = (1.0 - wrong) * predicted + wrong / k
    informative = not check.procedure and bool(np.ptp(predicted, axis=0).max() > 1e-9)
    return CheckModel(check, classes, expect, healthy_outcome, predicted, table, tuple(values), informative)


def _groups(roots: tuple[str, ...], root_of: np.ndarray, prior: np.ndarray,
            checks: tuple[CheckModel, ...]) -> tuple[tuple[str, ...], ...]:
    """Roots whose predicted outcome distributions agree on every check (no check separates them)."""
    signatures: dict[bytes, list[str]] = {}
    for r, root in enumerate(roots):
        members = root_of == r
        weights = prior[members] / prior[members].sum()
        rows = [np.round(weights @ c.predicted[members], 6) for c in checks if c.informative]
        signatures.setdefault(np.concatenate(rows).tobytes(), []).append(root)
    return tuple(tuple(g) for g in signatures.values())


def build_fault_model(family: Family, ratings: Ratings,
                      prior_counts: dict[str, int] | None = None) -> FaultModel:
    healthy = healthy_unit(family.design, ratings)
    hypotheses = build_hypotheses(family, prior_counts)
    operations = tuple(operate(family, ratings, healthy, dict(h.modes)) for h in hypotheses)
    checks = tuple(_check_model(family, ratings, healthy, c, hypotheses, operations) for c in family.checks)
    roots = (NO_FAULT,) + tuple(f.id for f in family.faults)
    index = {root: i for i, root in enumerate(roots)}
    root_of = np.array([index[h.root] for h in hypotheses])
    prior = np.array([h.prior for h in hypotheses])
    prior = prior / prior.sum()
    return FaultModel(family, ratings, healthy, hypotheses, operations, checks, roots, root_of, prior,
                      _groups(roots, root_of, prior, checks),
                      np.array([op.primary_short for op in operations]),
                      np.array([_opens_clamp(family, h) for h in hypotheses], dtype=bool))


def _opens_clamp(family: Family, hypothesis: Hypothesis) -> bool:
    return any(mode == "open" and family.part(part).role in OPEN_CLAMP_ROLES for part, mode in hypothesis.modes)


@lru_cache(maxsize=32)
def cached_fault_model(family: Family, ratings: Ratings,
                       prior_counts: tuple[tuple[str, int], ...] = ()) -> FaultModel:
    """The same model for the same unit: a bench session asks for it after every reading."""
    return build_fault_model(family, ratings, dict(prior_counts) or None)
