"""The supply families in knowledge/families: they load, are made of shared stage files, their graphs
are sound, every failing part can be checked cold, every sizing rule they name exists, the fault
model builds for each, and a fix to a shared stage reaches every family that uses it."""

from __future__ import annotations

import networkx as nx
import pytest

from fixbench.engine import simulate_readings, start_diagnosis
from fixbench.engine.fault_model import build_fault_model
from fixbench.knowledge import load_knowledge
from fixbench.knowledge.graph import stage_graph
from fixbench.knowledge.stages import COLD_INSTRUMENTS
from fixbench.physics.ratings import parse_ratings
from fixbench.physics.sizing import RULES

FAMILIES = ("pwm_flyback", "self_oscillating", "primary_side")
RATINGS = {"mains": "230 V", "output": "5 V", "current": "1 A"}


@pytest.fixture(scope="module")
def knowledge():
    return load_knowledge()


@pytest.fixture(scope="module")
def ratings():
    return parse_ratings(RATINGS)


def test_all_three_families_load(knowledge):
    assert set(FAMILIES) <= set(knowledge.families)
    for family_id in FAMILIES:
        assert knowledge.family(family_id).id == family_id
        assert knowledge.family(family_id).source_file == f"{family_id}.toml"


@pytest.mark.parametrize("family_id", FAMILIES)
def test_stage_graph_is_a_digraph_with_acyclic_power_links(knowledge, family_id):
    family = knowledge.family(family_id)
    graph = stage_graph(family)
    assert isinstance(graph, nx.DiGraph)
    assert set(graph.nodes) == {s.id for s in family.stages}
    power = graph.edge_subgraph([(a, b) for a, b, kind in graph.edges(data="kind") if kind == "power"])
    assert power.number_of_edges() > 0
    assert nx.is_directed_acyclic_graph(power)
    # Power reaches the output lead from the mains input.
    roles = {s.role: s.id for s in family.stages}
    assert nx.has_path(power, roles["input"], roles["lead"])


@pytest.mark.parametrize("family_id", FAMILIES)
def test_every_part_with_a_fault_has_a_cold_check(knowledge, family_id):
    family = knowledge.family(family_id)
    cold = {c.target_id for c in family.checks
            if c.target_kind == "part" and c.power == "cold" and c.instrument in COLD_INSTRUMENTS}
    failing = {f.part for f in family.faults}
    assert failing, "a family with no faults tells nothing"
    assert failing <= cold, f"no cold check for {sorted(failing - cold)}"


@pytest.mark.parametrize("family_id", FAMILIES)
def test_every_sizing_rule_named_exists(knowledge, family_id):
    family = knowledge.family(family_id)
    named = {text.removeprefix("rule:") for p in family.parts for text in (p.value, p.rated)
             if text and text.startswith("rule:")}
    assert named, "the family sizes nothing from the ratings"
    assert named <= set(RULES), f"unknown rules {sorted(named - set(RULES))}"


@pytest.mark.parametrize("family_id", FAMILIES)
def test_fault_model_builds(knowledge, ratings, family_id):
    family = knowledge.family(family_id)
    model = build_fault_model(family, ratings)
    assert model.roots[0] == "no_fault"
    assert set(model.roots[1:]) == {f.id for f in family.faults}
    assert len(model.hypotheses) >= len(model.roots)
    assert len(model.checks) == len(family.checks)
    assert model.prior.sum() == pytest.approx(1.0)
    # A healthy unit runs regulated.
    assert model.operations[0].state == "running_regulated"


@pytest.mark.parametrize("family_id", FAMILIES)
def test_no_two_root_faults_are_indistinguishable(knowledge, ratings, family_id):
    model = build_fault_model(knowledge.family(family_id), ratings)
    assert [g for g in model.groups if len(g) > 1] == []


@pytest.mark.parametrize("family_id", ("self_oscillating", "primary_side"))
def test_each_fault_comes_out_on_top_with_exact_readings(knowledge, ratings, family_id):
    family = knowledge.family(family_id)
    start = start_diagnosis(family, ratings)
    missed = []
    for fault in start.model.roots:
        readings = simulate_readings(family, ratings, fault, seed=1, noise=False)
        state, steps = start, 0
        while state.next_check is not None and steps < 40:
            check = state.next_check.check.id
            state, steps = state.with_reading(check, readings[check]), steps + 1
        if fault not in state.suspects[0].group:
            missed.append((fault, state.suspects[0].fault))
    assert missed == []


