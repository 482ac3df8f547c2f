"""A supply family's board as the cold network: every part on the nodes its stage file places it,
with the value the unit's ratings give it and the spread of a good part; and each cold check as a
probing of that board.

A part's value can come from a board profile instead of the family (the board's own marking, and the
number of resistors in a chain): ``ColdNetlist.with_value`` on the board returned here.
"""

from __future__ import annotations

from functools import lru_cache

from fixbench.knowledge.model import Check, Family, Part
from fixbench.physics.capacitors import esr_new_max
from fixbench.physics.cold.board_part import BoardPart
from fixbench.physics.cold.netlist import ColdNetlist
from fixbench.physics.cold.part_models import CONTROLLER_VCC_OHM
from fixbench.physics.cold.probing import Probing
from fixbench.physics.part_values import rated_voltage, value_of
from fixbench.physics.ratings import Ratings

# How far a good part's value may sit from the family's figure, as factors (low, high).
VALUE_SPREAD: dict[str, tuple[float, float]] = {
    "resistor": (0.95, 1.05),  # 5 % parts [practice]
    "thermistor": (0.75, 1.25),  # NTC cold resistance at room temperature [practice]
    "electrolytic": (0.80, 1.20),  # +/-20 %, the usual marking (M) [practice]
    "film_capacitor": (0.90, 1.10),  # +/-10 % (K) [practice]
    "zener": (0.95, 1.05),  # +/-5 % Zener voltage [practice]
    # Primary winding of chargers and adapters: 0.2-10 ohm [practice], about the family's 0.8-2 ohm.
    "transformer": (0.1, 5.0),
    # A controller's supply pin to ground, unpowered: known only to within a few times [memory].
    "controller": (0.3, 3.0),
    "integrated_controller": (0.3, 3.0),
    # a choke's copper at room temperature, from its wire and turns [practice]
    "inductor": (0.5, 2.0),
}
# Kinds whose value in the knowledge files is not what the cold network needs (a fuse's current
# rating): the cold model uses its own figure for them.
VALUE_NOT_COLD = ("fuse", "lead")


def board_part(part: Part, ratings: Ratings, family: Family) -> BoardPart:
    """One part of the family as the cold network takes it."""
    value = None if part.kind in VALUE_NOT_COLD else value_of(part, ratings, family.design)
    if part.kind in ("controller", "integrated_controller"):
        value = CONTROLLER_VCC_OHM
    extra: tuple[tuple[str, float], ...] = ()
    if part.kind == "electrolytic":
        extra = (("esr_ohm", esr_new_max(value, rated_voltage(part, ratings, family.design))),)
    return BoardPart(part.id, part.kind, part.pins, value, count=part.count,
                     spread=VALUE_SPREAD.get(part.kind, (1.0, 1.0)), extra=extra)


@lru_cache(maxsize=64)
def family_board(family: Family, ratings: Ratings) -> ColdNetlist:
    """The family's board for a unit of these ratings, every part healthy."""
    return ColdNetlist(tuple(board_part(part, ratings, family) for part in family.parts))


def probing_of(check: Check) -> Probing:
    """How the check's probes go on the board."""
    if not check.probes:
        raise ValueError(f"check '{check.id}' has no probes: it is not a cold check of a part")
    return Probing(check.instrument, check.probes, check.combine, check.lift)
