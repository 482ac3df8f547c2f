"""Junctions as a meter's test current sees them: the Shockley diode law with the figures of the
semiconductors found in chargers and adapters.

I = Is * (exp((V - offset) / (n * Vt)) - 1)  [src: Shockley diode equation; the same law as the
SPICE diode model with RS = 0, so ngspice checks the solve on identical equations].

Each kind is fixed by its forward drop at 1 mA (about what a meter's diode test drives) and its
emission coefficient n, which sets how the drop falls at the microamps of the high ohms ranges
(n * Vt * ln 10 per decade). The drops are the trade's diode-test figures [practice, and the bands in
physics/semiconductors.py]; the 1N4007 is the widely reproduced SPICE model the bulk-rail checks use.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

BOLTZMANN = 1.380649e-23  # J/K [src: SI 2019 exact constant]
ELEMENTARY_CHARGE = 1.602176634e-19  # C [src: SI 2019 exact constant]
ROOM_K = 300.15  # 27 C, SPICE's nominal temperature [src: ngspice manual, TNOM default]
THERMAL_VOLTAGE = BOLTZMANN * ROOM_K / ELEMENTARY_CHARGE  # about 25.86 mV
REFERENCE_CURRENT = 1e-3  # A: the current the drops below are quoted at


@dataclass(frozen=True)
class JunctionKind:
    """A junction's law (saturation current, emission coefficient) and the spread of its forward drop
    between good parts of the same type, for healthy bands."""

    name: str
    saturation: float  # A
    emission: float
    spread_v: float  # +/- V on the drop at 1 mA between good parts [practice]

    @classmethod
    def from_drop(cls, name: str, drop_at_1ma: float, emission: float, spread_v: float) -> JunctionKind:
        """The kind whose forward drop at 1 mA is ``drop_at_1ma``."""
        return cls(name, REFERENCE_CURRENT / math.expm1(drop_at_1ma / (emission * THERMAL_VOLTAGE)),
                   emission, spread_v)

    @property
    def slope_v(self) -> float:
        """n * Vt: the drop rises by this times ln(10) per decade of current."""
        return self.emission * THERMAL_VOLTAGE

    @property
    def drop_at_1ma(self) -> float:
        return self.drop(REFERENCE_CURRENT)

    def shifted(self, delta_v: float) -> JunctionKind:
        """The same kind with its forward drop moved by ``delta_v`` at every current."""
        return JunctionKind(self.name, self.saturation * math.exp(-delta_v / self.slope_v),
                            self.emission, self.spread_v)

    def current(self, volts: float) -> float:
        return self.saturation * math.expm1(volts / self.slope_v)

    def drop(self, amps: float) -> float:
        """Forward drop at ``amps`` (the inverse of :meth:`current`)."""
        return self.slope_v * math.log1p(amps / self.saturation)


# 1N4007: IS 7.02767 nA, N 1.80803 [memory: the widely reproduced 1N4007 SPICE model, also in the
# bulk-rail ngspice checks]; it gives 0.555 V at 1 mA, inside the trade's 0.5-0.7 V [practice].
SILICON_RECTIFIER = JunctionKind("silicon rectifier", 7.02767e-9, 1.80803, 0.05)
# Fast and ultrafast recovery diodes (UF4007, FR107 class) read a little higher at 1 mA [practice].
FAST_RECOVERY = JunctionKind.from_drop("fast recovery", 0.58, 2.0, 0.06)
# Schottky (1N5819, SS34 class): 0.15-0.45 V on diode test [practice]; n near 1 [memory].
SCHOTTKY = JunctionKind.from_drop("Schottky", 0.25, 1.05, 0.07)
# Body diode of a high-voltage MOSFET: about 0.5 V on diode test [practice].
BODY_DIODE = JunctionKind.from_drop("MOSFET body diode", 0.52, 1.3, 0.06)
# Base-emitter and base-collector junctions of a switching transistor [practice: 0.6-0.7 V].
TRANSISTOR_JUNCTION = JunctionKind.from_drop("transistor junction", 0.64, 1.2, 0.06)
# Infrared LED of a PC817-class optocoupler: 0.9-1.3 V on diode test [practice]; LED VF 1.2 V typ at
# 20 mA [src: Sharp PC817 datasheet]; n about 2 for a GaAs LED [memory].
INFRARED_LED = JunctionKind.from_drop("infrared LED", 1.05, 1.9, 0.08)
# TL431 anode to cathode: the substrate junction reads 0.55-0.85 V [practice].
SHUNT_REFERENCE_SUBSTRATE = JunctionKind.from_drop("TL431 anode-cathode junction", 0.70, 1.5, 0.08)
# A controller's ground-to-supply-pin substrate (protection) diode [practice].
IC_SUBSTRATE = JunctionKind.from_drop("IC substrate junction", 0.65, 1.5, 0.08)
# Zener forward: a small silicon junction [practice].
ZENER_FORWARD = JunctionKind.from_drop("Zener forward", 0.68, 1.4, 0.05)
# Zener breakdown: a steep junction (n = 1) offset so that it carries the 5 mA test current at the
# Zener voltage [textbook Zener model; 5 mA is a common datasheet test current, memory].
ZENER_BREAKDOWN = JunctionKind.from_drop("Zener breakdown", 0.60, 1.0, 0.0)
ZENER_TEST_CURRENT = 5e-3
