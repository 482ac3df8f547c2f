"""Consistency rules for a composed family: every reference resolves, the power flow has no loop,
every part that can fail has a cold check that tells its state. What a single stage file or the
design block can get wrong is refused where it is read (:mod:`stages`, :mod:`design`)."""

from __future__ import annotations

from collections import Counter
from typing import Callable

import networkx as nx

from fixbench.knowledge import model
from fixbench.knowledge.stages import COLD_INSTRUMENTS

# Test points the shared checks probe; every family must name them.
SHARED_POINTS = ("mains_plug", "bulk_plus", "primary_ground")


def _duplicates(ids: list[str]) -> list[str]:
    return [item for item, count in Counter(ids).items() if count > 1]


def validate_family(family: model.Family, fail: Callable[[str, str], Exception]) -> None:
    """Raise ``fail(key, message)`` for the first inconsistency found; keys name the composed
    family's items ("checks[7].points") and ``fail`` says which file they came from."""
    for key, items in (("stages", family.stages), ("parts", family.parts),
                       ("test_points", family.test_points), ("checks", family.checks),
                       ("faults", family.faults)):
        dup = _duplicates([i.id for i in items])
        if dup:
            raise fail(key, f"id '{dup[0]}' appears twice")
    stages = {s.id for s in family.stages}
    for i, link in enumerate(family.links):
        for end, name in ((link.source, "from"), (link.target, "to")):
            if end not in stages:
                raise fail(f"links[{i}].{name}", f"unknown stage '{end}'")
    power = nx.DiGraph((l.source, l.target) for l in family.links if l.kind == "power")
    if not nx.is_directed_acyclic_graph(power):
        cycle = nx.find_cycle(power)
        raise fail("links", f"power links form a loop: {' -> '.join(a for a, _ in cycle)}")
    parts = {p.id: p for p in family.parts}
    for i, part in enumerate(family.parts):
        if part.stage not in stages:
            raise fail(f"parts[{i}].stage", f"unknown stage '{part.stage}'")
    points = {t.id for t in family.test_points}
    for i, point in enumerate(family.test_points):
        if point.stage not in stages:
            raise fail(f"test_points[{i}].stage", f"unknown stage '{point.stage}'")
    for name in SHARED_POINTS:
        if name not in points:
            raise fail("test_points", f"missing the shared test point '{name}'")
    for i, check in enumerate(family.checks):
        for point in check.points:
            if point not in points:
                raise fail(f"checks[{i}].points", f"check '{check.id}' names unknown test point '{point}'")
        if check.target_kind == "part" and check.target_id not in parts:
            raise fail(f"checks[{i}].target", f"check '{check.id}' names unknown part '{check.target_id}'")
        if check.target_kind == "signal" and check.target_id not in model.SIGNALS:
            raise fail(f"checks[{i}].target", f"check '{check.id}' names unknown signal '{check.target_id}'")
        if check.power in ("cold", "lamp", "live") and not check.points:
            raise fail(f"checks[{i}].points", f"check '{check.id}' touches the unit but names no test point")
    for i, fault in enumerate(family.faults):
        for key, part_id, mode in [("", fault.part, fault.mode)] + [
                (f".collateral[{j}]", c.part, c.mode) for j, c in enumerate(fault.collateral)]:
            if part_id not in parts:
                raise fail(f"faults[{i}]{key}.part", f"unknown part '{part_id}'")
            if mode not in model.KIND_MODES[parts[part_id].kind]:
                allowed = ", ".join(model.KIND_MODES[parts[part_id].kind])
                raise fail(f"faults[{i}]{key}.mode", f"'{mode}' is not a failure mode of a "
                           f"{parts[part_id].kind} (use {allowed})")
    _validate_netlist(family, fail)
    cold_targets = {c.target_id for c in family.checks
                    if c.target_kind == "part" and c.instrument in COLD_INSTRUMENTS}
    for i, fault in enumerate(family.faults):
        if fault.part not in cold_targets:
            raise fail(f"faults[{i}].part", f"part '{fault.part}' can fail but no cold check tells its state")


def _validate_netlist(family: model.Family, fail: Callable[[str, str], Exception]) -> None:
    """The cold netlist: every part placed, every probe on a node some pin sits on, and no node that
    only one pin reaches unless a check probes it (a misspelt node name would leave a pin floating)."""
    touches: Counter[str] = Counter()
    for i, part in enumerate(family.parts):
        if not part.pins:
            raise fail(f"parts[{i}].pins", f"part '{part.id}' has no pins: say which nodes it sits on")
        touches.update(node for _, node in part.pins)
    probed = set()
    for i, check in enumerate(family.checks):
        for j, pair in enumerate(check.probes):
            for node in pair:
                if node == model.LIFTED_LEG:
                    continue
                if node not in touches:
                    raise fail(f"checks[{i}].probes[{j}]", f"check '{check.id}' probes node '{node}', which no "
                                                           "part's pin sits on")
                probed.add(node)
    for i, part in enumerate(family.parts):
        for pin, node in part.pins:
            if touches[node] < 2 and node not in probed:
                raise fail(f"parts[{i}].pins.{pin}", f"node '{node}' of part '{part.id}' meets no other pin and "
                                                     "no check probes it: a misspelt node name?")
