"""A part's value and voltage rating in SI units, from its knowledge-file text: a marking ("22 uF")
or a sizing rule of the unit's ratings ("rule:bulk_capacitance")."""

from __future__ import annotations

from fixbench.knowledge.design import Design
from fixbench.knowledge.model import Part
from fixbench.physics.ratings import Ratings
from fixbench.physics.sizing import part_value

# The unit each kind's value is written in (a fuse's value is its current rating).
VALUE_UNITS = {"fuse": "A", "thermistor": "ohm", "electrolytic": "F", "film_capacitor": "F",
               "resistor": "ohm", "transformer": "ohm", "zener": "V"}
DEFAULT_RATED_V = 25.0  # a capacitor with no rating written: a low-voltage part [practice]


def value_of(part: Part, ratings: Ratings, design: Design) -> float | None:
    """The part's nominal value in SI units (capacitance, resistance, fuse current...)."""
    unit = VALUE_UNITS.get(part.kind)
    return part_value(part.value, unit, ratings, design) if unit else None


def rated_voltage(part: Part, ratings: Ratings, design: Design) -> float:
    return part_value(part.rated, "V", ratings, design) if part.rated else DEFAULT_RATED_V
