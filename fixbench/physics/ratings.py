"""A unit's label ratings and the bench mains it is tested on, read from text.

Nominal mains and their tolerance: 230 V +/-10 % (207-253 V), 120 V, 100 V [src: IEC 60038, Table 1].
Universal-input adapters are designed for 85-265 V rms, 47-63 Hz [src: TI UCC28C4x datasheet design
example].
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from fixbench.quantities import ReadingError, format_quantity, parse_quantity

MAINS_TOLERANCE = 0.10  # IEC 60038 Table 1: +/-10 % at the supply terminals
UNIVERSAL_LOW, UNIVERSAL_HIGH = 85.0, 265.0  # TI UCC28C4x design example
UNIVERSAL_WORDS = {"universal", "100-240 v", "100-240v", "100-240", "85-265", "85-265 v", "90-264 v", "90-264"}
RATING_KEYS = {"mains", "frequency", "output", "current", "bulk", "switching", "bench_mains"}
# What any offline switch-mode supply fixbench models can have, whatever its family; a family may
# describe less. Bulk capacitors of chargers and adapters up to 250 W run from a few uF to a few
# hundred uF (1-3 uF per input watt); switching frequencies from tens of kHz to about 1 MHz
# [practice]. The bounds are wide on purpose: they catch a slip of the prefix, not a design.
BULK_RANGE_F = (1e-6, 10e-3)
SWITCHING_RANGE_HZ = (5e3, 5e6)


class RatingsOutOfReach(ReadingError):
    """Ratings that read well but that a family's circuit cannot have (an output below what its
    feedback reference can regulate): the message names the rating and the reason."""


@dataclass(frozen=True)
class Ratings:
    """What the label says, in SI units, plus the mains on the bench where the unit is tested."""

    design_low: float  # lowest mains the unit is designed for, V rms
    design_high: float  # highest mains, V rms
    universal: bool
    bench_mains: float  # the mains actually applied on the bench, V rms (nominal of the shop's supply)
    mains_hz: float
    output_v: float
    output_a: float
    bulk_f: float | None = None  # bulk capacitance if read off the capacitor
    switching_hz: float | None = None

    @property
    def output_w(self) -> float:
        return self.output_v * self.output_a

    @property
    def bench_low(self) -> float:
        return self.bench_mains * (1 - MAINS_TOLERANCE)

    @property
    def bench_high(self) -> float:
        return self.bench_mains * (1 + MAINS_TOLERANCE)

    def as_text(self) -> dict[str, str]:
        """The ratings as the text dict a case file holds (inverse of :func:`parse_ratings`)."""
        low = round(self.design_low / (1 - MAINS_TOLERANCE), 1)
        high = round(self.design_high / (1 + MAINS_TOLERANCE), 1)
        single = format_quantity(self.bench_mains, "V") if low == high == self.bench_mains else f"{low:g} V"
        text = {
            "mains": "universal" if self.universal else single if low == high else f"{low:g}-{high:g} V",
            "frequency": format_quantity(self.mains_hz, "Hz"),
            "output": format_quantity(self.output_v, "V"),
            "current": format_quantity(self.output_a, "A"),
        }
        if self.universal:
            text["bench_mains"] = format_quantity(self.bench_mains, "V")
        if self.bulk_f is not None:
            text["bulk"] = format_quantity(self.bulk_f, "F")
        if self.switching_hz is not None:
            text["switching"] = format_quantity(self.switching_hz, "Hz")
        return text


def _value(ratings: dict[str, str], key: str, unit: str, default: str | None = None) -> float | None:
    text = ratings.get(key)
    if text is None or str(text).strip() == "":
        text = default  # a blank optional rating is one not given
    if text is None:
        return None
    try:
        measured = parse_quantity(str(text), unit)
    except ReadingError as err:
        raise ReadingError(f"rating '{key}': {err}") from None
    if measured.value <= 0 or measured.over_range:
        raise ReadingError(f"rating '{key}': must be a positive value, got '{text}'")
    return measured.value


@dataclass(frozen=True)
class MainsLabel:
    low: float
    high: float
    universal: bool
    hz: float | None  # a single frequency printed on the label ("60Hz"); None for "50/60Hz" or none


# The mains as labels print it: "230V~", "220-240V", "100-240V~ 50/60Hz", "AC 100-240V 0.5A",
# "120 VAC 60 Hz" [practice: IEC 60417 symbol 5032 "~" for alternating current].
_MAINS_LABEL = re.compile(
    r"^(?:ac\s*)?(\d+(?:\.\d+)?)\s*(?:v\s*)?(?:[-\u2013/]\s*(\d+(?:\.\d+)?))?\s*v?\s*(?:~|ac|vac)?\s*"
    r"(?:[,;]?\s*(\d+)(?:\s*/\s*(\d+))?\s*hz)?\s*(?:[,;]?\s*\d+(?:\.\d+)?\s*(?:m?a))?$")
# A range reaching down to 110 V and up to 220 V covers both mains of the world: a universal input.
UNIVERSAL_SPAN = (110.0, 220.0)


def read_mains_label(text: str) -> MainsLabel | None:
    """The mains part of a label as printed; None where the text is not in a label's form (then it
    is read as a plain voltage, with that parser's message)."""
    if len(text) > 60:  # a label's mains is a few words; longer text is read as a plain voltage
        return None
    found = _MAINS_LABEL.match(" ".join(text.strip().lower().split()))
    if not found or not any(mark in text.lower() for mark in ("-", "\u2013", "/", "~", "ac", "hz")):
        return None
    low, high, hz1, hz2 = found.groups()
    low_v = float(low)
    high_v = float(high) if high else low_v
    if high_v < low_v:
        low_v, high_v = high_v, low_v
    universal = low_v <= UNIVERSAL_SPAN[0] and high_v >= UNIVERSAL_SPAN[1]
    hz = float(hz1) if hz1 and not hz2 else None
    return MainsLabel(low_v, high_v, universal, hz)


