"""The rectified mains on the bulk capacitor: its peak, its sag under load and its ripple.

Peak: Vpk = sqrt(2) * Vrms minus two bridge diode drops [src: textbook full-wave bridge; Power
Integrations AN-17 quotes 265 VAC -> 375 V DC].
Minimum under a constant-power load, energy balance over the discharge interval:
    Vmin^2 = Vpk^2 - 2 * Pin * (1/(2f) - tc) / C        [src: Power Integrations AN-17]
with tc the diode conduction time. AN-17 takes tc = 3 ms as a design figure; here tc follows from
the geometry of the recharge (the capacitor starts charging when the rising mains passes Vmin):
    tc = arccos(Vmin / Vpk) / (2 * pi * f)               [src: textbook capacitor-input filter]
and the two are solved together by a short fixed-point iteration.
Simple ripple bound: dV = I / (2 f C) for full-wave [src: textbook], which ignores conduction time
and so over-estimates.
"""

from __future__ import annotations

import math

SQRT2 = math.sqrt(2.0)
# 1N4007 forward drop at the bulk capacitor's peak charging current (a few hundred mA to ~1 A):
# 0.8-1.0 V; datasheets give VF max 1.0-1.1 V at 1 A [src: 1N4007 datasheets].
BRIDGE_DIODE_DROP = 0.9


def rectified_peak(v_rms: float, diode_drop: float = BRIDGE_DIODE_DROP) -> float:
    """No-load bulk voltage: the mains crest less two diode drops (one conducting pair)."""
    return SQRT2 * v_rms - 2.0 * diode_drop


def conduction_time(v_min: float, v_peak: float, mains_hz: float) -> float:
    """Time per half cycle in which the bridge conducts, from the rising sine crossing Vmin."""
    ratio = min(max(v_min / v_peak, -1.0), 1.0)
    return math.acos(ratio) / (2.0 * math.pi * mains_hz)


def bulk_minimum(v_peak: float, input_power: float, mains_hz: float, capacitance: float,
                 conduction_s: float | None = None) -> float:
    """Lowest bulk voltage under a constant input power (energy balance, AN-17).

    With ``conduction_s`` given, that conduction time is used as is (AN-17's worked example);
    otherwise it is solved for with :func:`conduction_time`. Returns 0 when the capacitor cannot
    hold the load over the half cycle (the rail collapses to the rectified sine)."""
    if input_power <= 0:
        return v_peak
    half_cycle = 1.0 / (2.0 * mains_hz)

    def from_tc(tc: float) -> float:
        square = v_peak**2 - 2.0 * input_power * max(half_cycle - tc, 0.0) / capacitance
        return math.sqrt(square) if square > 0 else 0.0

    if conduction_s is not None:
        return from_tc(conduction_s)
    v_min = from_tc(0.0)
    for _ in range(30):
        updated = from_tc(conduction_time(v_min, v_peak, mains_hz))
        if abs(updated - v_min) < 1e-6:
            break
        v_min = updated
    return v_min


def ripple_simple(load_current: float, mains_hz: float, capacitance: float) -> float:
    """Peak-to-peak ripple bound dV = I/(2 f C) for a full-wave rectifier (over-estimates)."""
    return load_current / (2.0 * mains_hz * capacitance)
