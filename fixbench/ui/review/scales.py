"""Where a chart's value axis ends: from zero to a round value a little above the largest one, so
a small rate is drawn on a scale that shows it and the top keeps room for the legend."""

from __future__ import annotations

import math

HEADROOM = 1.45  # the axis ends at least this far above the largest value


def nice_top(largest: float) -> float:
    """A round axis end above ``largest``: 1, 2, 2.5 or 5 times a power of ten."""
    if largest <= 0:
        return 1.0
    target = largest * HEADROOM
    power = 10 ** math.floor(math.log10(target))
    return next(step * power for step in (1, 2, 2.5, 5, 10) if step * power >= target)
