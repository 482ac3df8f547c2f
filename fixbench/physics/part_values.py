"""A part's value and voltage rating in SI units, from its knowledge-file text: a marking ("22 uF")
or a sizing rule of the unit's ratings ("rule:bulk_capacitance")."""

from __future__ import annotations

from dataclasses import replace

from fixbench.knowledge.design import Design
from fixbench.knowledge.model import KIND_VALUE_UNITS, Family, Part
from fixbench.physics.ratings import Ratings
from fixbench.physics.sizing import part_value

VALUE_UNITS = KIND_VALUE_UNITS  # the unit each kind's value is written in
DEFAULT_RATED_V = 25.0  # a capacitor with no rating written: a low-voltage part [practice]


def value_of(part: Part, ratings: Ratings, design: Design) -> float | None:
    """The part's nominal value in SI units (capacitance, resistance, fuse current...)."""
    unit = VALUE_UNITS.get(part.kind)
    return part_value(part.value, unit, ratings, design) if unit else None


def rated_voltage(part: Part, ratings: Ratings, design: Design) -> float:
    return part_value(part.rated, "V", ratings, design) if part.rated else DEFAULT_RATED_V


def ratings_on_board(family: Family, ratings: Ratings) -> Ratings:
    """The ratings with the bulk capacitance the board's bulk capacitor is marked with (a board
    profile's marking wins over the label's figure): the live model reads the bulk rail from them."""
    for part in family.parts_with_role("bulk_capacitor"):
        if part.marked and part.value is not None:
            return replace(ratings, bulk_f=value_of(part, ratings, family.design))
    return ratings
