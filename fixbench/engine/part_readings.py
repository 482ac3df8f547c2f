"""What a cold check reads on a unit whose parts are in given states: the same network solve for
the healthy unit and every fault, so no failure needs a reading of its own written down.

A dried capacitor's loss is a change to the netlist (physics/cold/part_models.py), re-exported here
for the operating model, which uses the same figure for live readings.
"""

from __future__ import annotations

from fixbench.knowledge.model import Check, Family
from fixbench.physics.cold.part_models import DRIED_CAPACITANCE
from fixbench.physics.parts import cold_value
from fixbench.physics.ratings import Ratings

__all__ = ["DRIED_CAPACITANCE", "cold_reading"]


def cold_reading(family: Family, ratings: Ratings, check: Check, modes: dict[str, str]) -> float:
    """Predicted reading of the cold part check ``check`` on a unit with ``modes`` (part id -> mode;
    absent parts are healthy), SI units (inf for OL)."""
    return cold_value(family, check, ratings, modes)
