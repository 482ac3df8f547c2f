"""The cold netlist in the knowledge files: every part placed on nodes by its stage file, every cold
check of a part probing nodes, a lifted leg named by part and pin; mistakes fail naming file and key."""

from __future__ import annotations

import re

import pytest

from fixbench.knowledge import KnowledgeError, load_knowledge
from fixbench.knowledge.model import KIND_PINS, KIND_REQUIRED_PINS, LIFTED_LEG
from fixbench.knowledge.stages import COLD_INSTRUMENTS

STAGE = "stages/switch/mosfet.toml"


def _fails(copy, message: str) -> None:
    with pytest.raises(KnowledgeError, match=re.escape(message)):
        copy.load()


@pytest.fixture(scope="module")
def families():
    return load_knowledge().families.values()


def test_every_part_sits_on_nodes_with_the_pins_of_its_kind(families):
    for family in families:
        for part in family.parts:
            pins = dict(part.pins)
            assert set(pins) <= set(KIND_PINS[part.kind]), (family.id, part.id)
            assert set(KIND_REQUIRED_PINS.get(part.kind, KIND_PINS[part.kind])) <= set(pins), (family.id, part.id)


def test_every_cold_check_of_a_part_says_where_the_probes_go(families):
    for family in families:
        nodes = {node for part in family.parts for _, node in part.pins}
        for check in family.checks:
            cold_part = check.target_kind == "part" and check.instrument in COLD_INSTRUMENTS
            assert bool(check.probes) == cold_part, (family.id, check.id)
            for pair in check.probes:
                assert all(node in nodes or node == LIFTED_LEG for node in pair), (family.id, check.id)
            if check.lift:
                assert check.lift[1] in dict(family.part(check.lift[0]).pins)


def test_stage_files_share_node_names_so_the_families_join_them(families):
    # The stages meet at nodes named alike in every stage file: the bulk capacitor, the bridge, the
    # start-up resistor, the clamp and the primary winding all reach bulk_plus.
    for family in families:
        # Behind an active PFC the bridge feeds the boost inductor, and the boost diode the bulk.
        on_bulk = {p.role for p in family.parts for _, node in p.pins if node == "bulk_plus"}
        feeds_bulk = "boost_diode" if family.parts_with_role("boost_diode") else "bridge"
        assert {"bulk_capacitor", feeds_bulk, "clamp_resistor", "transformer"} <= on_bulk, family.id
        if feeds_bulk == "boost_diode":
            on_rectified = {p.role for p in family.parts for _, node in p.pins if node == "rectified_plus"}
            assert on_rectified == {"bridge", "boost_inductor"}, family.id


def test_pin_a_kind_does_not_have(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace(STAGE, 'pins = { drain = "switch_node", gate = "gate", source = "source" }',
                 'pins = { drain = "switch_node", gate = "gate", emitter = "source" }')
    _fails(copy, f"{STAGE}: parts[0].pins.emitter: a mosfet has no pin 'emitter' (its pins: drain, gate, source)")


def test_pin_left_unplaced(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace(STAGE, 'pins = { drain = "switch_node", gate = "gate", source = "source" }',
                 'pins = { drain = "switch_node", gate = "gate" }')
    _fails(copy, f"{STAGE}: parts[0].pins.source: missing: say which node the mosfet's 'source' pin sits on")


def test_misspelt_node_is_a_pin_that_meets_nothing(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace(STAGE, 'pins = { a = "source", b = "primary_ground" }', 'pins = { a = "source", b = "primary_gruond" }')
    _fails(copy, "node 'primary_gruond' of part 'R3' meets no other pin and no check probes it: a misspelt node name?")


def test_probe_on_a_node_no_pin_sits_on(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace(STAGE, 'probes = [["source", "primary_ground"]]', 'probes = [["source", "ground"]]')
    _fails(copy, "check 'sense_resistor' probes node 'ground', which no part's pin sits on")


def test_cold_check_of_a_part_without_probes(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace(STAGE, 'probes = [["source", "primary_ground"]]\n', "")
    _fails(copy, f"{STAGE}: checks[3].probes: a cold check of a part says which nodes the probes go on, red first")


def test_several_legs_need_a_way_to_combine_them(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace(STAGE, 'probes = [["source", "primary_ground"]]',
                 'probes = [["source", "primary_ground"], ["primary_ground", "source"]]')
    _fails(copy, f'{STAGE}: checks[3].probes: 2 pairs of probes need combine = "odd_one_out"')


def test_lifted_leg_of_a_pin_the_part_does_not_have(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace("stages/feedback/aux_divider.toml", 'lift = "R5.b"', 'lift = "R5.c"')
    _fails(copy, "stages/feedback/aux_divider.toml: checks[2].lift: R5 has no pin 'c' placed (its pins: a, b)")


def test_probe_on_the_lifted_leg_without_lifting_one(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace("stages/feedback/aux_divider.toml", 'lift = "R5.b"\n', "")
    _fails(copy, "stages/feedback/aux_divider.toml: checks[2].probes: a probe on the 'lifted' leg needs lift = \"PART.pin\"")


def test_renamed_part_keeps_its_lifted_leg(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace("families/primary_side.toml", 'use = "feedback/aux_divider"',
                 'use = "feedback/aux_divider"\nrename = { R5 = "R15" }')
    family = copy.load().family("primary_side")
    assert family.check("fb_divider_upper_lifted").lift == ("R15", "b")
    assert family.check("fb_divider_upper_lifted").target == "part:R15"
