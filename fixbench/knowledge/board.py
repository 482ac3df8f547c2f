"""A board profile: what a shop knows of one unit model's board, part by part, and the family as
that board has it.

A family describes a typical unit: its parts carry the family's designators and typical values. The
board in hand numbers its parts its own way and is marked with its own values (a start-up chain of
two 2.2 Mohm resistors, a 22 ohm fusible resistor, a 1000 uF output capacitor). A profile maps the
family's part ids (stable: shops' databases store them) to the board's designator(s) and what each
part is marked with; :func:`on_board` gives the family with those values, so every expected reading,
the cold network and the fault model are computed for the board in hand.

A marking is read by the one quantity parser (restricted prefixes, letter-for-point codes such as
2M2 and 5V1): "2 x 2.2 Mohm" (a chain in series), "2 x 10 uF" (capacitors in parallel),
"10 uF 400 V 105C", "T2A 250V" (a time-lag fuse), "22R 1W"; kinds bought by type (diodes,
transistors, controllers) keep their marking as text ("1N4007").
"""

from __future__ import annotations

import difflib
import math
import re
import tomllib
from dataclasses import dataclass, field, replace
from functools import lru_cache

from fixbench.knowledge.model import KIND_VALUE_UNITS, Family, Part
from fixbench.quantities import ReadingError, format_quantity, parse_quantity

# What a marked value may be for each unit: wide bounds that catch a slip of the prefix (2.2 M typed
# as 2.2 m), not a design [practice].
VALUE_BOUNDS = {"ohm": (0.01, 1e9), "F": (1e-12, 1.0), "A": (0.01, 30.0), "V": (1.0, 1000.0)}
RATED_BOUNDS_V = (1.0, 2000.0)
CAPACITOR_KINDS = ("electrolytic", "film_capacitor")
FUSE_SPEEDS = {"T": "time-lag", "F": "fast"}  # IEC 60127 speed letters [src: IEC 60127-1]
_COUNT = re.compile(r"^(\d+)\s*[xX\u00d7*]\s*(.+)$")
_FUSE = re.compile(r"^([TtFf])?\s*(\d+(?:\.\d+)?)\s*(m?)A\s*[LlHhEe]?\s*(?:[,/]?\s*(\d+(?:\.\d+)?)\s*V)?$")
_TEMPERATURE = re.compile(r"^(\d{2,3})\s*(?:\u00b0\s*)?C$")
_NUMBER_THEN_UNIT = re.compile(r"(\d)\s+(?=[A-Za-z\u00b5\u03bc\u03a9\u2126\u00b0])")


class BoardError(ReadingError):
    """A profile that does not fit the family or a marking that cannot be read; the message names the
    part and says what to type."""


@dataclass(frozen=True)
class PartEntry:
    """One part of the board as the technician typed it; blank fields say nothing."""

    part: str  # the family's part id ("R1")
    designator: str = ""  # the board's own: "R3 + R4"
    value: str = ""  # the marking: "2 x 2.2 Mohm", "10 uF 400 V", "T2A 250V", "1N4007"
    rated: str = ""  # a voltage rating typed apart: "400 V"
    package: str = ""  # "TO-220", "1206", "radial 10x16"

    @property
    def blank(self) -> bool:
        return not any(t.strip() for t in (self.designator, self.value, self.rated, self.package))


@dataclass(frozen=True)
class BoardProfile:
    """A unit model's board: the model text as the shop typed it, and an entry per part it knows."""

    model: str = ""
    family: str = ""  # the family the entries name parts of; "" where the file does not say
    parts: tuple[PartEntry, ...] = field(default=())

    def entry(self, part_id: str) -> PartEntry | None:
        return next((e for e in self.parts if e.part == part_id), None)

    def with_entry(self, entry: PartEntry) -> BoardProfile:
        """The profile with one part's entry put in (a blank one takes the part's entry out)."""
        kept = tuple(e for e in self.parts if e.part != entry.part)
        return replace(self, parts=kept if entry.blank else tuple(sorted((*kept, entry), key=lambda e: e.part)))


