"""How part values scale with a unit's ratings: the sizing rules a family file names as "rule:NAME".

These are designers' rules of thumb, used to tell a technician what value to expect on a part whose
marking is unreadable, and to size the model's healthy readings. Each rule names its basis.
"""

from __future__ import annotations

import math
from typing import Callable

from fixbench.knowledge.design import Design
from fixbench.physics.capacitors import E12, nearest_preferred
from fixbench.physics.ratings import Ratings, RatingsOutOfReach
from fixbench.physics.semiconductors import TL431_VREF

TL431_VREF_V = TL431_VREF["plain"].typical

# Efficiency assumed when turning output watts into input watts [practice: small chargers 75-80 %,
# laptop adapters 85-90 %].
def efficiency(ratings: Ratings) -> float:
    return 0.78 if ratings.output_w <= 20 else 0.87


def input_power(ratings: Ratings) -> float:
    return ratings.output_w / efficiency(ratings)


FUSE_SERIES = (0.5, 0.63, 0.8, 1.0, 1.25, 1.6, 2.0, 2.5, 3.15, 4.0, 5.0)  # IEC 60127 preferred ratings


def fuse_rating(ratings: Ratings, design: Design) -> float:
    """Input rms current at low line with a capacitor-input power factor of about 0.55, times 2.5 for
    inrush, rounded up to a preferred fuse rating [practice]."""
    current = input_power(ratings) / (ratings.design_low * 0.55)
    wanted = 2.5 * current
    return next((f for f in FUSE_SERIES if f >= wanted), FUSE_SERIES[-1])


def inrush_resistance(ratings: Ratings, design: Design) -> float:
    """Cold resistance of the inrush thermistor: about 10 ohm in small chargers, 5 ohm above 30 W
    [practice]."""
    return 10.0 if ratings.output_w <= 30 else 5.0


def bulk_capacitance(ratings: Ratings, design: Design) -> float:
    """The label value if known; otherwise 2 uF per input watt for universal or 100-120 V input and
    1 uF per watt for 230 V only [practice: 2-3 uF/W universal, about 1 uF/W 230 V only], to E6."""
    if ratings.bulk_f is not None:
        return ratings.bulk_f
    per_watt = 1e-6 if (not ratings.universal and ratings.design_low > 150) else 2e-6
    return max(4.7e-6, nearest_preferred(per_watt * input_power(ratings)))


def start_resistance(ratings: Ratings, design: Design) -> float:
    """Start-up resistor that gives about 0.3 mA at the lowest rectified mains, enough for a
    controller's start-up current [practice; UC384x start-up current 0.5-1 mA max from memory]."""
    start_v = design.start_v if design.start_v is not None else 0.0
    v_low = math.sqrt(2.0) * ratings.design_low
    return nearest_preferred((v_low - start_v) / 0.3e-3, E12)


def sense_resistance(ratings: Ratings, design: Design) -> float:
    """Current-sense resistor for a 1 V current-limit threshold [src: UC3842 datasheet, current sense
    threshold 1 V] at a peak primary current of 2 * Pin / (Vbulk_min * Dmax), Dmax 0.45 [textbook
    discontinuous flyback], with 30 % margin."""
    v_bulk_min = math.sqrt(2.0) * ratings.design_low * 0.8
    i_peak = 2.0 * input_power(ratings) / (v_bulk_min * 0.45) * 1.3
    return nearest_preferred(1.0 / i_peak, E12)


def primary_winding_resistance(ratings: Ratings, design: Design) -> float:
    """DC resistance of a charger's primary winding: about 1-3 ohm, lower in bigger units [practice]."""
    return 2.0 if ratings.output_w <= 30 else 0.8


def output_capacitance(ratings: Ratings, design: Design) -> float:
    """About 300 uF per output amp, at least 220 uF, to E6 [practice]."""
    return max(220e-6, nearest_preferred(300e-6 * ratings.output_a))


def output_cap_voltage(ratings: Ratings, design: Design) -> float:
    """The smallest common rating with 25 % headroom over the output [practice]."""
    return next(v for v in (6.3, 10, 16, 25, 35, 50, 63, 100) if v >= 1.25 * ratings.output_v)


def divider_upper(ratings: Ratings, design: Design) -> float:
    """Upper divider resistor for a TL431 with a 10 kohm lower resistor: R1 = R2 (Vo/Vref - 1)
    [src: TI SLVS543, Vout = Vref (1 + R1/R2)]. No divider sets an output at or below Vref."""
    if ratings.output_v <= TL431_VREF_V:
        raise RatingsOutOfReach(f"rating 'output': {ratings.output_v:g} V is not above the {TL431_VREF_V} V "
                                "reference of the TL431 that regulates this family's output, so no "
                                "divider can set it")
    return round(10e3 * (ratings.output_v / TL431_VREF_V - 1.0), -1)


def base_bias_resistance(ratings: Ratings, design: Design) -> float:
    """Base bias resistor of a self-oscillating switch from the bulk rail: a few megohm [practice]."""
    return 2.2e6 if ratings.design_low > 150 else 1.0e6


def zener_voltage(ratings: Ratings, design: Design) -> float:
    """Zener that sets the output with an opto LED in series: Vo - 1.1 V (LED) [practice]."""
    return round(ratings.output_v - 1.1, 1)


RULES: dict[str, Callable[[Ratings, Design], float]] = {
    "fuse_rating": fuse_rating,
    "inrush_resistance": inrush_resistance,
    "bulk_capacitance": bulk_capacitance,
    "start_resistance": start_resistance,
    "sense_resistance": sense_resistance,
    "primary_winding_resistance": primary_winding_resistance,
    "output_capacitance": output_capacitance,
    "output_cap_voltage": output_cap_voltage,
    "divider_upper": divider_upper,
    "base_bias_resistance": base_bias_resistance,
    "zener_voltage": zener_voltage,
}


def part_value(text: str | None, unit: str, ratings: Ratings, design: Design) -> float | None:
    """A part's value in SI units from its file text: a fixed "22 uF" or a "rule:NAME"."""
    if text is None:
        return None
    if text.startswith("rule:"):
        rule = text.removeprefix("rule:")
        value = RULES[rule](ratings, design)
        if not (math.isfinite(value) and value > 0):
            # A rule outside the ratings it holds for (a zener below 0 V for a 1 V output).
            raise RatingsOutOfReach(f"ratings: this family's circuit cannot be built for them (its "
                                    f"{rule.replace('_', ' ')} rule gives {value:g} {unit})")
        return value
    from fixbench.quantities import parse_quantity

    return parse_quantity(text, unit).value
