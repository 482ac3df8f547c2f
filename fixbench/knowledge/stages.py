"""Stage files: one circuit block (its parts, test points, checks and faults) written once under
knowledge/stages/ and used by every family built with it.

A stage file is a variant of a stage role ("feedback/tl431_opto", "feedback/zener_opto"): its parts
carry default designators (F1, C1 ...), its checks may only read parts of the same stage, and its
faults are named after their part and mode ("C2.dried"). A fault's collateral damage names the
other parts by the role they play ("the fuse opens"), so the same stage file works whatever a
family's other stages are called. Everything is checked here that can be checked without knowing
the family; :mod:`composition` checks the rest.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from fixbench.knowledge import model
from fixbench.knowledge.design import STAGE_FACTS
from fixbench.knowledge.reader import Reader, check_value_text, read_toml

PART_VALUE_UNITS = model.KIND_VALUE_UNITS
COLD_INSTRUMENTS = ("ohmmeter", "diode_test", "capacitance", "esr")


@dataclass(frozen=True)
class CollateralRule:
    """Collateral damage named by the role of the part that suffers it; ``place`` says where it was
    written ("stages/bulk/electrolytic.toml: faults[1].collateral[0]")."""

    role: str
    mode: str
    probability: float
    place: str


@dataclass(frozen=True)
class FaultTemplate:
    part: str
    mode: str
    title: str
    weight: float
    source: str
    collateral: tuple[CollateralRule, ...] = ()

    @property
    def id(self) -> str:
        return f"{self.part}.{self.mode}"


@dataclass(frozen=True)
class StageTemplate:
    """One stage file. ``keys`` maps (section, id) to the item's key in the file, for messages."""

    name: str  # path under stages/ without .toml: "feedback/tl431_opto"
    file: str  # as messages name it: "stages/feedback/tl431_opto.toml"
    title: str
    role: str
    side: str
    design: dict[str, str]  # the design kinds this stage fixes (drive, feedback, output_diode)
    parts: tuple[model.Part, ...]  # stage left empty: the family names the stage
    test_points: tuple[model.TestPoint, ...]
    checks: tuple[model.Check, ...]
    faults: tuple[FaultTemplate, ...]
    keys: dict[tuple[str, str], str]


def parse_pins(row: Reader, kind: str) -> tuple[tuple[str, str], ...]:
    """Where the part's pins sit in the cold netlist: ``pins = { a = "bulk_plus", b = "vcc" }``."""
    table = row.table_at("pins")
    known = model.KIND_PINS[kind]
    for pin in table.table:
        if pin not in known:
            raise table.fail(pin, f"a {kind} has no pin '{pin}' (its pins: {', '.join(known)})")
    for pin in model.KIND_REQUIRED_PINS.get(kind, known):
        if pin not in table.table:
            raise table.fail(pin, f"missing: say which node the {kind}'s '{pin}' pin sits on")
    pins = tuple((pin, table.get(pin, str)) for pin in known if pin in table.table)
    for pin, node in pins:
        if not node or node == model.LIFTED_LEG or not node.replace("_", "").isalnum():
            raise table.fail(pin, f"'{node}' is not a node name (letters, digits and _; not '{model.LIFTED_LEG}')")
    return pins


def parse_part(row: Reader, stage: str = "") -> model.Part:
    kind = row.get("kind", str, choices=model.PART_KINDS)
    unit = PART_VALUE_UNITS.get(kind)
    value = check_value_text(row, "value", unit) if unit else row.get("value", str, None)
    return model.Part(
        id=row.get("id", str), stage=stage, kind=kind, role=row.get("role", str, choices=tuple(model.PART_ROLES)),
        title=row.get("title", str), value=value, rated=check_value_text(row, "rated", "V"),
        cost=row.get("cost", float, 0.0), pins=parse_pins(row, kind),
    )


