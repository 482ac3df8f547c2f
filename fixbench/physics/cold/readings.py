"""What the display shows with the probes on two nodes of a cold board.

Ohms: the meter autoranges up from its lowest range and settles on the first whose full scale holds
the reading V / I [practice: autoranging meters step up on over-range]; on a network with junctions
the reading depends on the range, because each range drives its own current. Diode test: the
display shows the probe voltage at the diode-test current, OL above its full scale.

Every reading carries the settled value (capacitors charged, open to DC) and the value at the touch
of the probes (capacitors discharged, each its ESR): a large electrolytic across the probes makes the
reading start low and creep up while it charges from the meter [practice]. Values are SI: ohm or
volt, ``math.inf`` for OL.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from fixbench.physics.cold.meter import HANDHELD, Meter, MeterSource
from fixbench.physics.cold.netlist import ColdNetlist
from fixbench.physics.cold.solve import OperatingPoint, is_linear, operating_point, reaches_capacitor

OL = math.inf
CREEP_SHARE = 0.2  # a reading that starts more than 20 % away from where it settles "creeps" [practice]


@dataclass(frozen=True)
class MeterReading:
    """One reading as the meter shows it."""

    instrument: str  # "ohmmeter" or "diode_test"
    value: float  # settled display value, SI (inf for OL)
    initial: float  # display value at the touch of the probes, capacitors discharged
    source: MeterSource  # the range the meter settled on
    point: OperatingPoint

    @property
    def creeps(self) -> bool:
        """Whether the display starts well away from where it settles."""
        if math.isinf(self.value) or math.isinf(self.initial):
            return self.value != self.initial
        return abs(self.initial - self.value) > CREEP_SHARE * max(abs(self.value), 1e-12)


def _raw_ohms(point: OperatingPoint) -> float:
    """V / I, whatever the range's full scale."""
    return point.volts / point.amps if point.amps > 0.0 else OL


def _ohms_of(point: OperatingPoint, source: MeterSource) -> float:
    value = _raw_ohms(point)
    return value if value <= source.full_scale else OL


def _volts_of(point: OperatingPoint, source: MeterSource) -> float:
    return point.volts if point.volts <= source.full_scale else OL


def _discharged_value(netlist: ColdNetlist, red: str, black: str, source: MeterSource, settled: float,
                      display) -> float:
    """The display at the touch of the probes; the settled value when no capacitor is in reach."""
    if not reaches_capacitor(netlist.elements, red, black):
        return settled
    return display(operating_point(netlist.elements, red, black, source, discharged=True), source)


def ohms(netlist: ColdNetlist, red: str, black: str, meter: Meter = HANDHELD,
         low_voltage: bool = False, touch: bool = True) -> MeterReading:
    """The autoranged ohms reading, red probe on ``red``: the lowest range that holds it.
    ``touch=False`` skips the reading at the touch of the probes (``initial`` is then the settled
    value)."""
    elements = netlist.elements
    ranges = meter.ranges(low_voltage)
    points: dict[int, OperatingPoint] = {}

    def reading(k: int) -> float:
        if k not in points:
            points[k] = operating_point(elements, red, black, ranges[k])
        return _ohms_of(points[k], ranges[k])

    # Start from the range the middle one points to, then step down while the range below still
    # holds the reading and up while it does not (a junction reads higher on a higher range).
    middle = len(ranges) // 2
    reading(middle)
    first = _raw_ohms(points[middle])
    k = next((i for i, r in enumerate(ranges) if first <= r.full_scale), len(ranges) - 1)
    linear = is_linear(elements, red, black)
    if linear:  # the same V / I on every range, up to the solver's rounding
        points[k] = points[middle] if k == middle else operating_point(elements, red, black, ranges[k])
        # A reading at a range's full scale (400 ohm on the 400 ohm range) can come out a rounding
        # above it on one range and below it on another: let that range's own solve decide.
        if k > 0 and first <= ranges[k - 1].full_scale * (1.0 + 1e-9) and not math.isinf(reading(k - 1)):
            k -= 1
        while math.isinf(reading(k)) and k < len(ranges) - 1:
            k += 1
    else:
        while math.isinf(reading(k)) and k < len(ranges) - 1:
            k += 1
        while k > 0 and not math.isinf(reading(k - 1)):
            k -= 1
    value = _ohms_of(points[k], ranges[k])
    initial = _discharged_value(netlist, red, black, ranges[k], value, _ohms_of) if touch else value
    return MeterReading("ohmmeter", value, initial, ranges[k], points[k])


def ohms_on_range(netlist: ColdNetlist, red: str, black: str, source: MeterSource) -> MeterReading:
    """The reading on one fixed range (OL above its full scale)."""
    point = operating_point(netlist.elements, red, black, source)
    value = _ohms_of(point, source)
    return MeterReading("ohmmeter", value, _discharged_value(netlist, red, black, source, value, _ohms_of),
                        source, point)


def diode_test(netlist: ColdNetlist, red: str, black: str, meter: Meter = HANDHELD,
               touch: bool = True) -> MeterReading:
    """The diode-test reading, red probe on ``red`` (on a healthy diode: red on the anode)."""
    source = meter.diode_test
    point = operating_point(netlist.elements, red, black, source)
    value = _volts_of(point, source)
    initial = _discharged_value(netlist, red, black, source, value, _volts_of) if touch else value
    return MeterReading("diode_test", value, initial, source, point)


def both_ways(netlist: ColdNetlist, a: str, b: str, instrument: str,
              meter: Meter = HANDHELD) -> tuple[MeterReading, MeterReading]:
    """The reading red on ``a`` then red on ``b``."""
    read = ohms if instrument == "ohmmeter" else diode_test
    if instrument not in ("ohmmeter", "diode_test"):
        raise ValueError(f"no DC cold reading with instrument '{instrument}'")
    return read(netlist, a, b, meter), read(netlist, b, a, meter)