@dataclass(frozen=True)
class Marking:
    """A part's marking read: its value in SI (a chain's or parallel bank's total), the number of
    resistors in a chain, its voltage rating, and what else the marking says."""

    value: float | None = None
    count: int = 1
    rated_v: float | None = None
    power_w: float | None = None
    temperature_c: float | None = None
    fuse_speed: str = ""


def read_marking(kind: str, text: str, rated: str = "") -> Marking:
    """What a part of ``kind`` marked ``text`` is (``rated``: a voltage rating typed apart)."""
    text = " ".join((text or "").split())
    rated_v = _rated(rated) if rated.strip() else None
    unit = KIND_VALUE_UNITS.get(kind)
    if not text or unit is None:
        # Semiconductors, controllers, leads: bought by type; the text is kept, not read.
        return Marking(rated_v=rated_v)
    text = re.sub(r"\s*\b(in series|series|in parallel|parallel)\b\s*", " ", text, flags=re.I).strip()
    count = 1
    found = _COUNT.match(text)
    if found:
        count, text = int(found.group(1)), found.group(2).strip()
        if kind != "resistor" and kind not in CAPACITOR_KINDS:
            raise BoardError(f"'{found.group(0)}': only resistors (in series) or capacitors (in "
                             f"parallel) come as several parts; type one {kind}'s marking")
        if not 1 <= count <= 10:
            raise BoardError(f"'{found.group(0)}': a chain of 1 to 10 parts, not {count}")
    if kind == "fuse":
        marking = _fuse(text)
    else:
        marking = _tokens(text, unit, kind)
    if marking.value is None:
        raise BoardError(f"'{text}': no value in {unit} in it; type it as printed, e.g. "
                         f"{_EXAMPLE[unit]}")
    value = marking.value * count
    if kind in CAPACITOR_KINDS:
        count_on_board = 1  # capacitors side by side are one capacitance to the meter
    else:
        count_on_board = count
    low, high = VALUE_BOUNDS[unit]
    if not low <= value <= high:
        raise BoardError(f"'{text}': {format_quantity(value, unit)} is not a value for a "
                         f"{kind.replace('_', ' ')} in a charger; check the prefix")
    return replace(marking, value=value, count=count_on_board,
                   rated_v=rated_v if rated_v is not None else marking.rated_v)


KIND_WORDS = {"electrolytic": "an electrolytic capacitor", "film_capacitor": "a film capacitor",
              "zener": "a Zener diode", "transformer": "a transformer winding"}
_EXAMPLE = {"ohm": "2M2, 22R or 4.7 kohm", "F": "10 uF 400 V", "A": "T2A 250V", "V": "5V1"}


def _rated(text: str) -> float:
    try:
        volts = parse_quantity(text, "V").value
    except ReadingError as err:
        raise BoardError(f"voltage rating {err}") from None
    if not RATED_BOUNDS_V[0] <= volts <= RATED_BOUNDS_V[1]:
        raise BoardError(f"'{text}': a voltage rating of {format_quantity(volts, 'V')} is not one a part "
                         "of a charger has")
    return volts


def _fuse(text: str) -> Marking:
    found = _FUSE.match(text)
    if not found:
        raise BoardError(f"'{text}': type a fuse as printed on it, e.g. T2A 250V, F1.6A or 500 mA")
    speed, amps, milli, volts = found.groups()
    value = float(amps) * (1e-3 if milli else 1.0)
    return Marking(value=value, rated_v=_rated(volts + " V") if volts else None,
                   fuse_speed=FUSE_SPEEDS[speed.upper()] if speed else "")


