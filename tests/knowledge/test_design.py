"""Design figures: parsed once into a typed, frozen Design with units; the kind of drive, feedback
and output diode comes from the family's stage files, the figures from its [design] table."""

from __future__ import annotations

import dataclasses
import re

import pytest

from fixbench.engine.fault_model import build_fault_model
from fixbench.knowledge import Design, KnowledgeError, load_knowledge
from fixbench.knowledge.design import FIGURES, unit_of
from fixbench.physics import semiconductors as semi
from fixbench.physics.ratings import parse_ratings

RATINGS = parse_ratings({"mains": "230 V", "output": "5 V", "current": "1 A"})


def _fails(copy, message: str) -> None:
    with pytest.raises(KnowledgeError, match=re.escape(message)):
        copy.load()


def test_design_is_frozen_and_typed():
    design = load_knowledge().family("pwm_flyback").design
    assert isinstance(design, Design)
    with pytest.raises(dataclasses.FrozenInstanceError):
        design.start_v = 12.0  # type: ignore[misc]
    # UC3842 under-voltage lockout 16 V on, 10 V off [src: onsemi/ST UC3842 datasheets]
    assert (design.start_v, design.stop_v) == (16.0, 10.0)
    assert isinstance(design.switching_hz, float)


def test_every_figure_names_its_unit():
    assert unit_of("start_v") == "V" and unit_of("switching_hz") == "Hz" and unit_of("source_ohm") == "ohm"
    assert unit_of("switching_tolerance") is None  # a fraction
    for name in FIGURES:
        suffix = name.rsplit("_", 1)[-1]
        if suffix in ("v", "hz", "ohm"):
            assert unit_of(name) == {"v": "V", "hz": "Hz", "ohm": "ohm"}[suffix]


def test_kinds_come_from_the_stage_files():
    knowledge = load_knowledge()
    kinds = {f.id: (f.design.drive, f.design.feedback, f.design.output_diode) for f in knowledge.families.values()}
    assert kinds == {
        "pwm_flyback": ("controller", "opto_tl431", "schottky"),
        "primary_side": ("controller", "primary_side", "schottky"),
        "self_oscillating": ("self_oscillating", "opto_zener", "schottky"),
        "integrated_opto": ("controller", "opto_tl431", "schottky"),
        "integrated_primary_side": ("controller", "primary_side", "schottky"),
        "pwm_pfc": ("controller", "opto_tl431", "schottky"),
    }
    assert knowledge.family("self_oscillating").design.start_v is None


def test_a_kind_written_in_the_family_file_is_refused(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("families/self_oscillating.toml", "[design]\n", '[design]\ndrive = "controller"\n')
    _fails(copy, "self_oscillating.toml: design.drive: 'drive' is fixed by stages/drive/feedback_winding.toml")


def test_a_controller_needs_its_thresholds(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace("families/primary_side.toml", "start_v = 18.0                 # [memory]\n", "")
    _fails(copy, "primary_side.toml: design.start_v: missing (needed for drive = 'controller')")


def test_thresholds_in_the_wrong_order(knowledge_copy):
    copy = knowledge_copy("primary_side")
    copy.replace("families/primary_side.toml", "stop_v = 8.0 ", "stop_v = 20.0 ")
    _fails(copy, "primary_side.toml: design.start_v: thresholds must rise stop_v < start_v < vcc_clamp_v")


def test_a_figure_given_as_text(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("families/self_oscillating.toml", "switching_hz = 100000.0", 'switching_hz = "100 kHz"')
    _fails(copy, "self_oscillating.toml: design.switching_hz: expected float, got str '100 kHz'")


def test_unknown_figure(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("families/self_oscillating.toml", "switching_hz = 100000.0", "switching_khz = 100.0")
    _fails(copy, "self_oscillating.toml: design.switching_khz: unknown key")


def test_fast_silicon_output_stage_reads_as_a_silicon_diode(knowledge_copy):
    copy = knowledge_copy("pwm_flyback")
    copy.replace("families/pwm_flyback.toml", 'use = "output_rectifier/schottky"', 'use = "output_rectifier/fast_silicon"')
    family = copy.load().family("pwm_flyback")
    assert family.design.output_diode == "fast_silicon" and family.part("D4").kind == "fast_diode"
    model = build_fault_model(family, RATINGS)
    healthy = model.checks[model.check_index("output_diode_test")].healthy
    # A silicon junction on the diode test, inside the fast diode's band and above a Schottky's [practice]
    assert semi.DIODE_TEST_FAST[0] <= healthy.low < healthy.nominal < healthy.high <= semi.DIODE_TEST_FAST[1]
    assert healthy.nominal > semi.DIODE_TEST_SCHOTTKY[1]
