"""How a reading creeps: the display from the touch of the probes until capacitors in reach have
charged from the meter's test source.

A transient of the measured block with every capacitor discharged at the start, stepped by the
backward Euler rule on a logarithmic time grid; each capacitor with its ESR is, over one step, a
conductance 1 / (ESR + dt / C) in series with its voltage at the previous step [src: the
backward-Euler companion model of a capacitor, as in SPICE's transient analysis, Nagel 1975].
The junctions are solved by the same Newton iterations as the settled reading.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from fixbench.physics.cold.meter import MeterSource
from fixbench.physics.cold.elements import Capacitor
from fixbench.physics.cold.netlist import ColdNetlist
from fixbench.physics.cold.solve import _prepare, measured_block, newton

STEPS_PER_DECADE = 20
FIRST_STEP_S = 1e-4
LAST_TIME_S = 1e4
SETTLED_SHARE = 0.05  # the display is taken as settled within 5 % of its final value [practice]


@dataclass(frozen=True)
class Creep:
    """The display over time after the probes touch, and when it settles."""

    times: tuple[float, ...]  # s
    volts: tuple[float, ...]  # probe voltage at each time
    amps: tuple[float, ...]  # meter current at each time
    settle_s: float  # first time after which the display stays within SETTLED_SHARE of its end


def _display(volts: float, amps: float, instrument: str, source: MeterSource) -> float:
    if instrument == "diode_test":
        return volts if volts <= source.full_scale else math.inf
    if amps <= 0.0:
        return math.inf
    value = volts / amps
    return value if value <= source.full_scale else math.inf


def _settled_at(displays: list[float], times: list[float]) -> float:
    final = displays[-1]
    for k in range(len(displays)):
        rest = displays[k:]
        if math.isinf(final):
            if all(math.isinf(d) for d in rest):
                return times[k]
        elif all(not math.isinf(d) and abs(d - final) <= SETTLED_SHARE * abs(final) for d in rest):
            return times[k]
    return times[-1]


def creep(netlist: ColdNetlist, red: str, black: str, source: MeterSource,
          instrument: str = "ohmmeter") -> Creep:
    """The transient of the reading from the touch of the probes, on one range."""
    elements = netlist.elements
    capacitors = {e.name: e for e in elements if isinstance(e, Capacitor)}
    reached = measured_block(elements, red, black, True)
    block = tuple(capacitors.get(e.name, e) for e in reached)
    in_block = [e for e in block if isinstance(e, Capacitor)]
    times = [0.0] + [FIRST_STEP_S * 10 ** (k / STEPS_PER_DECADE)
                     for k in range(int(STEPS_PER_DECADE * math.log10(LAST_TIME_S / FIRST_STEP_S)) + 1)]
    if red == black or not block:
        v = 0.0 if red == black else source.open_circuit_v
        amps = (source.open_circuit_v - v) / source.source_ohm
        return Creep(tuple(times), (v,) * len(times), (amps,) * len(times), 0.0)
    p = _prepare(block, red, black)
    size = len(p.nodes)
    index = {n: i for i, n in enumerate(p.nodes)}
    g_source = 1.0 / source.source_ohm
    base = p.linear.copy()
    base[p.red_at * size + p.red_at] += g_source
    rhs_source = np.zeros(size)
    rhs_source[p.red_at] = source.open_circuit_v * g_source
    plus = [index.get(c.plus, -1) for c in in_block]
    minus = [index.get(c.minus, -1) for c in in_block]
    charge_v = np.zeros(len(in_block))  # each capacitor's own voltage (behind its ESR)
    volts = np.zeros(size)
    trace_v, trace_a = [], []
    previous_t = 0.0
    for t in times:
        dt = t - previous_t
        linear = base.copy()
        rhs = rhs_source.copy()
        for k, c in enumerate(in_block):
            # At t = 0 the capacitor is its ESR alone (no charge yet, dt = 0).
            g = 1.0 / (max(c.esr_ohm, 1e-3) + dt / c.farad)
            a, b = plus[k], minus[k]
            for r, col, sign in ((a, a, 1.0), (b, b, 1.0), (a, b, -1.0), (b, a, -1.0)):
                if r >= 0 and col >= 0:
                    linear[r * size + col] += sign * g
            if a >= 0:
                rhs[a] += g * charge_v[k]
            if b >= 0:
                rhs[b] -= g * charge_v[k]
        volts = newton(p, linear, rhs, volts, f"{red}-{black} at {t:g} s")
        full = np.append(volts, 0.0)
        for k, c in enumerate(in_block):
            g = 1.0 / (max(c.esr_ohm, 1e-3) + dt / c.farad)
            branch = g * (full[plus[k]] - full[minus[k]] - charge_v[k])
            charge_v[k] += branch * dt / c.farad
        v_red = float(volts[p.red_at])
        trace_v.append(v_red)
        trace_a.append((source.open_circuit_v - v_red) * g_source)
        previous_t = t
    displays = [_display(v, a, instrument, source) for v, a in zip(trace_v, trace_a)]
    return Creep(tuple(times), tuple(trace_v), tuple(trace_a), _settled_at(displays, times))
