"""The capacitance and ESR ranges on a cold board: small-signal readings of the same netlist.

Both instruments drive a small AC signal, far below any junction's knee, so the network is linear:
every capacitor is its capacitance in series with its ESR, a winding its resistance in series with
its inductance, a junction its zero-bias conductance Is / (n Vt) [textbook small-signal diode], a
resistor itself. The coupling between windings is left out: it matters only through a junction
that the small signal keeps off.

- ESR meter: the real part of the impedance between the probes at 100 kHz [memory: ESR meters test
  at about 100 kHz with a few hundred millivolts at most, so junctions stay off in circuit].
- Capacitance range: the series capacitance of the impedance, -1 / (omega Im Z), at 100 Hz [memory:
  handheld capacitance ranges time a charge and discharge; taken here as a sine at about that rate],
  so a capacitor reads its own value whatever its ESR, and a high resistance across it barely moves
  the reading. Where the resistive part of the impedance is larger than the capacitive one
  (dissipation factor above 1: a short or a winding across the capacitor), the meter's charge never
  ramps and it shows nothing: read as 0 [practice: a capacitor shunted by a low resistance reads
  zero or will not read].
"""

from __future__ import annotations

import math

import numpy as np

from fixbench.physics.cold.elements import Capacitor, Element, Junction, Resistor, Winding
from fixbench.physics.cold.netlist import ColdNetlist
from fixbench.physics.cold.solve import GMIN, measured_block

ESR_METER_HZ = 100e3
CAPACITANCE_METER_HZ = 100.0
ESR_FLOOR_OHM = 1e-3
CAPACITANCE_RESOLUTION_F = 10e-12  # below this a handheld capacitance range shows 0 [memory]


def impedance(netlist: ColdNetlist, red: str, black: str, hz: float) -> complex:
    """Small-signal impedance between the probes at ``hz`` (``math.inf`` with nothing between)."""
    elements = netlist.elements
    originals = {e.name: e for e in elements}
    block = [originals.get(e.name, e) for e in measured_block(elements, red, black, True)]
    if red == black:
        return 0j
    if not block:
        return complex(math.inf, 0.0)
    nodes = sorted({n for e in block for n in e.nodes} - {black})
    index = {n: i for i, n in enumerate(nodes)}
    matrix = np.zeros((len(nodes), len(nodes)), dtype=complex)
    omega = 2.0 * math.pi * hz
    for e in block:
        y = _admittance(e, omega)
        i, j = index.get(e.nodes[0], -1), index.get(e.nodes[1], -1)
        for r, c, sign in ((i, i, 1.0), (j, j, 1.0), (i, j, -1.0), (j, i, -1.0)):
            if r >= 0 and c >= 0:
                matrix[r, c] += sign * y
    injection = np.zeros(len(nodes), dtype=complex)
    injection[index[red]] = 1.0
    return complex(np.linalg.solve(matrix, injection)[index[red]])


def _admittance(e: Element, omega: float) -> complex:
    if isinstance(e, Resistor):
        return 1.0 / e.ohm
    if isinstance(e, Winding):
        return 1.0 / complex(e.ohm, omega * e.henry)
    if isinstance(e, Capacitor):
        return 1.0 / complex(max(e.esr_ohm, ESR_FLOOR_OHM), -1.0 / (omega * e.farad))
    if isinstance(e, Junction):
        return e.kind.saturation / e.kind.slope_v * math.exp(-e.offset_v / e.kind.slope_v) + GMIN
    raise TypeError(f"no small-signal model for {e!r}")  # pragma: no cover


def esr_reading(netlist: ColdNetlist, red: str, black: str) -> float:
    """What an ESR meter shows across the probes, ohm."""
    z = impedance(netlist, red, black, ESR_METER_HZ)
    return math.inf if math.isinf(z.real) else z.real


def capacitance_reading(netlist: ColdNetlist, red: str, black: str) -> float:
    """What the capacitance range shows across the probes, farad (0 when nothing capacitive)."""
    z = impedance(netlist, red, black, CAPACITANCE_METER_HZ)
    if math.isinf(z.real) or z == 0:
        return 0.0
    if z.imag >= 0.0 or z.real > -z.imag:
        return 0.0
    farad = -1.0 / (2.0 * math.pi * CAPACITANCE_METER_HZ * z.imag)
    return farad if farad >= CAPACITANCE_RESOLUTION_F else 0.0
