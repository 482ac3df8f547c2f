"""The active PFC front end in the operating model (fixbench.engine.front_end), against the trade's
bench tell and an ngspice run: the bulk rail at the PFC's set point when it runs, at the rectified
peak when it does not; its faults as the bench shows them.
"""

from __future__ import annotations

import math
import subprocess

import pytest

from fixbench.engine.fault_model import cached_fault_model
from fixbench.engine.operating import operate
from fixbench.engine.part_readings import cold_reading
from fixbench.physics.ratings import parse_ratings
from fixbench.physics.sizing import input_power
from tests.support.ngspice import D1N4007_MODEL, RESULT_TAG, ngspice_binary, parse_result

AT_230 = parse_ratings({"mains": "universal", "bench_mains": "230 V", "output": "19.5 V", "current": "4.62 A"})
AT_120 = parse_ratings({"mains": "universal", "bench_mains": "120 V", "output": "19.5 V", "current": "4.62 A"})
# Two bridge drops at a small current, 0.6-1.1 V each [src: 1N4007 datasheet, VF <= 1.1 V at 1 A]
DROPS = (2 * 0.6, 2 * 1.1)


@pytest.fixture(scope="module")
def family(knowledge):
    return knowledge.family("pwm_pfc")


def _run(family, ratings, modes):
    return operate(family, ratings, cached_fault_model(family, ratings).healthy, modes)


def _peak(v_rms: float) -> float:
    return math.sqrt(2.0) * v_rms  # [src: IEC 60038 nominal mains; peak of a sine = sqrt(2) Vrms]


@pytest.mark.parametrize("ratings", (AT_230, AT_120), ids=("230V", "120V"))
def test_a_running_pfc_holds_the_bulk_near_390_v_at_any_mains(family, ratings):
    operation = _run(family, ratings, {})
    assert operation.state == "running_regulated"
    # 380-400 V DC with the PFC running, whatever the mains [practice; trade primer section 9]
    assert 380.0 <= operation.values["bulk_voltage"] <= 400.0
    band = cached_fault_model(family, ratings).healthy.numeric["bulk_voltage"]
    assert 375.0 <= band.low < band.high <= 410.0
    # and the rectified peak of the highest bench mains (253 V) stays out of that band
    assert _peak(253.0) < band.low  # [src: IEC 60038, 230 V +10 %]
    assert operation.values["pfc_frequency"] == pytest.approx(family.design.pfc_hz)


@pytest.mark.parametrize(("ratings", "v_rms"), ((AT_230, 230.0), (AT_120, 120.0)), ids=("230V", "120V"))
def test_a_dead_pfc_controller_leaves_the_bulk_at_the_rectified_peak(family, ratings, v_rms):
    operation = _run(family, ratings, {"U4": "dead"})
    # the key tell: about 325 V at 230 V, 170 V at 120 V [practice; trade primer section 9]
    assert _peak(v_rms) - DROPS[1] <= operation.values["bulk_voltage"] <= _peak(v_rms) - DROPS[0]
    assert operation.values["pfc_frequency"] == 0.0
    # the flyback behind it still runs with no load; sized for the boosted rail, it sags at rated
    # load on the bare peak [practice]
    assert operation.values["output_voltage"] == pytest.approx(19.5)
    assert operation.values["output_loaded"] < 0.95 * 19.5
    assert operation.state == "running_low"


def test_an_open_pfc_switch_is_driven_but_does_not_boost(family):
    operation = _run(family, AT_230, {"Q2": "open"})
    assert operation.values["bulk_voltage"] < 330.0
    assert operation.values["pfc_frequency"] == pytest.approx(family.design.pfc_hz)


def test_the_pfc_waits_for_the_controllers_vcc(family):
    # the PFC controller runs from the flyback's Vcc rail: no start, no boost [practice]
    operation = _run(family, AT_230, {"R1": "open"})
    assert operation.state == "no_start"
    assert operation.values["bulk_voltage"] < 330.0


