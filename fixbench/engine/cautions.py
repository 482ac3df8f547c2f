"""The cautions that go with a check, and the hazard class of what it touches.

Energy-source classes: ES1 up to 60 V DC (30 V rms AC), ES2 up to 120 V DC (50 V rms), above that
ES3 [src: IEC 62368-1 Table 4; the exact figures from memory]. The primary side of an offline
supply is ES3 whenever it is connected, and the bulk capacitor can stay at a lethal voltage after
it is unplugged [practice]. fixbench states these cautions; local electrical codes and licensed
practice come first.
"""

from __future__ import annotations

from fixbench.knowledge.model import Check, Family

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