def _tokens(text: str, unit: str, kind: str) -> Marking:
    """Value, voltage rating, power and temperature grade, in any order: '10uF/400V 105C'."""
    figures: dict[str, float] = {}
    tokens = [t for t in re.split(r"[\s,/]+", _NUMBER_THEN_UNIT.sub(r"\1", text)) if t]
    for token in tokens:
        where = f"'{text}'" if len(tokens) == 1 else f"'{token}' in '{text}'"
        temperature = _TEMPERATURE.match(token)
        if temperature and kind in CAPACITOR_KINDS:  # the grade, "105C" [practice]
            _put(figures, "temperature_c", float(temperature.group(1)), token, text)
            continue
        try:
            measured = parse_quantity(token)
        except ReadingError as err:
            raise BoardError(f"'{text}': {err}") from None
        got = measured.unit or (unit if "value" not in figures else None)
        if got == unit and "value" not in figures:
            _put(figures, "value", _bare(measured.value, token, kind) if measured.unit is None else measured.value,
                 token, text)
        elif got == "V" and kind in CAPACITOR_KINDS:
            _put(figures, "rated_v", measured.value, token, text)
        elif got == "W" and kind in ("resistor", "zener", "thermistor"):
            _put(figures, "power_w", measured.value, token, text)
        else:
            raise BoardError(f"{where}: {KIND_WORDS.get(kind, 'a ' + kind.replace('_', ' '))} is marked with "
                             f"its value in {unit}" + (" and its voltage" if kind in CAPACITOR_KINDS else ""))
    if "rated_v" in figures and not RATED_BOUNDS_V[0] <= figures["rated_v"] <= RATED_BOUNDS_V[1]:
        raise BoardError(f"'{text}': {format_quantity(figures['rated_v'], 'V')} is not a capacitor's rating")
    if math.isinf(figures.get("value", 0.0)):
        raise BoardError(f"'{text}': a marking is a value, not OL")
    return Marking(**figures)


def _bare(number: float, token: str, kind: str) -> float:
    """A bare number on a capacitor: microfarads on an electrolytic (they are printed so), the
    three-digit code in picofarads on a film capacitor ("104" is 100 nF) [src: IEC 60062, 3-digit
    code]."""
    if kind == "electrolytic":
        return number * 1e-6
    if kind == "film_capacitor" and re.fullmatch(r"\d{3}", token):
        return int(token[:2]) * 10.0 ** int(token[2]) * 1e-12
    return number


def _put(figures: dict[str, float], name: str, value: float, token: str, text: str) -> None:
    if name in figures:
        raise BoardError(f"'{token}' in '{text}': the {name.split('_')[0]} is given twice")
    figures[name] = value


def marked_part(part: Part, entry: PartEntry) -> Part:
    """The family's part as the board has it."""
    try:
        marking = read_marking(part.kind, entry.value, entry.rated)
    except BoardError as err:
        raise BoardError(f"part {part.id} ({part.title}): {err}") from None
    unit = KIND_VALUE_UNITS.get(part.kind)
    value, rated = part.value, part.rated
    if marking.value is not None and unit is not None:
        value = f"{marking.value!r} {unit}"
    if marking.rated_v is not None:
        rated = f"{marking.rated_v!r} V"
    shown = " ".join(entry.value.split())
    if entry.rated.strip():
        shown = f"{shown} {' '.join(entry.rated.split())}".strip()
    return replace(part, value=value, rated=rated, count=marking.count, marking=shown,
                   designator=" ".join(entry.designator.split()), package=" ".join(entry.package.split()))


@lru_cache(maxsize=64)
def on_board(family: Family, profile: BoardProfile) -> Family:
    """The family with the board's designators and marked values (the same family where the profile
    says nothing). Loaded once per profile: the fault model caches by the family it is given."""
    if profile.family and profile.family != family.id:
        raise BoardError(f"the board profile is for family '{profile.family}', not '{family.id}'")
    if not profile.parts:
        return family
    parts = {p.id: p for p in family.parts}
    designators: dict[str, str] = {}
    for entry in profile.parts:
        if entry.part not in parts:
            near = difflib.get_close_matches(entry.part, list(parts), n=3)
            hint = f" (did you mean {', '.join(near)}?)" if near else ""
            raise BoardError(f"no part '{entry.part}' in family '{family.id}'{hint}; the file names parts "
                             f"by the family's ids: {', '.join(parts)}")
        parts[entry.part] = marked_part(parts[entry.part], entry)
        for name in _designators(entry.designator):
            if name in designators and designators[name] != entry.part:
                raise BoardError(f"designator {name} is given to both {designators[name]} and {entry.part}")
            designators[name] = entry.part
    for part_id, part in parts.items():
        if not part.designator and part_id.upper() in designators:
            parts[part_id] = replace(part, id_on_board_elsewhere=True)
    return replace(family, parts=tuple(parts[p.id] for p in family.parts), _index={})


