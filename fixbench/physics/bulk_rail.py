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
from dataclasses import dataclass
from functools import lru_cache

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


@dataclass(frozen=True)
class LoadedRail:
    """Bulk voltage over a mains cycle once settled: crest, valley and their difference."""

    v_max: float
    v_min: float

    @property
    def ripple(self) -> float:
        return self.v_max - self.v_min


@lru_cache(maxsize=256)  # pure, and asked for the same few rails by every hypothesis of a unit
def loaded_rail(v_rms: float, mains_hz: float, capacitance: float, input_power: float,
                source_ohm: float, diode_drop: float = BRIDGE_DIODE_DROP, cycles: int = 12,
                steps_per_half_cycle: int = 400) -> LoadedRail:
    """The bulk rail behind a source resistance (inrush thermistor, fusible resistor, wiring),
    which the closed form above leaves out: it lowers the crest by the charging current's drop
    and stretches the conduction time.

    The circuit equation C dV/dt = (Vs(t) - 2 VF - V)/R - P/V (the first term only while the
    bridge conducts) is stepped with the backward-Euler rule, stable at any step for the
    charging term [src: textbook numerical integration of a stiff RC equation]; the load is held
    constant-power. Returns the crest and valley over the last cycle."""
    if source_ohm <= 0:
        raise ValueError("source_ohm must be positive; use rectified_peak/bulk_minimum for an ideal source")
    crest = SQRT2 * v_rms
    dt = 1.0 / (2.0 * mains_hz * steps_per_half_cycle)
    v = crest - 2.0 * diode_drop
    floor = 0.5 * crest  # a switch-mode load is off until its start threshold
    low, high = math.inf, 0.0
    total = 2 * cycles * steps_per_half_cycle
    last_cycle_from = total - 2 * steps_per_half_cycle
    for n in range(total):
        source = abs(crest * math.sin(2.0 * math.pi * mains_hz * (n + 1) * dt)) - 2.0 * diode_drop
        load = input_power / max(v, floor)
        if source > v:
            # backward Euler on the linear charging term, load taken at the previous step
            v = (v + dt / capacitance * (source / source_ohm - load)) / (1.0 + dt / (source_ohm * capacitance))
        else:
            v = v - dt * load / capacitance
        if n >= last_cycle_from:
            low, high = min(low, v), max(high, v)
    return LoadedRail(high, low)


def rail_at_load(v_rms: float, mains_hz: float, capacitance: float, input_power: float,
                 source_ohm: float | None) -> LoadedRail:
    """Crest and valley of the bulk rail at rated load: behind the family's source resistance when
    it has one (stepped model), else the closed energy-balance form."""
    if source_ohm:
        return loaded_rail(v_rms, mains_hz, capacitance, input_power, source_ohm)
    peak = rectified_peak(v_rms)
    return LoadedRail(peak, bulk_minimum(peak, input_power, mains_hz, capacitance))
