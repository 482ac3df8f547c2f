"""The meter as the cold network sees it: on each range, a test source of stated open-circuit
voltage behind a source resistance, and a display that shows OL above its full scale.

A handheld meter's ohms ranges drive less than 1 mA, falling about tenfold per range, with an
open-circuit voltage from a few hundred millivolts to about 3 V depending on the range and the
model; its diode test drives about 0.5-1.5 mA from an open-circuit voltage of about 2-3.5 V; some
meters have a low-voltage ohms range that keeps silicon junctions off for in-circuit work
[memory: handheld meter manuals' specification tables; the trade primer, section 7].

Model: each range is a Thevenin source (open-circuit volts Voc, source resistance Rs = Voc / Isc);
a ratiometric meter shows the probe voltage over the current it drives, so on a nonlinear network
the ohms reading is V / I at the operating point, and the diode test shows V [textbook ratiometric
ohms measurement]. Real meters drive a regulated current up to their compliance voltage; the
Thevenin source matches it at the two ends (open probes, shorted probes) and is what ngspice checks.
The figures below are the model assumed throughout; a different meter is another ``Meter``.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class MeterSource:
    """One range's test source and display limit."""

    label: str
    open_circuit_v: float
    short_circuit_a: float
    full_scale: float  # ohm on ohms ranges, V on the diode test; above it the display shows OL

    @property
    def source_ohm(self) -> float:
        return self.open_circuit_v / self.short_circuit_a

    def full_scale_volts(self) -> float:
        """Probe voltage when a resistor of full-scale value is measured (ohms ranges)."""
        return self.open_circuit_v * self.full_scale / (self.full_scale + self.source_ohm)


@dataclass(frozen=True)
class Meter:
    """A handheld meter: autoranging ohms, an optional low-voltage ohms mode, and a diode test.

    ``ohms_accuracy`` and ``diode_accuracy`` are (relative, absolute) reading errors, used to widen
    healthy bands by what the meter itself adds."""

    name: str
    ohms_ranges: tuple[MeterSource, ...]  # ascending full scale
    low_voltage_ohms: tuple[MeterSource, ...]  # empty where the meter has none
    diode_test: MeterSource
    ohms_accuracy: tuple[float, float]
    diode_accuracy: tuple[float, float]

    def __post_init__(self) -> None:
        for ranges in (self.ohms_ranges, self.low_voltage_ohms):
            scales = [r.full_scale for r in ranges]
            if scales != sorted(scales):
                raise ValueError(f"{self.name}: ohms ranges must ascend in full scale")

    def ranges(self, low_voltage: bool = False) -> tuple[MeterSource, ...]:
        if low_voltage and not self.low_voltage_ohms:
            raise ValueError(f"{self.name} has no low-voltage ohms range")
        return self.low_voltage_ohms if low_voltage else self.ohms_ranges


def _decade_ranges(prefix: str, open_circuit_v: float, lowest_scale: float, lowest_current: float,
                   count: int) -> tuple[MeterSource, ...]:
    """Ranges a decade apart, each driving a tenth of the current of the one below."""
    return tuple(MeterSource(f"{prefix} {lowest_scale * 10**k:g} ohm", open_circuit_v,
                             lowest_current / 10**k, lowest_scale * 10**k) for k in range(count))


# The meter assumed by default: a 4000-count autoranging handheld [memory: handheld meter manuals].
# Ohms: about 3 V open circuit, 1 mA into a short on the 400 ohm range and a tenth of that per range
# above; a resistor at full scale sees about 0.35 V, but any part of the board that is high impedance
# sees up to 3 V, enough to bring silicon junctions into conduction.
# Low-voltage ohms: 0.2 V open circuit [memory: low-power ohms ranges keep the probes at 0.1-0.2 V],
# so a resistor at full scale sees about 0.11 V and a silicon junction (0.22-0.37 V at a microamp,
# see junctions.py) takes only a few per cent of the test current up to the 40 kohm range; Schottky
# junctions still conduct, and on the megohm ranges so does every junction a little.
# Diode test: 3 V open circuit driving 1 mA into a 0.6 V junction; OL above 2 V.
HANDHELD = Meter(
    name="4000-count handheld meter",
    ohms_ranges=_decade_ranges("ohms", 3.0, 400.0, 1e-3, 6),
    low_voltage_ohms=_decade_ranges("low-voltage ohms", 0.2, 400.0, 1e-3, 5),
    diode_test=MeterSource("diode test", 3.0, 3.0 / ((3.0 - 0.6) / 1e-3), 2.0),
    ohms_accuracy=(0.01, 0.2),  # 1 % of reading plus a lead resistance of 0.2 ohm [memory]
    diode_accuracy=(0.01, 0.002),  # 1 % plus 2 mV [memory]
)
