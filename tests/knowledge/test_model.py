"""The words the knowledge files may use agree with what the engine reads: every part role the
operating model asks for is one a stage file may give, and no allowed role goes unread."""

from __future__ import annotations

import random

from fixbench.engine.fault_model import build_fault_model
from fixbench.engine.operating import STAGE_STEPS
from fixbench.engine.simulate import SimulatedUnit
from fixbench.knowledge import load_knowledge
from fixbench.knowledge.model import PART_ROLES, STAGE_ROLES, Family
from fixbench.physics.ratings import parse_ratings

RATINGS = ({"mains": "230 V", "output": "5 V", "current": "1 A"},
           {"mains": "universal", "output": "12 V", "current": "2 A"})


def test_part_roles_are_the_roles_the_model_reads(monkeypatch):
    asked: set[str] = set()
    original = Family.parts_with_role

    def recording(self, role):
        asked.add(role)
        return original(self, role)

    monkeypatch.setattr(Family, "parts_with_role", recording)
    for family in load_knowledge().families.values():
        for ratings in RATINGS:
            model = build_fault_model(family, parse_ratings(ratings))
            for hypothesis in model.hypotheses:
                unit = SimulatedUnit(model, dict(hypothesis.modes), random.Random(0))
                unit.live_operation(commit=False)
    assert asked == set(PART_ROLES)


def test_part_roles_sit_in_stages_the_model_knows():
    for role, stage_roles in PART_ROLES.items():
        assert set(stage_roles) <= set(STAGE_ROLES), role


def test_every_step_of_the_operating_model_has_a_stage_role():
    assert set(STAGE_STEPS) <= set(STAGE_ROLES)
