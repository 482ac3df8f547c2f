"""Electrolytic capacitors: what a new one's ESR may be, and the E-series values designers use.

Worst-case ESR of new general-purpose electrolytics at 20 C [src: glodark.com ESR chart, a widely
reproduced table]. Tables of different meters differ 2-4x, so a reading above about twice the table
value is suspect [practice]. A dried capacitor also loses capacitance [practice].
"""

from __future__ import annotations

import math

# (capacitance F, rated V) -> worst-case ESR of a new part, ohm [src: glodark.com ESR chart]
ESR_NEW_TABLE: dict[tuple[float, float], float] = {
    (10e-6, 16): 8.0, (22e-6, 16): 3.6, (47e-6, 16): 1.6, (100e-6, 16): 0.7, (220e-6, 16): 0.33,
    (470e-6, 10): 0.24, (1000e-6, 10): 0.12, (10e-6, 250): 2.5, (47e-6, 250): 0.8,
}
SUSPECT_FACTOR = 2.0  # [practice]
ELECTROLYTIC_TOLERANCE = 0.20  # +/-20 % is the usual marking (M) [practice]
E6 = (1.0, 1.5, 2.2, 3.3, 4.7, 6.8)
E12 = (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2)


def esr_new_max(capacitance: float, rated_v: float) -> float:
    """Worst-case ESR of a new capacitor, interpolated log-log in capacitance within its voltage
    class (low voltage up to 63 V, high voltage 160 V and up) from the ESR table."""
    high_voltage = rated_v >= 160
    rows = sorted((c, esr) for (c, v), esr in ESR_NEW_TABLE.items() if (v >= 160) == high_voltage)
    if capacitance <= rows[0][0]:
        (c0, e0), (c1, e1) = rows[0], rows[1]
    elif capacitance >= rows[-1][0]:
        (c0, e0), (c1, e1) = rows[-2], rows[-1]
    else:
        index = next(i for i, (c, _) in enumerate(rows) if c >= capacitance)
        (c0, e0), (c1, e1) = rows[index - 1], rows[index]
    slope = math.log(e1 / e0) / math.log(c1 / c0)
    return e0 * math.exp(slope * math.log(capacitance / c0))


def esr_suspect_above(capacitance: float, rated_v: float) -> float:
    """ESR above which a capacitor is suspect: twice the new-part table value [practice]."""
    return SUSPECT_FACTOR * esr_new_max(capacitance, rated_v)


def nearest_preferred(value: float, series: tuple[float, ...] = E6) -> float:
    """Round a value to the nearest preferred number (log distance), e.g. 31e-6 -> 33e-6."""
    decade = 10.0 ** math.floor(math.log10(value))
    candidates = [m * decade for m in series] + [10.0 * decade]
    return min(candidates, key=lambda c: abs(math.log(c / value)))


def stored_energy(capacitance: float, voltage: float) -> float:
    """E = C V^2 / 2, e.g. 47 uF at 375 V holds 3.3 J."""
    return 0.5 * capacitance * voltage**2
