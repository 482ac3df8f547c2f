"""Output windows: the voltage a healthy output holds, and the ripple it may show.

USB 2.0 VBUS at the port: 4.75-5.25 V [src: USB 2.0 specification, table 7-7]. USB PD fixed
voltages 5/9/15/20 V, held to +/-5 % [src: USB PD specification; the tolerance from memory].
Other adapters: +/-5 % is the usual specification [practice].
Ripple: USB sets no limit; 100-200 mV p-p is what chargers are commonly held to [practice]; a
12 V / 48 W reference design specifies <= 100 mV p-p [src: TI UCC28C4x reference design].
"""

from __future__ import annotations

USB2_VBUS = (4.75, 5.25)  # USB 2.0 table 7-7
OUTPUT_TOLERANCE = 0.05
RIPPLE_FLOOR = 0.15  # V p-p, a 5 V charger's limit [practice: 100-200 mV]
RIPPLE_FRACTION = 0.01  # 1 % of Vo for higher outputs [practice]


def output_window(v_out: float) -> tuple[float, float]:
    """The band a healthy output holds at its rated load."""
    if abs(v_out - 5.0) < 1e-9:
        return USB2_VBUS
    return v_out * (1 - OUTPUT_TOLERANCE), v_out * (1 + OUTPUT_TOLERANCE)


def ripple_limit(v_out: float) -> float:
    """Largest healthy output ripple, V p-p."""
    return max(RIPPLE_FLOOR, RIPPLE_FRACTION * v_out)
