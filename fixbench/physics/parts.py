"""What a cold check reads on a part of a family's board (unplugged, discharged), healthy or with
some parts failed: the meter on the assembled board, every parallel path included.

Both come from the cold network (physics/cold): the family's parts on their nodes, the check's
probes, the meter model. The healthy band adds the spread of good parts and the meter's error.
"""

from __future__ import annotations

import math
from functools import lru_cache

from fixbench.knowledge.model import Check, Family
from fixbench.physics.cold.bands import healthy_band
from fixbench.physics.cold.family_board import family_board, probing_of
from fixbench.physics.cold.probing import parts_in_reach, reading_in_reach
from fixbench.physics.expectation import Expectation
from fixbench.physics.ratings import Ratings


def cold_expectation(family: Family, check: Check, ratings: Ratings) -> Expectation:
    """What a good board reads on ``check``: nominal and band (no nominal where it reads OL)."""
    board = family_board(family, ratings)
    band = healthy_band(board, probing_of(check))
    nominal = None if math.isinf(band.nominal) else band.nominal
    return Expectation(nominal, band.low, band.high, check.unit)


def cold_value(family: Family, check: Check, ratings: Ratings, modes: dict[str, str]) -> float:
    """What ``check`` reads on a board with ``modes`` (part id -> failure mode), SI (inf for OL)."""
    board = family_board(family, ratings)
    probing = probing_of(check)
    reach = _reach(family, ratings, check)
    faulty = {part: mode for part, mode in modes.items() if part in reach and mode != "ok"}
    return reading_in_reach(board.with_modes(faulty) if faulty else board, probing, reach)


@lru_cache(maxsize=4096)
def _reach(family: Family, ratings: Ratings, check: Check) -> frozenset[str]:
    return parts_in_reach(family_board(family, ratings), probing_of(check))
