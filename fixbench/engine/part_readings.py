"""What a cold check reads on a part in a given state: the healthy reading, or the reading of the
same part open, shorted, drifted, dried or dead.

The healthy figure comes from physics.parts; a failed part's figure is what the trade sees on the
meter for that failure [practice, and the signature table of the project's trade primer].
"""

from __future__ import annotations

import math

from fixbench.knowledge.design import Design
from fixbench.knowledge.model import Part
from fixbench.physics.expectation import Expectation
from fixbench.physics.parts import cold_expectation
from fixbench.physics.ratings import Ratings

OPEN = math.inf
DRIED_CAPACITANCE = 0.25  # a dried electrolytic keeps about a quarter of its value [practice]
DRIED_ESR = 8.0  # times the new-part ESR: far above the suspect limit of 2x [practice]
DRIFT_FACTOR = 3.0  # a resistor that drifted reads several times its value [practice]
SHORT_OHM = 0.3
SHORT_DIODE_V = 0.02
SHORTED_CONTROLLER_OHM = 8.0


def _typical(expect: Expectation) -> float:
    if expect.nominal is not None:
        return expect.nominal
    if expect.low is not None and expect.high is None:
        return OPEN if expect.low >= 1e3 else expect.low * 2
    return expect.high / 2


def cold_reading(part: Part, mode: str, instrument: str, ratings: Ratings, design: Design) -> float:
    """Predicted cold reading of ``part`` in ``mode`` ("ok" for healthy), SI units (inf for OL)."""
    healthy = cold_expectation(part, instrument, ratings, design)
    typical = _typical(healthy)
    if mode == "ok":
        return typical
    kind = part.kind
    if instrument == "ohmmeter":
        if mode == "open":
            return OPEN
        if mode == "short":
            return SHORTED_CONTROLLER_OHM if kind == "controller" else SHORT_OHM
        if mode == "drift":
            return typical * DRIFT_FACTOR
        return typical  # a dead controller or other mode that the ohmmeter does not see
    if instrument == "diode_test":
        if mode == "open":
            return OPEN
        if mode == "short":
            return SHORT_DIODE_V
        return typical
    if instrument == "capacitance":
        if mode == "dried":
            return typical * DRIED_CAPACITANCE
        if mode == "short":
            return 0.0
        if mode == "open":
            return 0.0
        return typical
    if instrument == "esr":
        if mode == "dried":
            return healthy.nominal * DRIED_ESR
        if mode == "short":
            return 0.01
        return typical
    raise ValueError(f"no cold reading for {part.id} with {instrument}")
