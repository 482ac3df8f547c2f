"""Published figures of the semiconductors found in chargers and adapters.

Each constant names its source. Meter diode-test figures are lower than datasheet VF at 1 A because
the meter drives about 1 mA [practice].
"""

from __future__ import annotations

from dataclasses import dataclass

# 1N4007: VF max 1.0-1.1 V at 1 A [src: 1N4007 datasheets]
RECTIFIER_1N4007_VF_MAX_1A = 1.1
# Schottky 1N5817/1N5818/1N5819: VF max 0.45/0.55/0.60 V at 1 A [src: onsemi 1N5817/D]
SCHOTTKY_VF_MAX_1A = {"1N5817": 0.45, "1N5818": 0.55, "1N5819": 0.60}
# SS34: 0.50 V at 3 A [src: SS34 datasheets]
SS34_VF_MAX_3A = 0.50

# Diode test on a meter (about 1 mA): silicon rectifier 0.45-0.75 V, Schottky 0.15-0.45 V, a
# shorted junction under 0.10 V, an open one over range [practice].
DIODE_TEST_SILICON = (0.45, 0.75)
DIODE_TEST_SCHOTTKY = (0.15, 0.45)
DIODE_TEST_FAST = (0.40, 0.75)
DIODE_TEST_SHORT_BELOW = 0.10


@dataclass(frozen=True)
class ReferenceGrade:
    typical: float
    low: float
    high: float


# TL431 reference voltage at 25 C [src: TI SLVS543, electrical characteristics]
TL431_VREF = {
    "plain": ReferenceGrade(2.495, 2.440, 2.550),
    "A": ReferenceGrade(2.495, 2.470, 2.520),
    "B": ReferenceGrade(2.495, 2.483, 2.507),
}
TL431_MIN_CATHODE_CURRENT_MAX = 0.7e-3  # A [src: TI SLVS543]


def tl431_output(r_upper: float, r_lower: float, vref: float = TL431_VREF["plain"].typical) -> float:
    """Output set by a TL431 divider: Vout = Vref * (1 + R1/R2) [src: TI SLVS543]."""
    return vref * (1.0 + r_upper / r_lower)


# PC817-class optocoupler: CTR 50-600 % at IF 5 mA; LED VF 1.2 V typ, 1.4 V max [src: Sharp PC817]
OPTO_CTR_RANGE = (0.5, 6.0)
OPTO_LED_VF_TYP = 1.2
OPTO_LED_VF_MAX = 1.4
OPTO_LED_VF_MIN_LIT = 0.9  # below this the LED carries no useful current [practice]


@dataclass(frozen=True)
class StartStop:
    """Under-voltage lockout of a controller: starts at ``start``, stops below ``stop`` (V)."""

    start: float
    stop: float
    source: str


# [src: ST and onsemi UC3842/3/4/5 datasheets; ST VIPer22A datasheet]
CONTROLLER_UVLO = {
    "UC3842": StartStop(16.0, 10.0, "onsemi/ST UC3842 datasheet"),
    "UC3844": StartStop(16.0, 10.0, "onsemi/ST UC3844 datasheet"),
    "UC3843": StartStop(8.4, 7.6, "onsemi/ST UC3843 datasheet"),
    "UC3845": StartStop(8.4, 7.6, "onsemi/ST UC3845 datasheet"),
    "VIPer22A": StartStop(14.5, 8.0, "ST VIPer22A datasheet"),
}
