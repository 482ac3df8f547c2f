"""The cautions that go with a check, and the hazard class of what it touches.

Energy-source classes: ES1 up to 60 V DC (30 V rms AC), ES2 up to 120 V DC (50 V rms), above that
ES3 [src: IEC 62368-1 Table 4; the exact figures from memory]. The primary side of an offline
supply is ES3 whenever it is connected, and the bulk capacitor can stay at a lethal voltage after
it is unplugged [practice]. fixbench states these cautions; local electrical codes and licensed
practice come first.
"""

from __future__ import annotations

import numpy as np

from fixbench.knowledge.model import Check, Family
from fixbench.physics.part_values import rated_voltage
from fixbench.quantities import format_quantity

from fixbench.engine.fault_model import FaultModel

ES1_DC_MAX = 60.0
ES2_DC_MAX = 120.0

MAINS = ("Mains voltage is present on the primary side and on the heatsinks over it. Work through an "
         "isolation transformer, one hand away from the board, probes clipped on before power is applied.")
BULK = ("The bulk capacitor can hold a lethal charge after unplugging. Confirm it reads under 5 V "
        "before touching the primary; discharge it through a resistor (about 2 kohm, 5-10 W), never a "
        "screwdriver.")
SCOPE = ("A mains-earthed scope on a non-isolated primary shorts mains through its ground lead: use an "
         "isolation transformer or a differential probe.")
LAMP = ("Power up through the series lamp, never straight from the wall, while a short on the primary "
        "is still possible.")
OVERVOLTAGE = "The loop may be open"  # how the over-voltage caution begins (the benchmark looks for it)
OVERVOLTAGE_PLAUSIBLE = 0.01  # chance of an output over its capacitor's rating that earns the caution
NO_LOAD_OUTPUT = "output_voltage"  # the signal of the no-load output check
LOAD_SHARE = 0.1  # the load put on the output: a tenth of the rated current [practice]
OPEN_CLAMP = ("An open clamp (snubber diode or resistor) is still possible: powered, even through the lamp, "
              "the switch can fail on the first cycles. Read the clamp diode and resistor cold first.")
DEFER = "These notes do not replace local electrical codes or the practice of a licensed technician."


def hazard_class(family: Family, check: Check, output_v: float) -> str:
    """ES1/ES2/ES3 of what the probes touch when the check is made."""
    if check.power in ("none",):
        return "none"
    if family.touches_primary(check) and check.power in ("live", "lamp"):
        return "ES3"
    if family.touches_primary(check):
        return "ES3 until discharged"
    if check.power == "cold":
        return "ES1"
    return "ES1" if output_v <= ES1_DC_MAX else "ES2" if output_v <= ES2_DC_MAX else "ES3"


def cautions_for(family: Family, check: Check) -> tuple[str, ...]:
    notes = []
    primary = family.touches_primary(check)
    if check.power in ("live", "lamp"):
        notes.append(MAINS)
        if check.instrument in ("ripple", "frequency") or "scope" in check.how.lower():
            notes.append(SCOPE)
        if check.power == "lamp":
            notes.append(LAMP)
    if check.power == "cold" and primary:
        notes.append(BULK)
    if notes:
        notes.append(DEFER)
    return tuple(notes)


def output_overvoltage(model: FaultModel, posterior: np.ndarray, check: Check) -> str | None:
    """The caution for a no-load output reading while a unit with its loop open is plausible: the
    output can rise past its capacitor's voltage rating, and an electrolytic over its rating can
    vent or burst [practice]. A load on the output holds the rise down and is what a technician
    puts on before switching such a unit on [practice]."""
    if check.power != "live" or check.target_kind != "signal" or check.target_id != NO_LOAD_OUTPUT:
        return None
    family, ratings = model.family, model.ratings
    caps = family.parts_with_role("output_capacitor")
    if not caps:
        return None
    rated = rated_voltage(caps[0], ratings, family.design)
    values = np.array([op.values.get(NO_LOAD_OUTPUT, 0.0) for op in model.operations])
    over = values > rated
    if float(posterior[over].sum()) <= OVERVOLTAGE_PLAUSIBLE:
        return None
    highest = float(values[over].max())
    load_ohm = ratings.output_v / (LOAD_SHARE * ratings.output_a)
    load_w = ratings.output_v ** 2 / load_ohm
    return (f"{OVERVOLTAGE}: with no load the output can rise to about {format_quantity(highest, 'V', 2)}, over "
            f"the output capacitor's {format_quantity(rated, 'V')} rating, and it can vent or burst. Put a "
            f"load on the output before switching on (about {format_quantity(load_ohm, 'ohm', 2)}, rated "
            f"{max(1, round(2 * load_w))} W or more), keep your face clear of the capacitor and switch off "
            f"at once if the reading climbs past the label.")