def _designators(text: str) -> list[str]:
    """The single designators in 'R3 + R4', 'R3, R4' or 'R3/R4'."""
    return [name.upper() for name in re.split(r"[\s+,/&]+", text) if name]


PART_FIELDS = ("designator", "value", "rated", "package")


def profile_from_data(data: object, source: str = "board profile") -> BoardProfile:
    """A profile from the data of its file (TOML read into a dict): ``model``, ``family`` and
    ``[parts.ID]`` tables of text fields."""
    if not isinstance(data, dict):
        raise BoardError(f"{source}: a board profile is a table of model, family and [parts.ID]")
    unknown = sorted(set(data) - {"model", "family", "parts", "format"})
    if unknown:
        raise BoardError(f"{source}: unknown key '{unknown[0]}' (a profile has model, family and parts)")
    for key in ("model", "family"):
        if not isinstance(data.get(key, ""), str):
            raise BoardError(f"{source}: '{key}' is text")
    parts = data.get("parts", {})
    if not isinstance(parts, dict):
        raise BoardError(f"{source}: 'parts' holds one table per part, e.g. [parts.C1]")
    entries = []
    for part_id, fields in parts.items():
        if not isinstance(fields, dict):
            raise BoardError(f"{source}: parts.{part_id} is a table, e.g. designator = \"C5\"")
        wrong = sorted(set(fields) - set(PART_FIELDS))
        if wrong:
            raise BoardError(f"{source}: parts.{part_id}: unknown key '{wrong[0]}' (a part has "
                             f"{', '.join(PART_FIELDS)})")
        if not all(isinstance(v, str) for v in fields.values()):
            raise BoardError(f"{source}: parts.{part_id}: every field is text, e.g. value = \"10 uF\"")
        entry = PartEntry(part_id, **fields)
        if not entry.blank:
            entries.append(entry)
    return BoardProfile(data.get("model", "").strip(), data.get("family", "").strip(),
                        tuple(sorted(entries, key=lambda e: e.part)))


def profile_from_toml(text: str, source: str = "board profile") -> BoardProfile:
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as err:
        raise BoardError(f"{source}: not a TOML file ({err})") from None
    return profile_from_data(data, source)


def profile_as_data(profile: BoardProfile) -> dict:
    return {"model": profile.model, "family": profile.family,
            "parts": {e.part: {name: getattr(e, name) for name in PART_FIELDS if getattr(e, name).strip()}
                      for e in profile.parts}}


def profile_to_toml(profile: BoardProfile) -> str:
    """The profile as the TOML file a shop shares (read back by :func:`profile_from_toml`)."""
    lines = ["# fixbench board profile: the family's part ids with this board's designators and markings",
             f"model = {_toml_text(profile.model)}", f"family = {_toml_text(profile.family)}"]
    for entry in profile.parts:
        lines += ["", f"[parts.{_toml_key(entry.part)}]"]
        lines += [f"{name} = {_toml_text(getattr(entry, name))}" for name in PART_FIELDS
                  if getattr(entry, name).strip()]
    return "\n".join(lines) + "\n"


def _toml_text(text: str) -> str:
    """A TOML basic string: backslash, quote and control characters escaped (TOML 1.0, strings)."""
    out = []
    for ch in text:
        if ch in ('"', "\\"):
            out.append("\\" + ch)
        elif ord(ch) < 0x20 or ord(ch) == 0x7F:
            out.append(f"\\u{ord(ch):04X}")
        else:
            out.append(ch)
    return '"' + "".join(out) + '"'


def _toml_key(key: str) -> str:
    return key if re.fullmatch(r"[A-Za-z0-9_-]+", key) else _toml_text(key)