def parse_probing(row: Reader) -> dict:
    """A cold check's probes (red first, a pair per leg), how its legs combine, and a lifted leg
    written "PART.pin"."""
    probes = []
    for i, pair in enumerate(row.get("probes", list, [])):
        if not (isinstance(pair, list) and len(pair) == 2 and all(isinstance(n, str) for n in pair)):
            raise row.fail(f"probes[{i}]", "expected a pair of node names, red first: [\"vcc\", \"primary_ground\"]")
        if pair[0] == pair[1]:
            raise row.fail(f"probes[{i}]", "both probes on one node")
        probes.append((pair[0], pair[1]))
    combine = row.get("combine", str, "one", choices=model.COMBINES)
    if combine == "one" and len(probes) > 1:
        raise row.fail("probes", f"{len(probes)} pairs of probes need combine = \"odd_one_out\"")
    lift = row.get("lift", str, None)
    if lift is not None:
        part, dot, pin = lift.partition(".")
        if not dot or not part or not pin:
            raise row.fail("lift", f"'{lift}' must name a part's pin as PART.pin, e.g. \"R5.b\"")
        lift = (part, pin)
    if any(model.LIFTED_LEG in pair for pair in probes) and lift is None:
        raise row.fail("probes", f"a probe on the '{model.LIFTED_LEG}' leg needs lift = \"PART.pin\"")
    return {"probes": tuple(probes), "combine": combine, "lift": lift}


def parse_checks(reader: Reader) -> list[model.Check]:
    checks = []
    for row in reader.items("checks", required=False):
        row.unknown_keys({"id", "title", "instrument", "power", "points", "target", "minutes", "how",
                          "outcomes", "procedure", "probes", "combine", "lift"})
        instrument = row.get("instrument", str, choices=tuple(model.INSTRUMENT_UNITS))
        target = row.get("target", str)
        if target.split(":", 1)[0] not in ("part", "signal") or ":" not in target:
            raise row.fail("target", f"'{target}' must be 'part:ID' or 'signal:NAME'")
        if target.startswith("signal:") and target.split(":", 1)[1] not in model.SIGNALS:
            raise row.fail("target", f"'{target}' names a signal the operating model does not produce")
        outcomes = row.strings("outcomes", ())
        if model.INSTRUMENT_UNITS[instrument] is None and not outcomes:
            raise row.fail("outcomes", f"a check with instrument '{instrument}' must list its outcomes")
        minutes = row.get("minutes", float)
        if minutes < 0:
            raise row.fail("minutes", "must not be negative")
        power = row.get("power", str, choices=model.POWER_STATES)
        points = row.strings("points")
        if power in ("cold", "lamp", "live") and not points:
            raise row.fail("points", "the check touches the unit but names no test point")
        probing = parse_probing(row)
        if target.startswith("part:") and instrument in COLD_INSTRUMENTS and not probing["probes"]:
            raise row.fail("probes", "a cold check of a part says which nodes the probes go on, red first")
        if probing["probes"] and not (target.startswith("part:") and instrument in COLD_INSTRUMENTS):
            raise row.fail("probes", f"only cold checks of a part ({', '.join(COLD_INSTRUMENTS)}) take probes")
        checks.append(model.Check(
            id=row.get("id", str), title=row.get("title", str), instrument=instrument, power=power,
            points=points, target=target, minutes=minutes, how=row.get("how", str), outcomes=outcomes,
            procedure=row.get("procedure", bool, False), **probing,
        ))
    return checks


def parse_collateral(row: Reader) -> tuple[CollateralRule, ...]:
    rules = []
    for item in row.items("collateral", required=False):
        item.unknown_keys({"role", "mode", "p"})
        p = item.get("p", float)
        if not 0 < p <= 1:
            raise item.fail("p", f"probability {p} must be in (0, 1]")
        rules.append(CollateralRule(item.get("role", str, choices=tuple(model.PART_ROLES)),
                                    item.get("mode", str), p, f"{item.file_name}: {item.where}"))
    return tuple(rules)


def _duplicate(reader: Reader, key: str, ids: list[str]) -> None:
    seen = set()
    for i, item_id in enumerate(ids):
        if item_id in seen:
            raise reader.fail(f"{key}[{i}]", f"'{item_id}' appears twice")
        seen.add(item_id)


