"""Families made of stage files: each `[[stages]]` entry names a stage file, renames parts the family
numbers otherwise and overrides titles, values, costs, minutes and fault weights; a broken family
file or a composition that does not hold together fails naming the file and the key."""

from __future__ import annotations

import re

import pytest

from fixbench.engine.fault_model import build_fault_model
from fixbench.knowledge import KnowledgeError, load_knowledge
from fixbench.physics.ratings import parse_ratings

BASE = "self_oscillating"
FAMILY = f"families/{BASE}.toml"
RATINGS = parse_ratings({"mains": "230 V", "output": "5 V", "current": "1 A"})


def _fails(copy, message: str) -> None:
    with pytest.raises(KnowledgeError, match=re.escape(message)):
        copy.load()


def test_overrides_reach_the_family_and_nothing_else():
    knowledge = load_knowledge()
    small, large = knowledge.family("primary_side"), knowledge.family("pwm_flyback")
    # Both use startup/resistor_and_aux_winding; the small charger fits a 10 uF Vcc capacitor.
    assert (small.part("C2").value, large.part("C2").value) == ("10 uF", "22 uF")
    assert (small.fault("C2.dried").weight, large.fault("C2.dried").weight) == (10, 12)
    assert small.check("sense_resistor").how.endswith("the reading is the pair.")
    assert large.check("sense_resistor").how.endswith("null the test leads first.")
    assert knowledge.family("self_oscillating").stage("transformer").title == "Transformer"


def test_collateral_names_parts_by_their_role_in_each_family():
    knowledge = load_knowledge()
    # switch/mosfet: a shorted MOSFET takes the fuse, sense and gate resistors and the controller.
    shorted = knowledge.family("primary_side").fault("Q1.short")
    assert [(c.part, c.mode) for c in shorted.collateral] == [("F1", "open"), ("R3", "open"), ("R2", "open"),
                                                              ("U1", "dead")]
    # rectifier/four_diodes: a shorted diode takes the fusible resistor, which is a resistor there.
    bridge = knowledge.family("self_oscillating").fault("BD1.short")
    assert [(c.part, c.mode) for c in bridge.collateral] == [("F1", "open")]
    assert knowledge.family("self_oscillating").part("F1").kind == "resistor"


def test_check_order_puts_the_named_checks_in_the_places_they_took():
    ids = [c.id for c in load_knowledge().family("pwm_flyback").checks]
    # The powered checks in the order the family file gives, after every cold one.
    assert ids.index("gate_drive") + 1 == ids.index("bridge_ac") < ids.index("drain_peak")
    assert ids.index("output_plug") < ids.index("opto_led_voltage")
    assert max(ids.index(c) for c in ("fuse_resistance", "lead_continuity")) < ids.index("bulk_voltage")