@pytest.mark.parametrize("modes", ({"Q2": "short"}, {"D5": "short"}), ids=("pfc_switch", "boost_diode"))
def test_a_shorted_pfc_switch_or_boost_diode_is_a_primary_short(family, modes):
    operation = _run(family, AT_230, modes)
    assert operation.primary_short and operation.fuse_blows
    assert operation.outcomes["lamp"] == {"bright": 1.0}  # [practice; trade primer section 8]


@pytest.mark.parametrize("part", ("L2", "D5"))
def test_an_open_boost_path_leaves_the_bulk_empty(family, part):
    operation = _run(family, AT_230, {part: "open"})
    assert not operation.primary_short
    assert operation.values["bulk_voltage"] == 0.0 and operation.values["bridge_ac"] > 200.0
    assert operation.state == "no_start" and operation.outcomes["vcc_behaviour"] == {"zero": 1.0}


def test_the_boost_inductor_reads_a_fraction_of_an_ohm_cold(family):
    check = family.check("boost_inductor")
    assert cold_reading(family, AT_230, check, {}) < 1.0  # a PFC choke's copper [practice]
    assert cold_reading(family, AT_230, check, {"L2": "open"}) > 1e3


def test_such_adapters_draw_more_than_75_w_from_the_mains():
    # harmonic limits apply above 75 W input: why these adapters have a PFC
    # [src: IEC 61000-3-2, scope; the 75 W threshold: memory]
    assert input_power(AT_230) > 75.0


# --- ngspice: the PFC stopped, the bulk charges through the choke and boost diode -----------------

def _stopped_pfc_deck(v_rms: float, hz: float) -> str:
    period, peak = 1.0 / hz, math.sqrt(2.0) * v_rms
    stop, step = 24 * period, period / 4000.0
    return "\n".join([
        f"* fixbench PFC stopped: {v_rms:g} V bridge, 500 uH choke, boost diode, 100 uF bulk, 100 kohm bleed",
        D1N4007_MODEL,
        f"VMAINS a_src b 0 SIN(0 {peak:.6g} {hz:g})",
        "RSRC a_src a 1.5",
        "D1 a rect D1N4007", "D2 b rect D1N4007", "D3 0 a D1N4007", "D4 0 b D1N4007",
        "RLEAKA a 0 100Meg", "RLEAKB b 0 100Meg",
        "LBOOST rect sw 500u", "RLBOOST sw sw2 0.3",
        "DBOOST sw2 pos D1N4007",
        "CBULK pos 0 100u", "RBLEED pos 0 100k",
        ".control",
        f"tran {step:.6g} {stop:.6g} 0 {step:.6g}",
        f"meas tran vmax MAX v(pos) from={20 * period:.6g} to={stop:.6g}",
        f"meas tran vmin MIN v(pos) from={20 * period:.6g} to={stop:.6g}",
        f"meas tran vavg AVG v(pos) from={20 * period:.6g} to={stop:.6g}",
        f"echo \"{RESULT_TAG} $&vmax $&vmin $&vavg\"",
        "quit", ".endc", ".end", "",
    ])


@pytest.mark.slow
@pytest.mark.parametrize(("ratings", "v_rms", "hz"), ((AT_230, 230.0, 50.0), (AT_120, 120.0, 60.0)),
                         ids=("230V", "120V"))
def test_a_stopped_pfc_reads_the_peak_ngspice_gives(family, ratings, v_rms, hz, tmp_path):
    binary = ngspice_binary()
    if binary is None:
        pytest.skip("ngspice binary not found on PATH: install the Debian package 'ngspice'")
    deck = tmp_path / "pfc_stopped.cir"
    deck.write_text(_stopped_pfc_deck(v_rms, hz))
    done = subprocess.run([binary, "-b", str(deck)], capture_output=True, text=True, timeout=120, cwd=tmp_path)
    simulated = parse_result(done.stdout + "\n" + done.stderr)
    operation = _run(family, ratings, {"U4": "dead"})
    # the choke and boost diode add one more drop to the bridge's; within 1 % of the simulation
    # [src: ngspice, bridge and boost diode of 1N4007 models, 500 uH choke]
    assert operation.values["bulk_voltage"] == pytest.approx(simulated.v_max, rel=0.01)
    assert simulated.v_max < _peak(v_rms)
