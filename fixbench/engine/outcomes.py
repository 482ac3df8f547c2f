"""The outcome classes of a check, and how a reading or a prediction falls into them.

A numeric check's range is cut into classes around the healthy band (zero, low, in band, high,
over range); an outcome check has the outcomes its file lists. Inference works on these classes:
what matters for telling faults apart is whether a reading is in band, low, high, near zero or
open, and the band comes from the physics of the unit's ratings.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from fixbench.physics.expectation import Expectation

# Share of the nominal (or of the band's lower edge) under which a voltage counts as "zero".
ZERO_FRACTION = 0.1
# Resistance: a reading under this share of the band's low edge is a short; above OPEN_FACTOR times
# the high edge (or over range) is open [practice].
SHORT_FRACTION = 0.1
OPEN_FACTOR = 10.0
SHORT_OHM_FLOOR = 2.0  # ohm: under this a fuse-class band has no separate short class
DIODE_SHORT = 0.10  # V on diode test [practice]
DIODE_HIGH_LIMIT = 2.5  # V: above this a diode-test reading is effectively open


@dataclass(frozen=True)
class OutcomeClasses:
    """Named classes; numeric ones carry the edges that separate them (ascending)."""

    names: tuple[str, ...]
    edges: tuple[float, ...] = ()  # len(names) - 1 boundaries for numeric checks
    healthy: str = "ok"

    @property
    def numeric(self) -> bool:
        return bool(self.edges) or self.names == ("ok",)

    def classify(self, value: float) -> str:
        """The class a value falls in (edges belong to the class above)."""
        for name, edge in zip(self.names, self.edges):
            if value < edge:
                return name
        return self.names[-1]

    def representative(self, name: str, healthy: Expectation) -> float:
        """A value in the middle of class ``name``, for simulated wrong readings."""
        i = self.names.index(name)
        lo = self.edges[i - 1] if i > 0 else None
        hi = self.edges[i] if i < len(self.edges) else None
        if name == "ok" and healthy.nominal is not None:
            return healthy.nominal
        if lo is None:
            return (hi or 1.0) / 2 if (hi or 0) > 0 else 0.0
        if hi is None:
            return math.inf if name == "open" else lo * 1.5 if lo > 0 else 1.0
        return (lo + hi) / 2


def numeric_classes(instrument: str, healthy: Expectation) -> OutcomeClasses:
    """Classes for a numeric check around the healthy band."""
    low, high, nominal = healthy.low, healthy.high, healthy.nominal
    if instrument == "diode_test":
        return OutcomeClasses(("short", "low", "ok", "high", "open"),
                              (DIODE_SHORT, low, high * 1.0001, DIODE_HIGH_LIMIT))
    if instrument in ("ohmmeter", "esr"):
        names, edges = [], []
        if low is not None and low * SHORT_FRACTION > 0 and (low >= SHORT_OHM_FLOOR or instrument == "esr"):
            names += ["short", "low"]
            edges += [low * SHORT_FRACTION, low]
        elif low is not None and low > 0:
            names += ["low"]
            edges += [low]
        names.append("ok")
        if high is not None:
            edges.append(high * 1.0001)
            if instrument == "ohmmeter":
                names += ["high", "open"]
                edges.append(high * OPEN_FACTOR)
            else:
                names.append("high")
        return OutcomeClasses(tuple(names), tuple(edges))
    if instrument == "capacitance":
        return OutcomeClasses(("zero", "low", "ok", "high"), (low * ZERO_FRACTION, low, high * 1.0001))
    # Volts, ripple, frequency: zero / low / ok / high, with only the edges the band has.
    if high is not None and high < 0 and low is not None:
        # A band below zero (the base of a self-oscillating switch): above it, tell a base held near
        # zero from one held at a forward junction drop.
        return OutcomeClasses(("low", "ok", "near_zero", "forward"), (low, high * 0.9999, 0.45))
    if low is None:
        return OutcomeClasses(("ok", "high"), (high * 1.0001,))
    if low <= 0:
        return OutcomeClasses(("ok", "high"), (high * 1.0001,)) if high is not None else OutcomeClasses(("ok",))
    zero = ZERO_FRACTION * (nominal if nominal else low)
    names, edges = ["zero", "low", "ok"], [min(zero, low * 0.999), low]
    if high is not None:
        names.append("high")
        edges.append(high * 1.0001)
    return OutcomeClasses(tuple(names), tuple(edges))


def outcome_classes(outcomes: tuple[str, ...], healthy: str) -> OutcomeClasses:
    return OutcomeClasses(tuple(outcomes), (), healthy)
