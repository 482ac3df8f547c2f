"""The operating model against the trade's fault signatures (the project's trade primer, section 6).

Each failed part is run alone through the operating model on the 230 V, 5 V / 2 A charger and its
signals are compared with what the meter shows on such a unit at the bench.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.operating import operate
from fixbench.engine.part_readings import cold_reading

MAINS = 230.0
NOMINAL_OUT = 5.0


@pytest.fixture(scope="module")
def run(family, ratings, model):
    def _run(modes: dict[str, str]):
        return operate(family, ratings, model.healthy, modes)
    return _run


def _band(model, signal: str):
    return model.healthy.numeric[signal]


def test_dried_vcc_capacitor_makes_the_controller_hiccup_between_its_thresholds(run, family):
    operation = run({"C2": "dried"})
    assert operation.state == "hiccup"  # ticking, output blinks [practice; trade primer section 6]
    assert operation.outcomes["vcc_behaviour"] == {"cycling": 1.0}  # [practice; trade primer section 6]
    # Vcc saw-tooths between the stop and start thresholds: 10 V and 16 V for the UC3842
    # [src: onsemi/ST UC3842 datasheet, UVLO thresholds]
    assert operation.hiccup.vcc_low == pytest.approx(10.0)
    assert operation.hiccup.vcc_high == pytest.approx(16.0)
    assert (operation.hiccup.vcc_low, operation.hiccup.vcc_high) == (family.design.stop_v, family.design.start_v)
    assert operation.hiccup.period_s > 0


def test_open_start_resistor_reads_zero_vcc_on_a_full_bulk(run):
    operation = run({"R1": "open"})
    assert operation.state == "no_start"
    assert operation.values["vcc_voltage"] < 0.5  # Vcc ≈ 0 [practice; trade primer section 6]
    assert operation.values["switching_frequency"] == 0.0  # no switching [practice; trade primer section 6]
    peak = math.sqrt(2.0) * MAINS  # 325 V [src: IEC 60038 230 V nominal; peak of a sine = √2·Vrms]
    # less two bridge-diode drops of 0.6-1.1 V each [src: 1N4007 datasheet, VF <= 1.1 V at 1 A]
    assert peak - 2 * 1.1 <= operation.values["bulk_voltage"] <= peak - 2 * 0.6
    assert operation.outcomes["vcc_behaviour"] == {"zero": 1.0}


def test_dead_controller_holds_vcc_at_its_clamp_with_no_gate_drive(run):
    operation = run({"U1": "dead"})
    # Vcc rises and stays at the controller's internal zener clamp, 34 V
    # [src: onsemi UC3842 datasheet, Vcc zener voltage; practice: trade primer section 6]
    assert operation.values["vcc_voltage"] == pytest.approx(34.0)
    assert operation.values["switching_frequency"] == 0.0  # no gate drive [practice; trade primer section 6]
    assert operation.outcomes["vcc_behaviour"] == {"steady": 1.0}
    assert operation.values["output_voltage"] == 0.0


def test_shorted_mosfet_lights_the_lamp_bright_and_would_blow_the_fuse(run, family, ratings):
    operation = run({"Q1": "short"})
    assert operation.outcomes["lamp"] == {"bright": 1.0}  # lamp glows brightly on a short [practice; trade primer section 5]
    assert operation.fuse_blows and operation.primary_short  # dead, fuse blown [practice; trade primer section 6]
    drain_source = cold_reading(family, ratings, family.check("mosfet_drain_source"), {"Q1": "short"})
    assert drain_source < 1.0  # drain-source ~0 [practice; trade primer section 6]


def test_shorted_bridge_diode_lights_the_lamp_bright_and_would_blow_the_fuse(run, family, ratings):
    operation = run({"BD1": "short"})
    assert operation.outcomes["lamp"] == {"bright": 1.0}  # [practice; trade primer section 5]
    assert operation.fuse_blows and operation.primary_short  # dead, fuse blown [practice; trade primer section 6]
    leg = cold_reading(family, ratings, family.check("bridge_diode_test"), {"BD1": "short"})
    assert leg < 0.1  # one bridge leg reads ~0 [practice; trade primer section 6]


def test_blown_fuse_on_a_shorted_primary_leaves_the_lamp_dark(run):
    operation = run({"Q1": "short", "F1": "open"})
    assert operation.outcomes["lamp"] == {"off": 1.0}  # no path through an open fuse [practice]
    assert not operation.fuse_blows


def test_dried_bulk_capacitor_ripples_far_above_the_healthy_limit(run, model):
    operation = run({"C1": "dried"})
    limit = _band(model, "bulk_ripple").high
    # ripple far above the formula [practice; trade primer section 6]
    assert operation.values["bulk_ripple"] > 2.0 * limit
    healthy = run({})
    assert healthy.values["bulk_ripple"] <= limit


def test_dried_output_capacitor_ripples_and_sags_under_load(run, model):
    operation = run({"C3": "dried"})
    # ripple at the switching frequency; output sags under load [practice; trade primer section 6]
    assert operation.values["output_ripple"] > _band(model, "output_ripple").high
    assert operation.values["output_loaded"] < _band(model, "output_loaded").low
    assert _band(model, "output_voltage").contains(operation.values["output_voltage"])


@pytest.mark.parametrize("modes", [{"U2": "open"}, {"U3": "open"}], ids=["opto_open", "tl431_open"])
def test_open_feedback_runs_the_output_well_above_nominal(run, model, modes):
    operation = run(modes)
    assert operation.state == "running_high"
    # output well above nominal at no load [practice; trade primer section 6]
    assert operation.values["output_voltage"] > 1.2 * NOMINAL_OUT
    assert operation.values["output_voltage"] > _band(model, "output_voltage").high


def test_open_opto_led_reads_open_on_diode_test(family, ratings):
    reading = cold_reading(family, ratings, family.check("opto_led_test"), {"U2": "open"})
    assert math.isinf(reading)  # opto LED reads open [practice; trade primer section 6]


def test_shorted_tl431_pulls_the_output_far_below_nominal(run):
    operation = run({"U3": "short"})
    assert operation.state == "running_low"
    # output far below nominal; opto LED driven hard [practice; trade primer section 6]
    assert operation.values["output_voltage"] < 0.5 * NOMINAL_OUT
    assert operation.values["opto_led_voltage"] > 1.0


def test_shorted_output_rectifier_hiccups_with_the_output_near_zero(run):
    operation = run({"D4": "short"})
    assert operation.state == "hiccup"  # ticking [practice; trade primer section 6]
    assert operation.values["output_voltage"] < 0.05 * NOMINAL_OUT  # output ~0 [practice; trade primer section 6]
    assert operation.outcomes["vcc_behaviour"] == {"cycling": 1.0}


def test_broken_cable_shows_the_output_on_the_board_and_none_at_the_plug(run, model):
    operation = run({"W1": "open"})
    # correct voltage on the board, none at the plug [practice; trade primer section 6]
    assert _band(model, "output_voltage").contains(operation.values["output_voltage"])
    assert operation.values["plug_voltage"] == pytest.approx(0.0, abs=0.05)


def test_unit_without_fault_predicts_every_reading_in_its_healthy_band(model):
    assert model.hypotheses[0].id == NO_FAULT
    numeric = 0
    for check_model in model.checks:
        value = check_model.values[0]
        if check_model.healthy is not None:
            # all readings in band [practice; trade primer section 6]
            assert check_model.healthy.contains(value), (check_model.check.id, value)
            numeric += 1
        elif check_model.healthy_outcome is not None:
            predicted = check_model.classes.names[int(np.argmax(check_model.predicted[0]))]
            assert predicted == check_model.healthy_outcome, check_model.check.id
    assert numeric >= 30


def test_unit_without_fault_runs_regulated_with_a_dim_lamp(run):
    operation = run({})
    assert operation.state == "running_regulated"
    assert operation.outcomes["lamp"] == {"dim": 1.0}  # dim on a healthy unit [practice; trade primer section 5]
    assert operation.hiccup is None and not operation.fuse_blows


def test_a_family_whose_stages_the_model_cannot_run_is_refused_by_name():
    from dataclasses import replace as dc_replace

    from fixbench.engine.operating import stage_steps
    from fixbench.knowledge import load_knowledge

    family = load_knowledge().family("pwm_flyback")
    no_bulk = dc_replace(family, stages=tuple(dc_replace(s, role="clamp") if s.role == "bulk" else s
                                              for s in family.stages))
    with pytest.raises(ValueError, match="pwm_flyback.toml: the operating model needs stages"):
        stage_steps(no_bulk)
    assert len(stage_steps(family)) == 6
