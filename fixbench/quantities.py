"""The one parser and formatter for readings and ratings typed with units.

A technician types what the meter shows: "325 V", "4k7", "0R47", "0.45 ohm", "100 uF", "68 kHz",
"OL", and what parts are marked with: "2M2", "5V1". Everything numeric in fixbench goes through :func:`parse_quantity`, and everything shown to a
person goes through :func:`format_quantity`, so units and prefixes look the same everywhere.

Values are held in SI base units (V, A, Hz, F, ohm, s, W). Only the everyday engineering prefixes
are accepted on input (T G M k m u n p): quantiphy would otherwise read "0.45R" as 0.45 ronna.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from quantiphy import Quantity, QuantiPhyError

# Canonical unit symbols and what a person may type for them.
UNIT_ALIASES: dict[str, str] = {
    "v": "V", "vdc": "V", "vac": "V", "vrms": "V", "vpp": "V", "vp-p": "V", "volt": "V", "volts": "V",
    "a": "A", "amp": "A", "amps": "A",
    "hz": "Hz",
    "f": "F", "farad": "F",
    "ohm": "ohm", "ohms": "ohm", "r": "ohm", "\u03a9": "ohm", "\u2126": "ohm",
    "s": "s", "sec": "s",
    "w": "W", "watt": "W", "watts": "W",
}

# What each canonical unit measures, for messages that say what a check wants.
UNIT_NAMES = {
    "V": "volts", "A": "amps", "Hz": "hertz", "F": "farads", "ohm": "ohms", "s": "seconds", "W": "watts",
}

# Words meters and people use for "no continuity / over range". Read as an infinite value.
OVER_RANGE_WORDS = {"ol", "o.l", "o.l.", "open", "inf", "infinite", "overload", "over range"}

_PREFIXES_IN = "TGMkmunp"
_EXPONENT = {"T": 12, "G": 9, "M": 6, "k": 3, "K": 3, "m": -3, "u": -6, "n": -9, "p": -12}
_SCALE = {letter: 10.0**exp for letter, exp in _EXPONENT.items()}
# Resistor/capacitor code where the prefix letter stands for the decimal point: 4k7, 0R47, 2M2, 4n7
# [src: IEC 60062, letter and digit code]; Zener voltages are printed the same way, 5V1, 4V7.
_RKM = re.compile(r"^(\d+)([RrKkMmunpGV])(\d+)$")
_RKM_UNIT = {"R": "ohm", "r": "ohm", "V": "V"}
_SPLIT = re.compile(r"^([-+]?[0-9.eE+-]*[0-9.](?:[eE][-+]?\d+)?)\s*([A-Za-z\u00b5\u03bc\u03a9\u2126%-]*)$")
_COMMA_DECIMAL = re.compile(r"^[-+]?\d+,\d+")


class ReadingError(ValueError):
    """Text a person typed that cannot be read as asked. The message says what to do."""


@dataclass(frozen=True)
class Measured:
    """A parsed quantity: value in SI base units and its canonical unit (None if typed bare)."""

    value: float
    unit: str | None

    @property
    def over_range(self) -> bool:
        return math.isinf(self.value)


def _canonical_unit(text: str) -> str | None:
    """Map a typed unit (without prefix) to its canonical symbol, or None if unknown."""
    text = text.replace(" ", "")
    # Greek capital omega lower-cases to a different letter, so look symbols up as typed first.
    return UNIT_ALIASES.get(text) or UNIT_ALIASES.get(text.lower())


def _split_prefix(unit_text: str) -> tuple[float, str]:
    """Split 'kohm' into (1e3, 'ohm'), 'uF' into (1e-6, 'F'); a bare unit gives (1.0, unit)."""
    unit_text = unit_text.replace("\u00b5", "u").replace("\u03bc", "u")
    direct = _canonical_unit(unit_text)
    if direct is not None and unit_text not in ("m",):
        return 1.0, direct
    if len(unit_text) >= 1 and unit_text[0] in _SCALE:
        rest = unit_text[1:]
        if rest == "":
            return _SCALE[unit_text[0]], ""
        unit = _canonical_unit(rest)
        if unit is not None:
            return _SCALE[unit_text[0]], unit
    raise ReadingError(f"unknown unit '{unit_text}': use V, A, Hz, F, ohm, s or W with k, M, m, u, n, p")


def parse_quantity(text: str, expect_unit: str | None = None) -> Measured:
    """Read a typed quantity. ``expect_unit`` (canonical) is assumed for a bare number and checked
    against a typed unit, so "325 V" typed where ohms are wanted is refused with a message."""
    raw = text
    text = (text or "").strip()
    if not text:
        raise ReadingError("empty: type a value with its unit, for example 325 V or 4k7")
    if text.lower() in OVER_RANGE_WORDS:
        return Measured(math.inf, expect_unit)
    if _COMMA_DECIMAL.match(text):
        raise ReadingError(f"'{raw}': use a point for decimals, for example {text.replace(',', '.', 1)}")
    text = text.replace("\u00b5", "u").replace("\u03bc", "u")
    unit_word = ""
    rkm = _RKM.match(text.replace(" ", ""))
    if rkm:
        whole, letter, frac = rkm.groups()
        exponent = 0 if letter in _RKM_UNIT else _EXPONENT[letter]
        value = float(f"{whole}.{frac}e{exponent}")
        unit: str | None = _RKM_UNIT.get(letter)
        return _checked(Measured(value, unit or expect_unit), expect_unit, raw, typed_unit=unit)
    match = _SPLIT.match(text)
    if not match:
        raise ReadingError(f"cannot read '{raw}' as a value: type a number and a unit, for example 325 V")
    number_text, unit_word = match.groups()
    try:
        number = float(number_text)
    except ValueError:
        raise ReadingError(f"cannot read '{number_text}' as a number") from None
    if unit_word in ("", None):
        return _checked(Measured(number, expect_unit), expect_unit, raw, typed_unit=None)
    if unit_word == "%":
        raise ReadingError(f"'{raw}': type the value itself, not a percentage")
    scale, unit = _split_prefix(unit_word)
    value = _scaled(number_text, round(math.log10(scale))) if scale != 1.0 else number
    canonical = unit or expect_unit
    return _checked(Measured(value, canonical), expect_unit, raw, typed_unit=unit or None)


def _scaled(number_text: str, exponent: int) -> float:
    """The number times 10**exponent, added to its own exponent ("5e3" with m is 5e0), so 100 uF
    is exactly 1e-4, not 9.999...e-5."""
    mantissa, _, own = number_text.lower().partition("e")
    return float(f"{mantissa}e{int(own or 0) + exponent}")


def _checked(measured: Measured, expect_unit: str | None, raw: str, typed_unit: str | None) -> Measured:
    if expect_unit and typed_unit and typed_unit != expect_unit:
        want = UNIT_NAMES.get(expect_unit, expect_unit)
        got = UNIT_NAMES.get(typed_unit, typed_unit)
        raise ReadingError(f"'{raw}' is in {got}, but this check reads {want} ({expect_unit})")
    if math.isnan(measured.value):
        raise ReadingError(f"'{raw}' is not a number")
    if math.isinf(measured.value):
        # Only the over-range words mean infinity; a typed number this large is a slip.
        raise ReadingError(f"'{raw}' is too large a number; for a meter over range type OL")
    return measured


def format_quantity(value: float | None, unit: str, digits: int = 3) -> str:
    """Show a value with a sensible prefix: 325 V, 4.7 kohm, 68 kHz, 100 uF, OL for infinity."""
    if value is None:
        return "-"
    if math.isinf(value):
        return "OL"
    if unit == "":
        return f"{value:.{digits}g}"
    if unit == "F" and 1e-3 <= abs(value) < 1.0:
        # Capacitors are marked and sold in microfarads, 1000 uF and up too, never millifarads [practice].
        micro = value * 1e6
        decimals = max(digits - len(str(int(abs(micro)))), 0)
        text = f"{micro:.{decimals}f}"
        return (text.rstrip("0").rstrip(".") if "." in text else text) + " uF"
    q = Quantity(value, unit)
    text = q.render(prec=max(digits - 1, 0), strip_zeros=True, form="si")
    text = text.replace("\u00b5", "u")
    return text


def format_band(low: float | None, high: float | None, unit: str, digits: int = 3) -> str:
    """Show a band as '300 V to 340 V', 'at least 2 V', 'at most 0.5 ohm'; '' where there is none."""
    if low is not None and high is not None:
        return f"{format_quantity(low, unit, digits)} to {format_quantity(high, unit, digits)}"
    if low is not None:
        return f"at least {format_quantity(low, unit, digits)}"
    if high is not None:
        return f"at most {format_quantity(high, unit, digits)}"
    return ""


def quantiphy_value(text: str) -> float:
    """quantiphy's own reading of a plain quantity, with input prefixes restricted.
    Used by tests to cross-check :func:`parse_quantity` against an independent parser."""
    try:
        with Quantity.prefs(input_sf=_PREFIXES_IN):
            return float(Quantity(text))
    except QuantiPhyError as err:
        raise ReadingError(str(err)) from None
