"""The operating model on the integrated-switch families: a controller with its MOSFET in the same
package, started from its own drain pin, protecting by auto-restart.

The optocoupler family is held to the VIPer22A's figures (ST datasheet, doc ID 12050), the
primary-side one to the bypass-pin figures of Power Integrations' integrated parts ([memory] where
marked). What the bench shows for each fault is the trade primer's (sections 6 and 9).
"""

from __future__ import annotations

import math

import pytest

from fixbench.engine.fault_model import cached_fault_model
from fixbench.engine.operating import operate
from fixbench.engine.part_readings import cold_reading
from fixbench.physics.ratings import parse_ratings

CHARGER_12V = parse_ratings({"mains": "universal", "bench_mains": "230 V", "output": "12 V", "current": "1 A"})
CHARGER_5V = parse_ratings({"mains": "universal", "bench_mains": "230 V", "output": "5 V", "current": "1 A"})


@pytest.fixture(scope="module")
def viper(knowledge):
    return knowledge.family("integrated_opto")


@pytest.fixture(scope="module")
def bypass(knowledge):
    return knowledge.family("integrated_primary_side")


def _run(family, ratings, modes):
    return operate(family, ratings, cached_fault_model(family, ratings).healthy, modes)


def test_the_optocoupler_family_carries_the_viper22a_figures(viper):
    design = viper.design
    # VDDon 14.5 V, VDDoff 8 V [src: ST VIPer22A datasheet, supply section; trade primer section 2]
    assert (design.start_v, design.stop_v) == (14.5, 8.0)
    # hysteresis 6.5 V typical [memory: ST VIPer22A datasheet, VDDhyst 5.8-7.2 V]
    assert 5.8 <= design.start_v - design.stop_v <= 7.2
    # fixed 60 kHz; 730 V drain-source [src: ST VIPer22A datasheet, features and table 2]
    assert design.switching_hz == 60000.0 and design.switch_rating_v == 730.0
    # the drain pin is rated 650-800 V in these parts [trade primer section 9]
    assert 650.0 <= design.switch_rating_v <= 800.0


def test_the_bypass_family_holds_its_pin_a_little_under_six_volts(bypass):
    design = bypass.design
    # BYPASS pin 5.85 V typ, 0.8 V hysteresis, shunt about 6.4 V [memory: Power Integrations
    # LinkSwitch / TinySwitch datasheets, BYPASS pin section]
    assert design.vcc_target_v == pytest.approx(5.85)
    assert design.start_v - design.stop_v == pytest.approx(0.8)
    assert design.vcc_target_v < design.vcc_clamp_v <= 6.8
    # 700 V drain [src: Power Integrations LinkSwitch-TN datasheet, product highlights]
    assert design.switch_rating_v == 700.0


def test_a_healthy_viper_unit_runs_on_its_auxiliary_winding(viper):
    operation = _run(viper, CHARGER_12V, {})
    assert operation.state == "running_regulated"
    # VDD held by the aux winding at the datasheet's test condition, 18 V, inside 9-38 V
    # [src: ST VIPer22A datasheet, features: 9 V to 38 V VDD range; electrical characteristics at VDD = 18 V]
    assert 9.0 <= operation.values["vcc_voltage"] == 18.0 <= 38.0
    assert operation.outcomes["vcc_behaviour"] == {"steady": 1.0}
    assert operation.values["switching_frequency"] == pytest.approx(60000.0)


def test_there_is_no_start_up_resistor_to_check(viper, bypass):
    # started from the drain through an internal current source [src: ST VIPer22A datasheet,
    # high-voltage start-up current source; trade primer section 9]
    for family in (viper, bypass):
        assert not family.parts_with_role("start_resistor")
        assert not family.has_check("start_resistor")
        assert len(family.parts_with_role("integrated_switch")) == 1


