"""Read knowledge/*.toml into the dataclasses of :mod:`model`, checking every key on the way.

A broken or inconsistent file fails with a :class:`KnowledgeError` whose message names the file and
the key ("pwm_flyback.toml: links[3].to: unknown stage 'bulkk'"), never a bare traceback.
"""

from __future__ import annotations

import tomllib
from pathlib import Path

from fixbench.knowledge import model
from fixbench.quantities import ReadingError, parse_quantity


class KnowledgeError(ValueError):
    """A knowledge file is missing, unreadable or inconsistent."""


class _Reader:
    """Reads typed values out of one TOML table, naming file and key in every complaint."""

    def __init__(self, file_name: str, table: dict, where: str = "") -> None:
        self.file_name, self.table, self.where = file_name, table, where

    def fail(self, key: str, message: str) -> KnowledgeError:
        place = f"{self.where}.{key}" if self.where else key
        return KnowledgeError(f"{self.file_name}: {place}: {message}")

    def get(self, key: str, kind: type | tuple, default: object = ..., choices: tuple = ()) -> object:
        if key not in self.table:
            if default is ...:
                raise self.fail(key, "missing")
            return default
        value = self.table[key]
        if kind is float and isinstance(value, int) and not isinstance(value, bool):
            value = float(value)
        if not isinstance(value, kind):
            name = kind.__name__ if isinstance(kind, type) else "/".join(k.__name__ for k in kind)
            raise self.fail(key, f"expected {name}, got {type(value).__name__} {value!r}")
        if choices and value not in choices:
            raise self.fail(key, f"'{value}' is not one of: {', '.join(choices)}")
        return value

    def items(self, key: str, required: bool = True) -> list["_Reader"]:
        rows = self.table.get(key)
        if rows is None:
            if required:
                raise self.fail(key, "missing")
            return []
        if not isinstance(rows, list) or not all(isinstance(r, dict) for r in rows):
            raise self.fail(key, "expected an array of tables ([[...]])")
        return [_Reader(self.file_name, row, f"{key}[{i}]") for i, row in enumerate(rows)]

    def unknown_keys(self, allowed: set[str]) -> None:
        extra = set(self.table) - allowed
        if extra:
            raise self.fail(sorted(extra)[0], "unknown key")


def read_toml(path: Path) -> dict:
    try:
        with path.open("rb") as handle:
            return tomllib.load(handle)
    except FileNotFoundError:
        raise KnowledgeError(f"{path.name}: file not found") from None
    except tomllib.TOMLDecodeError as err:
        raise KnowledgeError(f"{path.name}: not valid TOML: {err}") from None


def _check_value_text(reader: _Reader, key: str, unit: str) -> str | None:
    text = reader.get(key, str, None)
    if text is None or text.startswith("rule:"):
        return text
    try:
        parse_quantity(text, unit)  # the right kind of unit, if one is typed
        typed = parse_quantity(text, None)  # was one typed at all?
    except ReadingError as err:
        raise reader.fail(key, f"{err}") from None
    if typed.unit is None:
        raise reader.fail(key, f"'{text}' has no unit (write it with its unit, e.g. '{text} {unit}')")
    return text


PART_VALUE_UNITS = {
    "fuse": "A", "thermistor": "ohm", "electrolytic": "F", "film_capacitor": "F", "resistor": "ohm",
    "transformer": "ohm", "zener": "V",
}


def parse_checks(reader: _Reader) -> list[model.Check]:
    checks = []
    for row in reader.items("checks"):
        row.unknown_keys({"id", "title", "instrument", "power", "points", "target", "minutes", "how",
                          "outcomes", "procedure"})
        instrument = row.get("instrument", str, choices=tuple(model.INSTRUMENT_UNITS))
        target = row.get("target", str)
        if target.split(":", 1)[0] not in ("part", "signal") or ":" not in target:
            raise row.fail("target", f"'{target}' must be 'part:ID' or 'signal:NAME'")
        outcomes = tuple(row.get("outcomes", list, []))
        if model.INSTRUMENT_UNITS[instrument] is None and not outcomes:
            raise row.fail("outcomes", f"a check with instrument '{instrument}' must list its outcomes")
        minutes = row.get("minutes", float)
        if minutes < 0:
            raise row.fail("minutes", "must not be negative")
        checks.append(model.Check(
            id=row.get("id", str), title=row.get("title", str), instrument=instrument,
            power=row.get("power", str, choices=model.POWER_STATES),
            points=tuple(row.get("points", list)), target=target, minutes=minutes,
            how=row.get("how", str), outcomes=outcomes, procedure=row.get("procedure", bool, False),
        ))
    return checks


def parse_family(path: Path, shared_checks: list[model.Check]) -> model.Family:
    reader = _Reader(path.name, read_toml(path))
    reader.unknown_keys({"id", "title", "summary", "examples", "identify", "design", "stages", "links",
                         "parts", "test_points", "checks", "faults"})
    stages = []
    for row in reader.items("stages"):
        row.unknown_keys({"id", "title", "role", "side"})
        stages.append(model.Stage(row.get("id", str), row.get("title", str),
                                  row.get("role", str, choices=model.STAGE_ROLES),
                                  row.get("side", str, choices=model.SIDES)))
    links = []
    for row in reader.items("links"):
        row.unknown_keys({"from", "to", "kind"})
        links.append(model.Link(row.get("from", str), row.get("to", str),
                                row.get("kind", str, choices=model.LINK_KINDS)))
    parts = []
    for row in reader.items("parts"):
        row.unknown_keys({"id", "stage", "kind", "role", "title", "value", "rated", "cost"})
        kind = row.get("kind", str, choices=model.PART_KINDS)
        unit = PART_VALUE_UNITS.get(kind)
        value = _check_value_text(row, "value", unit) if unit else row.get("value", str, None)
        parts.append(model.Part(
            id=row.get("id", str), stage=row.get("stage", str), kind=kind, role=row.get("role", str),
            title=row.get("title", str), value=value, rated=_check_value_text(row, "rated", "V"),
            cost=row.get("cost", float, 0.0),
        ))
    points = []
    for row in reader.items("test_points"):
        row.unknown_keys({"id", "stage", "title"})
        points.append(model.TestPoint(row.get("id", str), row.get("stage", str), row.get("title", str)))
    faults = []
    for row in reader.items("faults"):
        row.unknown_keys({"id", "part", "mode", "title", "weight", "source", "collateral"})
        collateral = []
        for item in row.items("collateral", required=False):
            item.unknown_keys({"part", "mode", "p"})
            p = item.get("p", float)
            if not 0 < p <= 1:
                raise item.fail("p", f"probability {p} must be in (0, 1]")
            collateral.append(model.Collateral(item.get("part", str), item.get("mode", str), p))
        weight = row.get("weight", float)
        if weight <= 0:
            raise row.fail("weight", "must be positive")
        faults.append(model.Fault(row.get("id", str), row.get("part", str), row.get("mode", str),
                                  row.get("title", str), weight, row.get("source", str),
                                  tuple(collateral)))
    own_checks = parse_checks(reader)
    family = model.Family(
        id=reader.get("id", str), title=reader.get("title", str), summary=reader.get("summary", str),
        examples=tuple(reader.get("examples", list, [])), identify=dict(reader.get("identify", dict, {})),
        design=dict(reader.get("design", dict)), stages=tuple(stages), links=tuple(links),
        parts=tuple(parts), test_points=tuple(points), checks=tuple(own_checks + shared_checks),
        faults=tuple(faults), source_file=path.name,
    )
    from fixbench.knowledge.validation import validate_family

    validate_family(family, reader.fail)
    return family