def parse_ratings(ratings: dict[str, str]) -> Ratings:
    """Read label ratings typed as text: {"mains": "230 V" or "universal", "frequency": "50 Hz",
    "output": "5 V", "current": "2 A", optional "bulk": "22 uF", "switching": "65 kHz",
    "bench_mains": "230 V" (for universal units; default 230 V)}."""
    unknown = set(ratings) - RATING_KEYS
    if unknown:
        raise ReadingError(f"unknown rating '{sorted(unknown)[0]}': use {', '.join(sorted(RATING_KEYS))}")
    for key in ("mains", "output", "current"):
        if not str(ratings.get(key, "")).strip():
            raise ReadingError(f"rating '{key}' is missing")
    mains_text = str(ratings["mains"]).strip().lower()
    label = read_mains_label(str(ratings["mains"]))
    universal = mains_text in UNIVERSAL_WORDS or (label is not None and label.universal)
    label_hz = None if label is None else label.hz
    if universal:
        design_low, design_high = UNIVERSAL_LOW, UNIVERSAL_HIGH
        bench = _value(ratings, "bench_mains", "V", "230 V")
    else:
        low, high = (label.low, label.high) if label is not None else (_value(ratings, "mains", "V"),) * 2
        for nominal in (low, high):
            if not 90 <= nominal <= 264:
                raise ReadingError(f"rating 'mains': {nominal:g} V is not a mains voltage (90 to 264 V, or 'universal')")
        design_low, design_high = low * (1 - MAINS_TOLERANCE), high * (1 + MAINS_TOLERANCE)
        # A range label ("220-240 V") is tested on the shop's mains inside it, else its middle.
        inside = next((v for v in (230.0, 120.0, 100.0) if low <= v <= high), round((low + high) / 2))
        bench = _value(ratings, "bench_mains", "V", f"{inside if low != high else low} V")
    if not UNIVERSAL_LOW <= bench <= UNIVERSAL_HIGH:
        raise ReadingError(f"rating 'bench_mains': {bench:g} V is not a mains voltage "
                           f"({UNIVERSAL_LOW:g} to {UNIVERSAL_HIGH:g} V)")
    hz_default = "60 Hz" if (not universal and design_high < 150) else "50 Hz"
    hz = _value(ratings, "frequency", "Hz", f"{label_hz:g} Hz" if label_hz else hz_default)
    if not 45 <= hz <= 65:
        raise ReadingError(f"rating 'frequency': {hz:g} Hz is not a mains frequency (50 or 60 Hz)")
    output_v = _value(ratings, "output", "V")
    output_a = _value(ratings, "current", "A")
    if not 1 <= output_v <= 60:
        raise ReadingError(f"rating 'output': {output_v:g} V is outside what fixbench models (1 to 60 V)")
    if not 0.05 <= output_a <= 20:
        raise ReadingError(f"rating 'current': {output_a:g} A is outside what fixbench models (0.05 to 20 A)")
    if output_v * output_a > 250:
        raise ReadingError("ratings: more than 250 W is outside what fixbench models")
    bulk = _value(ratings, "bulk", "F")
    if bulk is not None and not BULK_RANGE_F[0] <= bulk <= BULK_RANGE_F[1]:
        raise ReadingError(f"rating 'bulk': {format_quantity(bulk, 'F')} is not the bulk capacitor of "
                           f"an offline supply ({format_quantity(BULK_RANGE_F[0], 'F')} to "
                           f"{format_quantity(BULK_RANGE_F[1], 'F')})")
    switching = _value(ratings, "switching", "Hz")
    if switching is not None and not SWITCHING_RANGE_HZ[0] <= switching <= SWITCHING_RANGE_HZ[1]:
        raise ReadingError(f"rating 'switching': {format_quantity(switching, 'Hz')} is not the switching "
                           f"frequency of an offline supply ({format_quantity(SWITCHING_RANGE_HZ[0], 'Hz')} "
                           f"to {format_quantity(SWITCHING_RANGE_HZ[1], 'Hz')})")
    return Ratings(
        design_low=design_low, design_high=design_high, universal=universal, bench_mains=bench,
        mains_hz=hz, output_v=output_v, output_a=output_a, bulk_f=bulk, switching_hz=switching,
    )


def describe_label(ratings: dict[str, str]) -> str:
    """The label ratings as a person writes them: "input 100-240 V 50 Hz, output 12 V 2 A".
    The bench mains is where the unit was tested, not part of its label, and is left out."""
    mains = str(ratings.get("mains", "")).strip()
    if mains.lower() in UNIVERSAL_WORDS:
        mains = "100-240 V"
    parts = []
    if mains:
        parts.append(" ".join(x for x in ("input", mains, str(ratings.get("frequency", "")).strip()) if x))
    output = " ".join(str(ratings.get(k, "")).strip() for k in ("output", "current")).strip()
    if output:
        parts.append(f"output {output}")
    if ratings.get("bulk"):
        parts.append(f"bulk capacitor {ratings['bulk']}")
    return ", ".join(parts)