def test_a_shorted_integrated_switch_blows_the_fuse_and_reads_near_zero_drain_to_source(viper):
    operation = _run(viper, CHARGER_12V, {"U1": "short", "F1": "open"})
    assert operation.primary_short and operation.state == "no_power"
    assert operation.outcomes["lamp"] == {"no_flash": 1.0}  # the open fuse: the lamp proves nothing
    again = _run(viper, CHARGER_12V, {"U1": "short"})
    assert again.fuse_blows and again.outcomes["lamp"] == {"bright": 1.0}  # [practice; primer section 8]
    # drain-source ~0 [practice; trade primer section 6]
    assert cold_reading(viper, CHARGER_12V, viper.check("ic_drain_source"), {"U1": "short"}) < 1.0
    healthy = cold_reading(viper, CHARGER_12V, viper.check("ic_drain_source"), {})
    assert healthy > 1e3
    # the body diode on diode test: about 0.5 V [practice; trade primer section 2]
    assert 0.4 < cold_reading(viper, CHARGER_12V, viper.check("ic_body_diode"), {}) < 0.7


def test_a_shorted_integrated_switch_is_repaired_by_a_new_ic(viper):
    fault = viper.fault("U1.short")
    assert "replace the IC" in fault.title
    assert {c.part for c in fault.collateral} == {"F1"}


def test_a_dead_integrated_controller_restarts_from_its_drain_without_switching(viper):
    operation = _run(viper, CHARGER_12V, {"U1": "dead"})
    assert operation.state == "hiccup"  # the supply pin restarting, with the switch never on
    assert operation.outcomes["ticking"]["yes"] < 0.1  # silent: no pulses reach the transformer
    assert operation.values["switching_frequency"] == 0.0
    assert operation.values["output_voltage"] == 0.0
    # the start-up source charges VDD to VDDon, the part never switches, VDD sags to VDDoff and
    # the source starts again: a meter averages 8-14.5 V and the reading cycles
    # [src: ST VIPer22A datasheet, start-up and auto-restart; thresholds 8 / 14.5 V]
    assert 8.0 < operation.values["vcc_voltage"] < 14.5
    assert operation.outcomes["vcc_behaviour"] == {"cycling": 1.0}
    # the bulk rail is the rectified peak: 325 V at 230 V less the bridge drops
    # [src: IEC 60038; 1N4007 datasheet, VF <= 1.1 V]
    peak = math.sqrt(2.0) * 230.0
    assert peak - 2.2 <= operation.values["bulk_voltage"] <= peak - 1.2


def test_an_open_loop_makes_the_integrated_part_tick_instead_of_running_high(viper, bypass):
    # auto-restart on an open loop: the unit ticks [src: ST VIPer22A datasheet, overvoltage
    # protection in hiccup mode; trade primer section 9]
    for family, ratings, part in ((viper, CHARGER_12V, "U2"), (bypass, CHARGER_5V, "R5")):
        operation = _run(family, ratings, {part: "open"})
        assert operation.state == "hiccup", family.id
        assert operation.outcomes["vcc_behaviour"] == {"cycling": 1.0}
        assert operation.values["output_voltage"] < ratings.output_v
        assert operation.outcomes["ticking"]["yes"] > 0.5


def test_a_dried_supply_capacitor_ticks_between_the_thresholds(viper, bypass):
    for family, ratings in ((viper, CHARGER_12V), (bypass, CHARGER_5V)):
        operation = _run(family, ratings, {"C2": "dried"})
        assert operation.state == "hiccup", family.id
        design = family.design
        assert design.stop_v < operation.values["vcc_voltage"] < design.start_v
        assert operation.outcomes["vcc_behaviour"] == {"cycling": 1.0}


def test_a_shorted_bypass_capacitor_holds_the_pin_at_zero(bypass):
    operation = _run(bypass, CHARGER_5V, {"C2": "short"})
    assert operation.state == "no_start"
    assert operation.outcomes["vcc_behaviour"] == {"zero": 1.0}
    assert cold_reading(bypass, CHARGER_5V, bypass.check("bypass_pin_short"), {"C2": "short"}) < 1.0
    assert cold_reading(bypass, CHARGER_5V, bypass.check("bypass_pin_short"), {}) > 1e3
