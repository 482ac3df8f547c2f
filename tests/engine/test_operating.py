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
    assert operation.outcomes["lamp"] == {"no_flash": 1.0}  # no path through an open fuse: no flash at all [practice; trade primer section 8]
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


# UVLO of the UC3842 class this family names: on 16 V, off 10 V [src: onsemi/ST UC3842 datasheets,
# under-voltage lockout: start threshold 16 V typ, minimum operating voltage after turn-on 10 V typ].
UC3842_START_V, UC3842_STOP_V = 16.0, 10.0


@pytest.mark.parametrize("modes", [{"U3": "short"}, {"R6": "open"}], ids=["tl431_short", "divider_lower_open"])
def test_loop_held_low_lets_vcc_fall_under_the_stop_threshold_and_the_unit_hiccups(run, family, modes):
    operation = run(modes)
    # The auxiliary winding follows the low output, Vcc falls under the stop threshold and the
    # controller restarts from its start-up resistor: Vcc cycles, the unit ticks
    # [src: UC3842 datasheet UVLO; practice: trade primer section 6, "TL431 shorted: output very low, bursts"].
    assert operation.state == "hiccup"
    assert operation.outcomes["vcc_behaviour"] == {"cycling": 1.0}
    assert (operation.hiccup.vcc_low, operation.hiccup.vcc_high) == (UC3842_STOP_V, UC3842_START_V)
    assert (family.design.stop_v, family.design.start_v) == (UC3842_STOP_V, UC3842_START_V)
    assert operation.outcomes["ticking"]["yes"] > 0.5  # energy reaches the output in bursts: heard
    assert operation.values["output_voltage"] < 0.5 * NOMINAL_OUT  # far below nominal [practice; primer 6]
    assert operation.values["opto_led_voltage"] > 1.0  # opto LED driven hard [practice; primer 6]


def test_primary_side_lower_fb_resistor_open_hiccups_too(knowledge):
    """The controller reads the whole auxiliary plateau on its FB pin, takes the output for far too
    high and cuts the duty: the same winding then cannot hold Vcc (primary-side regulation)."""
    from fixbench.physics.healthy import healthy_unit
    from fixbench.physics.ratings import parse_ratings

    primary = knowledge.family("primary_side")
    ratings = parse_ratings({"mains": "230 V", "output": "5 V", "current": "1 A"})
    operation = operate(primary, ratings, healthy_unit(primary.design, ratings), {"R6": "open"})
    assert operation.state == "hiccup"
    assert operation.outcomes["vcc_behaviour"] == {"cycling": 1.0}
    assert operation.hiccup.vcc_low == primary.design.stop_v


def test_shorted_opto_transistor_holds_the_drive_off_while_vcc_cycles(run):
    operation = run({"U2": "short"})
    # COMP held at ground: no gate pulse leaves the controller [src: UC3842 datasheet, block diagram:
    # the error amplifier output, less two diode drops and divided by three, is the current-sense
    # reference]; the controller's running current pulls Vcc from start to stop, again and again.
    assert operation.values["switching_frequency"] == 0.0
    assert operation.values["output_voltage"] == 0.0
    assert operation.outcomes["vcc_behaviour"] == {"cycling": 1.0}
    assert operation.hiccup.vcc_low == UC3842_STOP_V
    assert operation.outcomes["ticking"]["yes"] < 0.1  # no energy into the transformer: silent


@pytest.mark.parametrize(("output", "current"), [("5 V", "2 A"), ("12 V", "1.5 A"), ("19 V", "3.42 A")])
@pytest.mark.parametrize("family_id", ["pwm_flyback", "primary_side"])
def test_vcc_with_the_output_at_four_tenths_follows_the_aux_turns_ratio_under_stop(knowledge, family_id,
                                                                                   output, current):
    from fixbench.physics.healthy import auxiliary_vcc
    from fixbench.physics.ratings import parse_ratings

    design = knowledge.family(family_id).design
    ratings = parse_ratings({"mains": "230 V", "output": output, "current": current})
    vo = ratings.output_v
    # Textbook flyback relation Vaux = (Vo + VD) Na/Ns - VDa, Na/Ns set so Vcc = 13 V at Vo
    # (Schottky 0.5 V, aux diode 0.7 V): at 5 V, Na/Ns = 13.7/5.5 and Vaux(2 V) = 2.5 * 13.7/5.5 - 0.7
    na_ns = (design.vcc_target_v + 0.7) / (vo + 0.5)
    by_hand = (0.4 * vo + 0.5) * na_ns - 0.7
    assert auxiliary_vcc(design, ratings, 0.4 * vo) == pytest.approx(by_hand)
    assert auxiliary_vcc(design, ratings, vo) == pytest.approx(design.vcc_target_v)
    assert auxiliary_vcc(design, ratings, 0.4 * vo) < design.stop_v
    if vo == 5.0:
        assert by_hand == pytest.approx(5.53, abs=0.01)