def test_a_family_can_renumber_a_stage_s_parts(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace("families/primary_side.toml", 'use = "switch/mosfet"\n', 'use = "switch/mosfet"\nrename = { R2 = "R7" }\n')
    family = copy.load().family("primary_side")
    assert family.part("R7").role == "gate_resistor" and "R2" not in {p.id for p in family.parts}
    assert family.check("gate_resistor").target == "part:R7"
    assert family.has_check("gate_resistor") and family.fault("R7.open").part == "R7"
    assert ("R7", "open") in [(c.part, c.mode) for c in family.fault("Q1.short").collateral]
    model = build_fault_model(family, RATINGS)
    gate = model.check_index("gate_drive")
    no_gate = [h for h, hyp in enumerate(model.hypotheses) if hyp.modes == (("R7", "open"),)]
    assert model.checks[gate].values[no_gate[0]] == 0.0  # no gate resistor: no drive at the gate


def test_two_stages_bringing_the_same_part_id(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.append("families/primary_side.toml", '\n[[stages]]\nid = "second_clamp"\nuse = "clamp/rcd"\n')
    _fails(copy, "primary_side.toml: stages[12].use: stages/clamp/rcd.toml brings part 'D3', which "
                 "stages/clamp/rcd.toml (stages[6]) already brings; rename one of them")
    copy.append("families/primary_side.toml", 'rename = { D3 = "D5", R4 = "R9" }\n')
    _fails(copy, "primary_side.toml: stages[12].use: stages/clamp/rcd.toml brings test point 'clamp_pins'")


def test_unknown_stage_file(knowledge_copy):
    copy = knowledge_copy(BASE)
    copy.replace(FAMILY, 'use = "bulk/electrolytic"', 'use = "bulk/electrolitic"')
    _fails(copy, f"{BASE}.toml: stages[2].use: no stage file 'stages/bulk/electrolitic.toml' (there are: ")


def test_override_of_a_part_the_stage_does_not_have(knowledge_copy):
    copy = knowledge_copy(BASE)
    copy.replace(FAMILY, "parts.C1 = { cost = 0.40 }", "parts.C9 = { cost = 0.40 }")
    _fails(copy, f"{BASE}.toml: stages[2].parts.C9: the stage file has no part 'C9' (it has: C1)")


def test_override_of_what_a_family_cannot_change(knowledge_copy):
    copy = knowledge_copy(BASE)
    copy.replace(FAMILY, "parts.C1 = { cost = 0.40 }", 'parts.C1 = { cost = 0.40, kind = "film_capacitor" }')
    _fails(copy, f"{BASE}.toml: stages[2].parts.C1.kind: unknown key")


def test_override_value_in_the_wrong_unit(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace("families/primary_side.toml", 'parts.C2 = { value = "10 uF"', 'parts.C2 = { value = "10 V"')
    _fails(copy, "primary_side.toml: stages[3].parts.C2.value: ")


def test_check_on_a_test_point_no_stage_of_the_family_has(knowledge_copy):
    copy = knowledge_copy(BASE)
    copy.replace("stages/input/fusible_resistor.toml", 'points = ["fuse_pins"]', 'points = ["fuse_pinz"]')
    _fails(copy, "stages/input/fusible_resistor.toml: checks[0].points: check 'fuse_resistance' names unknown "
                 f"test point 'fuse_pinz' (in family '{BASE}', {BASE}.toml: stages[0])")


def test_collateral_role_no_part_of_the_family_plays(knowledge_copy):
    copy = knowledge_copy(BASE)
    copy.replace(FAMILY, 'faults."C1.dried" = { weight = 6 }',
                 'faults."C1.dried" = { weight = 6, collateral = [{ role = "inrush_limiter", mode = "open", p = 0.1 }] }')
    _fails(copy, f"{BASE}.toml: stages[2].faults.C1.dried.collateral[0].role: no part of family file "
                 f"{BASE}.toml plays the role 'inrush_limiter'")


def test_collateral_mode_the_part_cannot_suffer(knowledge_copy):
    copy = knowledge_copy(BASE)
    copy.replace("stages/rectifier/four_diodes.toml", '{ role = "fuse", mode = "open", p = 0.95 }',
                 '{ role = "fuse", mode = "dried", p = 0.95 }')
    _fails(copy, "stages/rectifier/four_diodes.toml: faults[0].collateral[0].mode: 'dried' is not a failure "
                 "mode of F1, a resistor")


def test_unknown_stage_in_a_link(knowledge_copy):
    copy = knowledge_copy(BASE)
    copy.replace(FAMILY, '{ from = "mains_input", to = "rectifier", kind = "power" }',
                 '{ from = "mains_input", to = "rectifierr", kind = "power" }')
    _fails(copy, f"{BASE}.toml: links[0].to: unknown stage 'rectifierr'")


def test_power_links_that_form_a_loop(knowledge_copy):
    copy = knowledge_copy(BASE)
    copy.replace(FAMILY, '  { from = "feedback", to = "drive", kind = "control" },\n',
                 '  { from = "feedback", to = "drive", kind = "control" },\n'
                 '  { from = "bulk", to = "mains_input", kind = "power" },\n')
    _fails(copy, f"{BASE}.toml: links: power links form a loop")


def test_unknown_top_level_key(knowledge_copy):
    copy = knowledge_copy(BASE)
    copy.write(FAMILY, 'author = "someone"\n' + copy.text(FAMILY))
    _fails(copy, f"{BASE}.toml: author: unknown key")


def test_key_written_below_the_stages_lands_in_the_last_stage(knowledge_copy):
    # TOML puts a bare key after [[stages]] into that stage: the loader says so instead of losing it.
    copy = knowledge_copy(BASE)
    copy.append(FAMILY, 'check_order = ["output_plug"]\n')
    _fails(copy, f"{BASE}.toml: stages[11].check_order: unknown key")


def test_check_order_naming_a_check_the_family_lacks(knowledge_copy):
    copy = knowledge_copy(BASE)
    copy.replace(FAMILY, 'check_order = ["output_plug", "opto_led_voltage"]',
                 'check_order = ["output_plug", "tl431_reference"]')
    _fails(copy, f"{BASE}.toml: check_order[1]: 'tl431_reference' is not a check of this family's stages")
