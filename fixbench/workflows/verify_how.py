"""How a repair is proven, with the figures worked out from the unit's ratings: the series lamp for
its first power-up, the load to run it under (a power resistor or an electronic load's setting),
the soak with a temperature check, the USB port's data lines where the output is USB, and the
insulation test left to those equipped and licensed for it.

Plain Python, tested without a window; every figure comes from the label ratings.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from fixbench.physics import series_lamp
from fixbench.quantities import format_quantity

# Power resistor ratings on the shelf, W; the resistor is rated for at least the unit's output power
# and runs hot at that load [practice].
RESISTOR_WATTS = (1, 2, 3, 5, 10, 15, 20, 25, 50, 75, 100, 150, 200, 300)
SOAK_MIN = 30  # minutes at full load before the unit is handed back [practice]
HOT_PARTS_MAX_C = 80  # the transformer, switch and output diode after the soak, by touch-free thermometer [memory]
USB_DCP_MAX_OHM = 200  # D+ to D- on a dedicated charging port [USB Battery Charging 1.2]


@dataclass(frozen=True)
class HowStep:
    title: str
    how: str


def lamp_watts(ratings) -> int:
    """The series lamp for the unit: the same lamp the series-lamp step names (one rule, in
    ``physics.series_lamp``), so the bench and the verification never disagree."""
    return series_lamp.lamp_watts(ratings)


def load_resistor(ratings) -> tuple[float, int]:
    """(ohms, watts): the resistor that draws the rated current at the rated voltage, R = V / I,
    rated for at least the power it takes, P = V * I."""
    ohms = ratings.output_v / ratings.output_a
    power = ratings.output_v * ratings.output_a
    watts = next((w for w in RESISTOR_WATTS if w >= power - 1e-9), RESISTOR_WATTS[-1])
    return ohms, watts


def _ohms(value: float) -> str:
    return format_quantity(value, "ohm")


def verification_how(ratings, usb: bool | None = None) -> tuple[HowStep, ...]:
    """The steps that say how to prove the repair. ``usb``: the output is a USB socket (None:
    not known, said for a 5 V unit)."""
    lamp = lamp_watts(ratings)
    ohms, watts = load_resistor(ratings)
    v, a = format_quantity(ratings.output_v, "V"), format_quantity(ratings.output_a, "A")
    steps = [
        HowStep("First power-up through the series lamp",
                f"A {lamp} W incandescent lamp in series with the mains lead, output unloaded: a brief "
                "flash, then dark or a faint glow. Steady bright: unplug, a short is still there."),
        HowStep("Under rated load",
                f"A {_ohms(ohms)} resistor rated {watts} W or more across the output ({v} at {a}; it "
                f"runs hot: keep it clear of the bench), or an electronic load at {a} constant "
                f"current. The output stays in spec under it."),
        HowStep("Soak",
                f"{SOAK_MIN} min at that load. Then, by a touch-free thermometer, the transformer, the "
                f"switch and the output diode under about {HOT_PARTS_MAX_C} \u00b0C, and the output "
                "still in spec."),
    ]
    if usb or (usb is None and math.isclose(ratings.output_v, 5.0, abs_tol=0.01)):
        steps.append(HowStep(
            "USB data lines" + ("" if usb else " (where the output is a USB socket)"),
            f"Unplugged, meter on ohms across D+ and D-: a dedicated charging port reads under "
            f"{USB_DCP_MAX_OHM} ohm (USB Battery Charging 1.2). Open: the device may charge slowly."))
    steps.append(HowStep(
        "Insulation test, mains to output",
        "Only where you are equipped and licensed for an insulation (hi-pot) test; otherwise the unit "
        "goes to someone who is. Local electrical codes decide."))
    return tuple(steps)