def test_self_oscillating_uses_only_signals_its_model_produces(knowledge):
    family = knowledge.family("self_oscillating")
    assert family.design.drive == "self_oscillating"
    signals = {c.target_id for c in family.checks if c.target_kind == "signal"}
    assert not signals & {"vcc_voltage", "vcc_behaviour", "feedback_reference", "aux_voltage"}
    assert {"base_voltage", "switching_frequency", "opto_led_voltage"} <= signals


def test_primary_side_has_no_optocoupler_feedback(knowledge):
    family = knowledge.family("primary_side")
    assert family.design.feedback == "primary_side"
    signals = {c.target_id for c in family.checks if c.target_kind == "signal"}
    assert not signals & {"feedback_reference", "opto_led_voltage"}
    assert not family.parts_with_role("optocoupler") and not family.parts_with_role("shunt_reference")
    divider = family.parts_with_role("feedback_upper") + family.parts_with_role("feedback_lower")
    assert len(divider) == 2
    assert all(family.stage(p.stage).side == "primary" for p in divider)


def test_families_are_made_of_stage_files_they_share(knowledge):
    uses: dict[str, set[str]] = {}
    for family_id in FAMILIES:
        for stage in knowledge.family(family_id).stages:
            assert stage.template, f"{family_id}: stage '{stage.id}' names no stage file"
            uses.setdefault(stage.template, set()).add(family_id)
    # The bulk, clamp, transformer and output filter are written once for all three families.
    for name in ("bulk/electrolytic", "clamp/rcd", "transformer/flyback", "output_filter/electrolytic"):
        assert uses[name] == set(FAMILIES)
    assert uses["switch/mosfet"] == {"pwm_flyback", "primary_side"}


def test_a_fix_to_a_shared_stage_reaches_every_family(knowledge_copy):
    copy = knowledge_copy(*FAMILIES)
    copy.replace("stages/bulk/electrolytic.toml",
                 'how = "ESR meter across the discharged bulk capacitor; compare with the limit shown."',
                 'how = "ESR meter across the discharged bulk capacitor, leads nulled first."')
    loaded = copy.load()
    for family_id in FAMILIES:
        assert loaded.family(family_id).check("bulk_esr").how.endswith("leads nulled first.")


# Fault ids as shops' databases, the demo shop and practice rounds store them ("C2.dried").
FAULT_IDS = {
    "pwm_flyback": "F1.open RT1.open BD1.short BD1.open C1.dried C1.short R1.open C2.dried C2.short D2.open "
                   "D2.short U1.dead U1.short Q1.short Q1.open R2.open R3.open R3.drift D3.open R4.open T1.open "
                   "D4.short D4.open C3.dried C3.short U2.open U2.short U3.open U3.short R5.open R6.open W1.open",
    "primary_side": "F1.open RT1.open BD1.short BD1.open C1.dried C1.short R1.open C2.dried C2.short D2.open "
                    "D2.short U1.dead U1.short Q1.short Q1.open R2.open R3.open R3.drift D3.open R4.open "
                    "T1.open D4.short D4.open C3.dried C3.short R5.open R6.open W1.open",
    "self_oscillating": "F1.open BD1.short BD1.open C1.dried C1.short R1.open R2.open C4.open Q2.short Q2.open "
                        "Q1.short Q1.open R3.open R3.drift D3.open R4.open T1.open D4.short D4.open C3.dried "
                        "C3.short U2.open ZD1.open ZD1.short W1.open",
}


@pytest.mark.parametrize("family_id", FAMILIES)
def test_fault_ids_stay_as_shops_have_stored_them(knowledge, family_id):
    assert [f.id for f in knowledge.family(family_id).faults] == FAULT_IDS[family_id].split()


def test_each_family_numbers_its_own_parts(knowledge):
    # R2 is the gate resistor beside a MOSFET, and the feedback-winding resistor of a ringing choke.
    assert knowledge.family("self_oscillating").part("R2").role == "drive_resistor"
    assert knowledge.family("primary_side").part("R2").role == "gate_resistor"
