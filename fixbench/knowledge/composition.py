"""A family made of stage files: its `[[stages]]` entries name a stage file each (``use``), give the
stage its id in this family, and may adjust what that family does its own way.

An entry may rename the stage's parts (``rename = { R2 = "R7" }``: the family numbers them otherwise;
fault ids and check targets follow) and override, by the family's id of the item, a part's title,
value, rating or cost, a test point's title, a check's title, how-to text or minutes, and a fault's
title, weight, source or collateral. Nothing else changes per family: a different circuit is a
different stage file.

The family's items come out in stage order: parts, test points and faults as the stages list them;
checks that need no power or a cold unit first, then the powered ones, each in stage order. The
planner breaks exact ties by that order, so a family may put some checks in an order of its own
(``check_order``): the checks it names take the places they had, in the order it gives.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

from fixbench.knowledge import model
from fixbench.knowledge.reader import KnowledgeError, Reader, check_value_text
from fixbench.knowledge.stages import (
    PART_VALUE_UNITS,
    CollateralRule,
    FaultTemplate,
    StageTemplate,
    parse_collateral,
)

OVERRIDABLE = {
    "parts": {"title", "value", "rated", "cost"},
    "test_points": {"title"},
    "checks": {"title", "how", "minutes"},
    "faults": {"title", "weight", "source", "collateral"},
}
UNPOWERED = ("none", "cold")


@dataclass
class Composition:
    """A family's stages and their items in family order, with where each item was written:
    ``origins["checks[7]"]`` is (the stage file and key, the family file and stage entry)."""

    stages: list[model.Stage] = field(default_factory=list)
    parts: list[model.Part] = field(default_factory=list)
    test_points: list[model.TestPoint] = field(default_factory=list)
    checks: list[model.Check] = field(default_factory=list)
    faults: list[model.Fault] = field(default_factory=list)
    origins: dict[str, tuple[str, str]] = field(default_factory=dict)
    facts: dict[str, str] = field(default_factory=dict)  # design kinds the stages fix
    fact_sources: dict[str, str] = field(default_factory=dict)


def _overrides(entry: Reader, section: str, known: dict[str, str]) -> dict[str, Reader]:
    """The entry's overrides of one section, by the family's item id, each checked."""
    table = entry.table_at(section)
    result = {}
    for item_id in table.table:
        if item_id not in known:
            raise table.fail(item_id, f"the stage file has no {section[:-1].replace('_', ' ')} "
                                      f"'{item_id}' (it has: {', '.join(known)})")
        row = table.table_at(item_id)
        row.unknown_keys(OVERRIDABLE[section])
        result[item_id] = row
    return result


def _renames(entry: Reader, template: StageTemplate) -> dict[str, str]:
    table = entry.table_at("rename")
    own = [p.id for p in template.parts]
    names = {}
    for old in table.table:
        if old not in own:
            raise table.fail(old, f"the stage file has no part '{old}' (it has: {', '.join(own)})")
        names[old] = table.get(old, str)
    return names


def _part(part: model.Part, stage_id: str, new_id: str, over: Reader | None) -> model.Part:
    part = replace(part, id=new_id, stage=stage_id)
    if over is None:
        return part
    unit = PART_VALUE_UNITS.get(part.kind)
    changes = {"title": over.get("title", str, part.title), "cost": over.get("cost", float, part.cost)}
    if "value" in over.table:
        changes["value"] = check_value_text(over, "value", unit) if unit else over.get("value", str)
    if "rated" in over.table:
        changes["rated"] = check_value_text(over, "rated", "V")
    return replace(part, **changes)


def _check(check: model.Check, renames: dict[str, str], over: Reader | None) -> model.Check:
    if check.target_kind == "part" and check.target_id in renames:
        check = replace(check, target=f"part:{renames[check.target_id]}")
    if check.lift is not None and check.lift[0] in renames:
        check = replace(check, lift=(renames[check.lift[0]], check.lift[1]))
    if over is None:
        return check
    minutes = over.get("minutes", float, check.minutes)
    if minutes < 0:
        raise over.fail("minutes", "must not be negative")
    return replace(check, title=over.get("title", str, check.title), how=over.get("how", str, check.how),
                   minutes=minutes)


class _Composer:
    """Adds the family's stage entries one by one to a :class:`Composition`."""

    def __init__(self, family: Reader) -> None:
        self.family, self.out = family, Composition()
        self.unpowered: list[tuple[model.Check, tuple[str, str]]] = []
        self.powered: list[tuple[model.Check, tuple[str, str]]] = []
        self.rules: list[tuple[CollateralRule, ...]] = []  # per fault, resolved once all parts are in
        self.taken: dict[tuple[str, str], str] = {}  # (section, id) -> the stage file that brought it

    def add(self, entry: Reader, templates: dict[str, StageTemplate]) -> None:
        entry.unknown_keys({"id", "use", "title", "rename", *OVERRIDABLE})
        name = entry.get("use", str)
        if name not in templates:
            raise entry.fail("use", f"no stage file 'stages/{name}.toml' (there are: {', '.join(sorted(templates))})")
        template, stage_id, out = templates[name], entry.get("id", str), self.out
        out.stages.append(model.Stage(stage_id, entry.get("title", str, template.title), template.role,
                                      template.side, template.name))
        for key, value in template.design.items():
            if key in out.facts and out.facts[key] != value:
                raise entry.fail("use", f"{template.file} makes the design's {key} '{value}', but "
                                        f"{out.fact_sources[key]} already made it '{out.facts[key]}'")
            out.facts[key], out.fact_sources[key] = value, template.file
        renames = _renames(entry, template)
        ids = {p.id: renames.get(p.id, p.id) for p in template.parts}
        faults = {f"{ids[f.part]}.{f.mode}": f for f in template.faults}
        part_over = _overrides(entry, "parts", {new: new for new in ids.values()})
        point_over = _overrides(entry, "test_points", {t.id: t.id for t in template.test_points})
        check_over = _overrides(entry, "checks", {c.id: c.id for c in template.checks})
        fault_over = _overrides(entry, "faults", {k: k for k in faults})
        for part in template.parts:
            out.origins[f"parts[{len(out.parts)}]"] = self._claim(entry, template, "parts", ids[part.id], part.id)
            out.parts.append(_part(part, stage_id, ids[part.id], part_over.get(ids[part.id])))
        for point in template.test_points:
            origin = self._claim(entry, template, "test_points", point.id, point.id)
            out.origins[f"test_points[{len(out.test_points)}]"] = origin
            title = point_over[point.id].get("title", str) if point.id in point_over else point.title
            out.test_points.append(model.TestPoint(point.id, stage_id, title))
        for check in template.checks:
            origin = self._claim(entry, template, "checks", check.id, check.id)
            group = self.unpowered if check.power in UNPOWERED else self.powered
            group.append((_check(check, ids, check_over.get(check.id)), origin))
        for fault_id, fault in faults.items():
            out.origins[f"faults[{len(out.faults)}]"] = self._claim(entry, template, "faults", fault_id, fault.id)
            over = fault_over.get(fault_id)
            out.faults.append(_fault(fault, fault_id, ids[fault.part], over))
            self.rules.append(parse_collateral(over) if over and "collateral" in over.table else fault.collateral)

    def _claim(self, entry: Reader, template: StageTemplate, section: str, item_id: str,
               own_id: str) -> tuple[str, str]:
        """Take ``item_id`` for this stage entry, refusing an id another stage already brought;
        returns where the item was written and where the family used it."""
        if (section, item_id) in self.taken:
            advice = "; rename one of them (rename = { OLD = \"NEW\" })" if section == "parts" else ""
            raise entry.fail("use", f"{template.file} brings {section[:-1].replace('_', ' ')} '{item_id}', "
                                    f"which {self.taken[section, item_id]} already brings{advice}")
        self.taken[section, item_id] = f"{template.file} ({entry.where})"
        return f"{template.file}: {template.keys[section, own_id]}", f"{self.family.file_name}: {entry.where}"

    def finish(self) -> Composition:
        out = self.out
        for i, (check, origin) in enumerate(self.unpowered + self.powered):
            out.checks.append(check)
            out.origins[f"checks[{i}]"] = origin
        for i, rules in enumerate(self.rules):
            out.faults[i] = replace(out.faults[i], collateral=_resolve(rules, out, self.family.file_name))
        return out