def test_shorted_aux_diode_leaves_vcc_near_zero_and_the_unit_silent(run):
    operation = run({"D2": "short"})
    # Vcc joined to the aux winding (a few ohms to ground): the start-up current leaves millivolts
    # [practice; Ohm's law, 0.3 mA x a few ohm].
    assert operation.values["vcc_voltage"] < 0.5
    assert operation.outcomes["vcc_behaviour"] == {"zero": 1.0}
    assert operation.state == "no_start"
    assert operation.outcomes["ticking"]["yes"] < 0.1


def test_open_transformer_primary_leaves_the_drain_at_zero(run):
    operation = run({"T1": "open"})
    # No path from bulk + to the drain: a scope reads the source's 0 V, not the bulk voltage [practice].
    assert operation.values["drain_peak"] < 5.0
    assert operation.values["bulk_voltage"] > 300.0


@pytest.mark.parametrize("part", ["Q1", "R2", "R3", "T1"], ids=["switch", "gate_resistor", "sense", "primary"])
def test_open_switch_path_cycles_vcc_with_no_audible_ticking(run, part):
    operation = run({part: "open"})
    # The controller starts and stops on its UVLO thresholds but no energy reaches the transformer,
    # so nothing ticks [src: UC3842 datasheet UVLO; practice].
    assert operation.outcomes["vcc_behaviour"] == {"cycling": 1.0}
    assert operation.outcomes["ticking"]["yes"] < 0.1
    assert operation.values["output_voltage"] == 0.0


def test_open_drive_capacitor_stops_a_self_oscillating_switch_like_an_open_drive_resistor(knowledge):
    from fixbench.physics.healthy import healthy_unit

    family = knowledge.family("self_oscillating")
    ratings = parse_ratings_5v1a()
    healthy = healthy_unit(family.design, ratings)
    cap = operate(family, ratings, healthy, {"C4": "open"})
    resistor = operate(family, ratings, healthy, {"R2": "open"})
    # No feedback-winding drive reaches the base: no oscillation [practice].
    assert cap.state == resistor.state == "no_start"
    assert cap.values["switching_frequency"] == resistor.values["switching_frequency"] == 0.0


@pytest.mark.parametrize("family_id", ["pwm_flyback", "primary_side", "self_oscillating"])
@pytest.mark.parametrize("role", ["clamp_diode", "clamp_resistor"])
def test_open_clamp_destroys_the_switch_in_the_first_cycles(knowledge, family_id, role):
    from fixbench.physics.healthy import healthy_unit

    family = knowledge.family(family_id)
    ratings = parse_ratings_5v1a()
    clamp = family.parts_with_role(role)[0]
    switch = family.parts_with_role("switch")[0]
    operation = operate(family, ratings, healthy_unit(family.design, ratings), {clamp.id: "open"})
    # Nothing takes the leakage spike: the switch avalanches and fails short [src: Power Integrations
    # AN-19, clamp keeps VDS under BVDSS; practice: trade primer section 6, "switch keeps failing"].
    assert operation.damage == ((switch.id, "short"),)
    assert operation.state not in ("running_regulated", "running_high", "running_low", "excessive_ripple")
    assert operation.primary_short and operation.fuse_blows


def parse_ratings_5v1a():
    from fixbench.physics.ratings import parse_ratings

    return parse_ratings({"mains": "230 V", "output": "5 V", "current": "1 A"})


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
    assert operation.outcomes["lamp"] == {"flash": 1.0}  # a flash, then dim or dark on a healthy unit [practice; trade primer section 8]
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
