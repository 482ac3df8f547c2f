"""A reading as typed at the bench, read against the check it answers.

Numbers go through the one quantity parser with the check's unit. Outcome checks accept their
outcomes and the words people use for them ("y", "glows bright", "ticks"). A few meter words are
understood on numeric checks: "OL"/"open" is over range, "beeps" on continuity or diode test is a
near-dead short.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from fixbench.engine.fault_model import CheckModel
from fixbench.quantities import ReadingError, format_quantity, parse_quantity

SYNONYMS = {
    "yes": ("y", "yes", "true", "1", "reported", "seen", "heard"),
    "no": ("n", "no", "false", "0", "none", "not"),
    "bright": ("bright", "glows bright", "steady bright", "full", "full brightness", "lit", "on"),
    "flash": ("flash", "dim", "flash then dark", "flash then dim", "flash, then dim or dark", "glows dim",
              "dark after flash", "dim after flash", "flash then off"),
    "no_flash": ("no flash", "no flash at all", "never lights", "never flashes", "nothing", "no glow"),
    "steady": ("steady", "stable", "constant"),
    "cycling": ("cycling", "cycles", "saw-tooth", "sawtooth", "up and down", "ticking", "pumping"),
    "zero": ("zero", "0 v", "nothing"),
}
# Words that do not say what was seen at switch-on: a lamp dark after its flash is a healthy unit, a
# lamp that never flashed has no path through it [practice; trade primer, section 8].
AMBIGUOUS = {"dark": "flash", "off": "flash"}
BEEP_WORDS = ("beeps", "beep", "continuity", "short", "shorted")
# A bare number is read with the prefix the step shows its expected value in ("5.46" where 4.7 uF
# is expected is 5.46 uF) where a bare base unit is never what the instrument shows: capacitance,
# and frequency from kilohertz up. Ohms and volts are read as typed: a meter shows a short as a bare
# fraction of an ohm and a diode drop as 0.55 V, and reading "0.3" in the megohms a healthy
# drain-source shows would hide the short [practice]. The lowest exponent each unit is scaled from:
SHOWN_PREFIX_FROM = {"F": -15, "Hz": 3}
_BARE_NUMBER = re.compile(r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?")
BEEP_VALUE = {"ohmmeter": 0.5, "esr": 0.01, "diode_test": 0.0}


@dataclass(frozen=True)
class Reading:
    check: str
    text: str
    value: float | None  # SI units; None for an outcome check
    unit: str | None
    outcome: str  # the class the reading falls in
    in_band: bool
    read_as: str = ""  # the prefixed unit a bare number was read in ("uF"), for the echo

    def shown(self) -> str:
        return format_quantity(self.value, self.unit) if self.value is not None else self.outcome


def read(check_model: CheckModel, text: str) -> Reading:
    """Parse ``text`` for this check; ReadingError with a message for the person otherwise."""
    check, classes = check_model.check, check_model.classes
    cleaned = (text or "").strip()
    if check.unit is None:
        word = cleaned.lower()
        for outcome in classes.names:
            if word == outcome or word in SYNONYMS.get(outcome, ()):
                return Reading(check.id, cleaned, None, None, outcome, outcome == check_model.healthy_outcome)
        if word in AMBIGUOUS and AMBIGUOUS[word] in classes.names:
            raise ReadingError(f"'{cleaned}': did the lamp flash as you switched on? Type 'flash then dark' "
                               f"(normal for a healthy unit) or 'no flash' (no path: open fuse, thermistor "
                               f"or lead)")
        raise ReadingError(f"'{cleaned}' is not an answer here: pick one of {', '.join(classes.names)}")
    read_as = ""
    if cleaned.lower() in BEEP_WORDS and check.instrument in BEEP_VALUE:
        value = BEEP_VALUE[check.instrument]
    else:
        value = parse_quantity(cleaned, check.unit).value
        scale, read_as = shown_scale(check_model) if _BARE_NUMBER.fullmatch(cleaned) else (1.0, "")
        value *= scale
    if value < 0 and check.instrument in ("ohmmeter", "esr", "capacitance", "frequency", "ripple"):
        raise ReadingError(f"'{cleaned}': a {check.instrument.replace('_', ' ')} reading cannot be negative")
    if not math.isinf(value) and check.unit == "V" and abs(value) > 2000:
        raise ReadingError(f"'{cleaned}': more than 2 kV cannot be on this unit; check the range and units")
    outcome = classes.classify(value)
    return Reading(check.id, cleaned, value, check.unit, outcome, check_model.healthy.contains(value),
                   read_as if read_as != check.unit else "")


def shown_scale(check_model: CheckModel) -> tuple[float, str]:
    """(factor, prefixed unit) a bare number on this check is read in: the prefix of the expected
    value the step shows, where the unit takes one (SHOWN_PREFIX_FROM); (1, unit) otherwise."""
    unit, expected = check_model.check.unit, check_model.healthy
    shown = next((v for v in (expected.nominal, expected.high, expected.low)
                  if v is not None and math.isfinite(v) and v > 0), None)
    if unit not in SHOWN_PREFIX_FROM or shown is None:
        return 1.0, unit or ""
    prefixed = format_quantity(shown, unit).split(" ", 1)[-1]  # as the step shows it: "uF"
    scale = parse_quantity(f"1 {prefixed}", unit).value
    if scale == 1.0 or math.log10(scale) < SHOWN_PREFIX_FROM[unit] - 1e-9:
        return 1.0, unit
    return scale, prefixed