def compose(family: Reader, templates: dict[str, StageTemplate]) -> Composition:
    """The family's stages and items from its `[[stages]]` entries."""
    composer = _Composer(family)
    for entry in family.items("stages"):
        composer.add(entry, templates)
    return composer.finish()


def _fault(fault: FaultTemplate, fault_id: str, part_id: str, over: Reader | None) -> model.Fault:
    if over is None:
        return model.Fault(fault_id, part_id, fault.mode, fault.title, fault.weight, fault.source)
    weight = over.get("weight", float, fault.weight)
    if weight <= 0:
        raise over.fail("weight", "must be positive")
    return model.Fault(fault_id, part_id, fault.mode, over.get("title", str, fault.title), weight,
                       over.get("source", str, fault.source))


def _resolve(rules: tuple[CollateralRule, ...], out: Composition, family_file: str) -> tuple[model.Collateral, ...]:
    """Collateral by role -> by the one part of this family that plays the role."""
    resolved = []
    for rule in rules:
        parts = [p for p in out.parts if p.role == rule.role]
        if len(parts) != 1:
            found = "no part" if not parts else f"{len(parts)} parts ({', '.join(p.id for p in parts)})"
            raise KnowledgeError(f"{rule.place}.role: {found} of family file {family_file} plays the role "
                                 f"'{rule.role}'; give the fault a collateral list of its own in the family file")
        allowed = model.KIND_MODES[parts[0].kind]
        if rule.mode not in allowed:
            raise KnowledgeError(f"{rule.place}.mode: '{rule.mode}' is not a failure mode of {parts[0].id}, "
                                 f"a {parts[0].kind} (use {', '.join(allowed)})")
        resolved.append(model.Collateral(parts[0].id, rule.mode, rule.probability))
    return tuple(resolved)


def apply_check_order(family: Reader, checks: list[model.Check], origins: dict[str, tuple[str, str]]) -> None:
    """Put the checks the family's ``check_order`` names in that order, in the places they took."""
    order = family.strings("check_order", ())
    index = {c.id: i for i, c in enumerate(checks)}
    for i, check_id in enumerate(order):
        if check_id not in index:
            raise family.fail(f"check_order[{i}]", f"'{check_id}' is not a check of this family's stages")
        if check_id in order[:i]:
            raise family.fail(f"check_order[{i}]", f"'{check_id}' appears twice")
    places = sorted(index[c] for c in order)
    moved = [(checks[index[c]], origins[f"checks[{index[c]}]"]) for c in order]
    for place, (check, origin) in zip(places, moved):
        checks[place] = check
        origins[f"checks[{place}]"] = origin