def parse_stage(path: Path, name: str) -> StageTemplate:
    """Read and check one stage file; ``name`` is its path under stages/ without .toml."""
    file = f"stages/{name}.toml"
    reader = Reader(file, read_toml(path, file))
    reader.unknown_keys({"title", "role", "side", "design", "parts", "test_points", "checks", "faults"})
    role = reader.get("role", str, choices=model.STAGE_ROLES)
    design = reader.table_at("design")
    design.unknown_keys(set(STAGE_FACTS))
    facts = {key: design.get(key, str, choices=choices) for key, choices in STAGE_FACTS.items()
             if key in design.table}
    keys: dict[tuple[str, str], str] = {}
    parts = []
    for row in reader.items("parts", required=False):
        row.unknown_keys({"id", "kind", "role", "title", "value", "rated", "cost", "pins"})
        part = parse_part(row)
        if role not in model.PART_ROLES[part.role]:
            raise row.fail("role", f"a '{part.role}' part belongs in a stage with role "
                                   f"{' or '.join(model.PART_ROLES[part.role])}, not '{role}'")
        parts.append(part)
        keys["parts", part.id] = row.where
    _duplicate(reader, "parts", [p.id for p in parts])
    points = []
    for row in reader.items("test_points", required=False):
        row.unknown_keys({"id", "title"})
        points.append(model.TestPoint(row.get("id", str), "", row.get("title", str)))
        keys["test_points", points[-1].id] = row.where
    _duplicate(reader, "test_points", [t.id for t in points])
    by_id = {p.id: p for p in parts}
    checks = parse_checks(reader)
    for i, check in enumerate(checks):
        keys["checks", check.id] = f"checks[{i}]"
        if check.target_kind == "part" and check.target_id not in by_id:
            raise reader.fail(f"checks[{i}].target", f"check '{check.id}' names part '{check.target_id}', "
                                                     "which is not a part of this stage")
        if check.lift is not None:
            part_id, pin = check.lift
            if part_id not in by_id:
                raise reader.fail(f"checks[{i}].lift", f"'{part_id}' is not a part of this stage")
            if pin not in dict(by_id[part_id].pins):
                raise reader.fail(f"checks[{i}].lift", f"{part_id} has no pin '{pin}' placed "
                                                       f"(its pins: {', '.join(dict(by_id[part_id].pins))})")
    _duplicate(reader, "checks", [c.id for c in checks])
    faults = []
    for row in reader.items("faults", required=False):
        row.unknown_keys({"part", "mode", "title", "weight", "source", "collateral"})
        part_id, mode = row.get("part", str), row.get("mode", str)
        if part_id not in by_id:
            raise row.fail("part", f"'{part_id}' is not a part of this stage")
        allowed = model.KIND_MODES[by_id[part_id].kind]
        if mode not in allowed:
            raise row.fail("mode", f"'{mode}' is not a failure mode of a {by_id[part_id].kind} "
                                   f"(use {', '.join(allowed)})")
        weight = row.get("weight", float)
        if weight <= 0:
            raise row.fail("weight", "must be positive")
        faults.append(FaultTemplate(part_id, mode, row.get("title", str), weight, row.get("source", str),
                                    parse_collateral(row)))
        keys["faults", faults[-1].id] = row.where
    _duplicate(reader, "faults", [f.id for f in faults])
    cold = {c.target_id for c in checks if c.target_kind == "part" and c.instrument in COLD_INSTRUMENTS}
    for i, fault in enumerate(faults):
        if fault.part not in cold:
            raise reader.fail(f"faults[{i}].part", f"part '{fault.part}' can fail but no cold check "
                                                   "in this stage tells its state")
    return StageTemplate(name, file, reader.get("title", str), role,
                         reader.get("side", str, choices=model.SIDES), facts, tuple(parts), tuple(points),
                         tuple(checks), tuple(faults), keys)


def parse_stages(folder: Path) -> dict[str, StageTemplate]:
    """Every stage file under ``folder`` (knowledge/stages), by name ("feedback/tl431_opto")."""
    templates = {}
    for path in sorted(folder.rglob("*.toml")):
        name = path.relative_to(folder).with_suffix("").as_posix()
        templates[name] = parse_stage(path, name)
    return templates
