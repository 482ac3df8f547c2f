"""The supply families in knowledge/families: they load, their graphs are sound, every failing part
can be checked cold, every sizing rule they name exists, the fault model builds for each, and a
broken family file fails with a message that names the file and the key."""

from __future__ import annotations

import re
import shutil
import tomllib
from pathlib import Path

import networkx as nx
import pytest

from fixbench.engine import simulate_readings, start_diagnosis
from fixbench.engine.fault_model import build_fault_model
from fixbench.knowledge import KnowledgeError, load_knowledge, load_knowledge_from
from fixbench.knowledge.graph import stage_graph
from fixbench.knowledge.locate import knowledge_dir
from fixbench.knowledge.validation import COLD_INSTRUMENTS
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
    assert family.design["drive"] == "self_oscillating"
    signals = {c.target_id for c in family.checks if c.target_kind == "signal"}
    assert not signals & {"vcc_voltage", "vcc_behaviour", "feedback_reference", "aux_voltage"}
    assert {"base_voltage", "switching_frequency", "opto_led_voltage"} <= signals


def test_primary_side_has_no_optocoupler_feedback(knowledge):
    family = knowledge.family("primary_side")
    assert family.design["feedback"] == "primary_side"
    signals = {c.target_id for c in family.checks if c.target_kind == "signal"}
    assert not signals & {"feedback_reference", "opto_led_voltage"}
    assert not family.parts_with_role("optocoupler") and not family.parts_with_role("shunt_reference")
    divider = family.parts_with_role("feedback_upper") + family.parts_with_role("feedback_lower")
    assert len(divider) == 2
    assert all(family.stage(p.stage).side == "primary" for p in divider)


# ---------------------------------------------------------------- broken files

BASE = "self_oscillating"


def _base_text() -> str:
    return (knowledge_dir() / "families" / f"{BASE}.toml").read_text(encoding="utf-8")


def _index_of(section: str, key: str, value: str) -> int:
    rows = tomllib.loads(_base_text())[section]
    return next(i for i, row in enumerate(rows) if row.get(key) == value)


def _load_broken(tmp_path: Path, text: str):
    (tmp_path / "families").mkdir()
    shutil.copy(knowledge_dir() / "shared_checks.toml", tmp_path / "shared_checks.toml")
    (tmp_path / "families" / f"{BASE}.toml").write_text(text, encoding="utf-8")
    return load_knowledge_from(tmp_path)


def _replace_once(text: str, old: str, new: str) -> str:
    assert text.count(old) == 1, f"the base file no longer holds exactly one {old!r}"
    return text.replace(old, new)


def test_unbroken_copy_loads(tmp_path):
    kb = _load_broken(tmp_path, _base_text())
    assert list(kb.families) == [BASE]


def test_unknown_stage_in_a_link(tmp_path):
    text = _replace_once(_base_text(), 'from = "mains_input"\nto = "rectifier"',
                         'from = "mains_input"\nto = "rectifierr"')
    with pytest.raises(KnowledgeError, match=re.escape(
            f"{BASE}.toml: links[0].to: unknown stage 'rectifierr'")):
        _load_broken(tmp_path, text)


def test_check_on_an_unknown_test_point(tmp_path):
    i = _index_of("checks", "id", "fuse_resistance")
    text = _replace_once(_base_text(), 'points = ["fuse_pins"]', 'points = ["fuse_pinz"]')
    with pytest.raises(KnowledgeError, match=re.escape(
            f"{BASE}.toml: checks[{i}].points: check 'fuse_resistance' names unknown test point 'fuse_pinz'")):
        _load_broken(tmp_path, text)


def test_part_value_without_a_unit(tmp_path):
    i = _index_of("parts", "id", "R2")
    text = _replace_once(_base_text(), 'value = "100 ohm"', 'value = "22"')
    with pytest.raises(KnowledgeError, match=re.escape(f"{BASE}.toml: parts[{i}].value: ")) as err:
        _load_broken(tmp_path, text)
    assert "'22'" in str(err.value) and "unit" in str(err.value)


def test_part_value_in_the_wrong_unit(tmp_path):
    i = _index_of("parts", "id", "R2")
    text = _replace_once(_base_text(), 'value = "100 ohm"', 'value = "100 uF"')
    with pytest.raises(KnowledgeError, match=re.escape(f"{BASE}.toml: parts[{i}].value: ")) as err:
        _load_broken(tmp_path, text)
    assert "farads" in str(err.value)


def test_power_links_that_form_a_loop(tmp_path):
    text = _base_text() + '\n[[links]]\nfrom = "bulk"\nto = "mains_input"\nkind = "power"\n'
    with pytest.raises(KnowledgeError, match=re.escape(f"{BASE}.toml: links: power links form a loop")):
        _load_broken(tmp_path, text)


def test_unknown_key_in_a_part(tmp_path):
    i = _index_of("parts", "id", "R1")
    text = _replace_once(_base_text(), 'role = "base_resistor"\n', 'role = "base_resistor"\ncolour = "red"\n')
    with pytest.raises(KnowledgeError, match=re.escape(f"{BASE}.toml: parts[{i}].colour: unknown key")):
        _load_broken(tmp_path, text)


def test_unknown_top_level_key(tmp_path):
    text = 'author = "someone"\n' + _base_text()
    with pytest.raises(KnowledgeError, match=re.escape(f"{BASE}.toml: author: unknown key")):
        _load_broken(tmp_path, text)


def test_failing_part_without_a_cold_check(tmp_path):
    i = _index_of("faults", "id", "ZD1.open")
    text = _replace_once(_base_text(), 'target = "part:ZD1"', 'target = "part:U2"')
    with pytest.raises(KnowledgeError, match=re.escape(
            f"{BASE}.toml: faults[{i}].part: part 'ZD1' can fail but no cold check tells its state")):
        _load_broken(tmp_path, text)
