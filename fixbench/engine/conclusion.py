"""The end of a diagnosis: what to replace, what to test before powering up again, and the readings
a repaired unit must give."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from fixbench.engine.fault_model import FaultModel
from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.planner import CLEAR_ROOT, group_chances
from fixbench.engine.repair_order import MINUTES_PER_MONEY, REPLACE_MINUTES, RepairStep, order_by_ratio
from fixbench.physics.expectation import Expectation
from fixbench.physics.replacement import replacement_spec

REPLACE_ABOVE = 0.5  # a collateral part this likely failed is replaced, not just tested
TEST_ABOVE = 0.03  # a collateral part at least this likely failed is tested before power-up
# What a repaired unit is proved with: these signals, read live after a series-lamp power-up.
VERIFY_SIGNALS = ("lamp", "bulk_voltage", "vcc_voltage", "output_voltage", "output_loaded",
                  "output_ripple", "plug_voltage")


@dataclass(frozen=True)
class PartAction:
    part: str
    title: str
    mode: str
    probability: float
    cost: float
    label: str = ""  # the part as the board names it (its designator where a board profile gives one)
    marking: str = ""  # what the board's part is marked with, where the profile says
    spec: str = ""  # what a new part must be (physics.replacement): value, ratings, type, package


@dataclass(frozen=True)
class VerifyStep:
    check: str
    title: str
    expected: Expectation | None
    outcome: str | None


@dataclass(frozen=True)
class Conclusion:
    faults: tuple[str, ...]  # the root fault, or a group no check can tell apart
    probability: float
    certain: bool  # the posterior reached the threshold (else: no check was worth its cost)
    no_fault: bool
    replace: tuple[PartAction, ...]
    test_before_power: tuple[PartAction, ...]
    verify: tuple[VerifyStep, ...]
    repair_order: tuple[RepairStep, ...]  # when not certain: try these in this order


def conclude(model: FaultModel, posterior: np.ndarray) -> Conclusion:
    family = model.family
    group, chance = group_chances(model, posterior)[0]
    members = np.isin(model.root_of, [model.roots.index(r) for r in group])
    within = posterior * members
    within = within / within.sum()
    part_chance: dict[tuple[str, str], float] = {}
    for h, p in zip(model.hypotheses, within):
        for part_mode in h.modes:
            part_chance[part_mode] = part_chance.get(part_mode, 0.0) + float(p)
    roots = {(family.fault(r).part, family.fault(r).mode) for r in group if r != NO_FAULT}

    def action(part_id: str, mode: str, p: float) -> PartAction:
        part = family.part(part_id)
        return PartAction(part_id, part.title, mode, p, part.cost, part.label, part.marking,
                          replacement_spec(part, model.ratings, family.design).text)

    replace = [action(pid, mode, p) for (pid, mode), p in part_chance.items()
               if (pid, mode) in roots or p >= REPLACE_ABOVE]
    test = [action(pid, mode, p) for (pid, mode), p in part_chance.items()
            if (pid, mode) not in roots and TEST_ABOVE <= p < REPLACE_ABOVE]
    # A collateral part the knowledge base names as often damaged, but whose set was too rare to
    # keep as a hypothesis, is still tested before power-up.
    listed = {a.part for a in replace + test}
    for root in group:
        if root == NO_FAULT:
            continue
        for item in family.fault(root).collateral:
            if item.part not in listed and (item.part, item.mode) not in part_chance and item.probability >= 0.2:
                test.append(action(item.part, item.mode, part_chance.get((item.part, item.mode), 0.0)))
                listed.add(item.part)
    verify = []
    for check_model in model.checks:
        check = check_model.check
        if check.target_kind == "signal" and check.target_id in VERIFY_SIGNALS and check.power in ("live", "lamp"):
            verify.append(VerifyStep(check.id, check.title, check_model.healthy, check_model.healthy_outcome))
    verify.sort(key=lambda v: (v.check != "series_lamp", VERIFY_SIGNALS.index(model.family.check(v.check).target_id)))
    roots_p = np.bincount(model.root_of, weights=posterior, minlength=len(model.roots))
    steps = [RepairStep(r, family.fault(r).part, float(roots_p[i]),
                        REPLACE_MINUTES + MINUTES_PER_MONEY * family.part(family.fault(r).part).cost)
             for i, r in enumerate(model.roots) if r != NO_FAULT and roots_p[i] >= 0.02]
    return Conclusion(
        faults=group, probability=chance, certain=chance >= CLEAR_ROOT, no_fault=NO_FAULT in group,
        replace=tuple(sorted(replace, key=lambda a: -a.probability)),
        test_before_power=tuple(sorted(test, key=lambda a: -a.probability)),
        verify=tuple(verify), repair_order=tuple(order_by_ratio(steps)) if chance < CLEAR_ROOT else (),
    )
