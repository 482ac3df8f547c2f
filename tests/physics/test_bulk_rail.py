"""Bulk rail physics against published figures, a worked example, and ngspice simulations."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fixbench.physics.bulk_rail import (
    BRIDGE_DIODE_DROP,
    bulk_minimum,
    conduction_time,
    rectified_peak,
    ripple_simple,
)
from fixbench.physics.semiconductors import RECTIFIER_1N4007_VF_MAX_1A
from tests.support.ngspice import BridgeCase, bridge_deck, parse_result, run_bridge

# --- The crest of the mains and the no-load rail --------------------------------------------------


def test_crest_of_nominal_mains_is_root_two_times_rms():
    assert rectified_peak(230.0, diode_drop=0.0) == pytest.approx(325.3, abs=0.05)  # [src: IEC 60038 230 V nominal; sqrt(2)*Vrms]
    assert rectified_peak(120.0, diode_drop=0.0) == pytest.approx(169.7, abs=0.05)  # [src: IEC 60038 120 V nominal; sqrt(2)*Vrms]
    assert rectified_peak(265.0, diode_drop=0.0) == pytest.approx(375.0, abs=0.5)  # [src: Power Integrations AN-17, 265 VAC -> 375 V DC]


def test_no_load_rail_is_crest_less_two_bridge_diode_drops():
    for v_rms in (100.0, 120.0, 230.0, 240.0, 265.0):
        crest = math.sqrt(2.0) * v_rms
        rail = rectified_peak(v_rms)
        # One conducting pair: two drops, each no more than the 1N4007's VF max at 1 A.
        assert crest - 2 * RECTIFIER_1N4007_VF_MAX_1A <= rail < crest  # [src: textbook full-wave bridge; 1N4007 datasheets VF max 1.1 V at 1 A]
        assert rail == pytest.approx(crest - 2 * BRIDGE_DIODE_DROP)
    assert 323.0 <= rectified_peak(230.0) <= 325.3  # [src: textbook bridge, 230 V -> about 325 V less two drops]
    assert 167.5 <= rectified_peak(120.0) <= 169.7  # [src: textbook bridge, 120 V -> about 170 V less two drops]


# --- AN-17 worked example ---------------------------------------------------------------------------


def test_an17_worked_example_minimum_bulk_voltage():
    # 85 VAC, 60 Hz, 15 W out at eta 0.8 (18.75 W in), 33 uF, tc 3.2 ms. AN-17 takes the crest
    # without diode drops.
    v_min = bulk_minimum(math.sqrt(2.0) * 85.0, 15.0 / 0.8, 60.0, 33e-6, conduction_s=0.0032)
    assert v_min == pytest.approx(93.0, abs=0.5)  # [src: Power Integrations AN-17 worked example, Vmin about 93 V]


def test_conduction_time_follows_the_rising_sine_from_the_minimum():
    # The bridge conducts from where the rising sine passes Vmin to the crest: at Vmin = Vpk/2 the
    # angle is arccos(0.5) = pi/3, a sixth of a cycle: 3.33 ms at 50 Hz.
    assert conduction_time(162.5, 325.0, 50.0) == pytest.approx(1.0 / 300.0)  # [src: textbook capacitor-input filter geometry]
    assert conduction_time(325.0, 325.0, 50.0) == 0.0


def test_simple_ripple_bound_is_current_over_twice_frequency_times_capacitance():
    # 1 A into 100 uF at 50 Hz full-wave: 1 / (2 * 50 * 100e-6) = 100 V.
    assert ripple_simple(1.0, 50.0, 100e-6) == pytest.approx(100.0)  # [src: textbook capacitor-input filter dV = I/(2fC)]


def test_no_load_rail_does_not_sag():
    assert bulk_minimum(325.0, 0.0, 50.0, 10e-6) == 325.0


def test_rail_collapses_to_zero_when_capacitor_cannot_hold_the_load():
    assert bulk_minimum(170.0, 500.0, 60.0, 1e-6, conduction_s=0.0) == 0.0


# --- ngspice reference simulations -----------------------------------------------------------------

# Tolerances, chosen from what the physics leaves out before comparing:
# - peak: a fixed 0.9 V per diode and no source resistance; the real drop depends on the charging
#   current (0.7-1.1 V) and the source resistance drops a further volt or so at full load, so 1 %.
# - minimum: the energy balance is exact for a constant-power load apart from the peak error, so
#   the same 1 %.
# - ripple is the difference of two close numbers, so the peak error of about 1 V shows as several
#   per cent of a 15-30 V ripple: 10 %.
PEAK_TOL = 0.01
MIN_TOL = 0.01
RIPPLE_TOL = 0.10

# The source resistance stands for the fusible resistor or inrush NTC plus wiring; it scales down
# with the rating: about 10 ohm in small chargers, a few ohm at tens of watts [practice].
BRIDGE_CASES = [
    pytest.param(BridgeCase(230, 50, 10e-6, load_ohm=15e3), id="230V50Hz-10uF-15k"),
    pytest.param(BridgeCase(120, 60, 22e-6, load_ohm=4e3), id="120V60Hz-22uF-4k"),
    pytest.param(BridgeCase(230, 50, 2.2e-6, load_w=1.0), id="230V50Hz-2u2F-1W"),
    pytest.param(BridgeCase(230, 50, 10e-6, load_w=5.0), id="230V50Hz-10uF-5W"),
    pytest.param(BridgeCase(120, 60, 22e-6, load_w=7.0), id="120V60Hz-22uF-7W"),
    pytest.param(BridgeCase(100, 60, 4.7e-6, load_w=2.0), id="100V60Hz-4u7F-2W"),
    pytest.param(BridgeCase(240, 50, 100e-6, load_w=2.0), id="240V50Hz-100uF-2W"),
    pytest.param(BridgeCase(85, 60, 33e-6, load_w=18.75, source_ohm=4.7), id="85V60Hz-33uF-18W75-AN17"),
    pytest.param(BridgeCase(100, 50, 47e-6, load_w=20.0, source_ohm=4.7), id="100V50Hz-47uF-20W"),
    pytest.param(BridgeCase(230, 50, 47e-6, load_w=45.0, source_ohm=4.7), id="230V50Hz-47uF-45W"),
    pytest.param(BridgeCase(120, 60, 100e-6, load_w=60.0, source_ohm=2.2), id="120V60Hz-100uF-60W"),
    pytest.param(BridgeCase(240, 50, 100e-6, load_w=60.0, source_ohm=2.2), id="240V50Hz-100uF-60W"),
]


def _load_power(case: BridgeCase, v_avg: float) -> float:
    return case.load_w if case.load_w is not None else v_avg**2 / case.load_ohm


@pytest.mark.parametrize("case", BRIDGE_CASES)
def test_bulk_rail_matches_ngspice_bridge(case, ngspice, tmp_path):
    sim = run_bridge(case, tmp_path)
    if case.load_w is not None:
        # The load was truly constant-power over the measured cycles (see BridgeCase.load_floor_v).
        assert sim.v_min > case.load_floor_v
    power = _load_power(case, sim.v_avg)
    peak = rectified_peak(case.v_rms)
    v_min = bulk_minimum(peak, power, case.mains_hz, case.capacitance)

    assert peak == pytest.approx(sim.v_max, rel=PEAK_TOL)  # [src: ngspice bridge of four 1N4007 models]
    assert v_min == pytest.approx(sim.v_min, rel=MIN_TOL)  # [src: ngspice bridge of four 1N4007 models]
    assert peak - v_min == pytest.approx(sim.ripple, rel=RIPPLE_TOL)  # [src: ngspice bridge of four 1N4007 models]


@pytest.mark.parametrize("case", BRIDGE_CASES)
def test_simple_ripple_bound_over_estimates_ngspice_ripple(case, ngspice, tmp_path):
    sim = run_bridge(case, tmp_path)
    load_current = _load_power(case, sim.v_avg) / sim.v_avg
    assert ripple_simple(load_current, case.mains_hz, case.capacitance) > sim.ripple  # [src: textbook; I/(2fC) ignores conduction time and over-estimates]


@pytest.mark.parametrize(
    ("case", "v_max", "v_min"),
    [
        (BridgeCase(230, 50, 10e-6, load_ohm=15e3), 323.4, 305.1),
        (BridgeCase(120, 60, 22e-6, load_ohm=4e3), 167.2, 154.4),
    ],
    ids=["230V50Hz-10uF-15k", "120V60Hz-22uF-4k"],
)
def test_deck_reproduces_reference_ngspice_run(case, v_max, v_min, ngspice, tmp_path):
    # The deck builder itself is checked against an independent earlier run of the same circuit.
    sim = run_bridge(case, tmp_path)
    assert sim.v_max == pytest.approx(v_max, abs=0.2)  # [src: reference ngspice-39 run, 10 ohm source, 1N4007 models]
    assert sim.v_min == pytest.approx(v_min, abs=0.2)  # [src: reference ngspice-39 run, 10 ohm source, 1N4007 models]


def test_deck_holds_the_bridge_and_the_measurements():
    deck = bridge_deck(BridgeCase(230, 50, 10e-6, load_w=5.0))
    lines = deck.splitlines()
    assert sum(line.startswith(".model D1N4007 D(") for line in lines) == 1
    diodes = [line.split() for line in lines if line.startswith("D")]
    assert [d[0] for d in diodes] == ["D1", "D2", "D3", "D4"]
    assert all(d[3] == "D1N4007" for d in diodes)
    # The four diodes form a bridge: two anodes on the mains nodes into pos, two from 0 into them.
    assert sorted((d[1], d[2]) for d in diodes) == [("0", "a"), ("0", "b"), ("a", "pos"), ("b", "pos")]
    assert "BLOAD pos 0 I = 5 / max(V(pos)" in deck
    assert "meas tran vmax MAX v(pos) from=0.4 to=0.48" in deck
    assert "meas tran vmin MIN v(pos) from=0.4 to=0.48" in deck
    assert deck.rstrip().endswith(".end")


def test_result_parser_reads_the_echoed_line_and_refuses_output_without_it():
    result = parse_result("noise\nFIXBENCH_RESULT 3.234e+02 3.051e+02 314.4\nmore")
    assert (result.v_max, result.v_min, result.v_avg) == (323.4, 305.1, 314.4)
    assert result.ripple == pytest.approx(18.3)
    with pytest.raises(RuntimeError, match="no FIXBENCH_RESULT"):
        parse_result("Error: singular matrix")


def test_bridge_case_needs_exactly_one_load():
    with pytest.raises(ValueError):
        BridgeCase(230, 50, 10e-6)
    with pytest.raises(ValueError):
        BridgeCase(230, 50, 10e-6, load_ohm=1e3, load_w=5.0)


# --- Properties ------------------------------------------------------------------------------------

# The fixed-point iteration stops when a step moves less than 1 uV, so orderings hold to 10 uV.
ITERATION_SLACK = 1e-5

peaks = st.floats(min_value=100.0, max_value=400.0)
powers = st.floats(min_value=0.0, max_value=250.0)
mains = st.sampled_from([47.0, 50.0, 60.0, 63.0])
capacitances = st.floats(min_value=1e-6, max_value=1e-3)


@settings(max_examples=300, deadline=None)
@given(peak=peaks, p1=powers, p2=powers, hz=mains, c=capacitances)
def test_bulk_minimum_does_not_rise_with_load(peak, p1, p2, hz, c):
    light, heavy = sorted((p1, p2))
    assert bulk_minimum(peak, heavy, hz, c) <= bulk_minimum(peak, light, hz, c) + ITERATION_SLACK


@settings(max_examples=300, deadline=None)
@given(peak=peaks, p=powers, hz=mains, c1=capacitances, c2=capacitances)
def test_bulk_minimum_does_not_fall_with_more_capacitance(peak, p, hz, c1, c2):
    small, large = sorted((c1, c2))
    assert bulk_minimum(peak, p, hz, large) >= bulk_minimum(peak, p, hz, small) - ITERATION_SLACK


@settings(max_examples=300, deadline=None)
@given(peak=peaks, p=powers, hz=mains, c=capacitances)
def test_bulk_minimum_stays_between_zero_and_the_peak(peak, p, hz, c):
    assert 0.0 <= bulk_minimum(peak, p, hz, c) <= peak


# Behind a source resistance (inrush thermistor, fusible resistor) the closed form above misses by
# 2-7 % at full load; the stepped model must agree with ngspice there too, including the heavy
# 10-ohm cases. Tolerances: crest 0.5 %, valley 1 %, ripple 5 % (the diode model's forward drop at
# amps differs from the fixed 0.9 V by a few tenths of a volt).
LOADED_CASES = [
    pytest.param(BridgeCase(120, 60, 100e-6, load_w=60.0, source_ohm=10.0), id="120V60Hz-100uF-60W-10ohm"),
    pytest.param(BridgeCase(240, 50, 100e-6, load_w=60.0, source_ohm=10.0), id="240V50Hz-100uF-60W-10ohm"),
    pytest.param(BridgeCase(100, 50, 47e-6, load_w=20.0, source_ohm=10.0), id="100V50Hz-47uF-20W-10ohm"),
    pytest.param(BridgeCase(85, 60, 33e-6, load_w=18.75, source_ohm=4.7), id="85V60Hz-33uF-18W75-4ohm7"),
    pytest.param(BridgeCase(230, 50, 10e-6, load_w=5.0, source_ohm=10.0), id="230V50Hz-10uF-5W-10ohm"),
]


@pytest.mark.parametrize("case", LOADED_CASES)
def test_loaded_rail_behind_a_source_resistance_matches_ngspice(case, ngspice, tmp_path):
    from fixbench.physics.bulk_rail import loaded_rail

    sim = run_bridge(case, tmp_path)
    rail = loaded_rail(case.v_rms, case.mains_hz, case.capacitance, case.load_w, case.source_ohm)
    assert rail.v_max == pytest.approx(sim.v_max, rel=0.005)  # [src: ngspice bridge of four 1N4007 models]
    assert rail.v_min == pytest.approx(sim.v_min, rel=0.01)  # [src: ngspice bridge of four 1N4007 models]
    assert rail.ripple == pytest.approx(sim.ripple, rel=0.05)  # [src: ngspice bridge of four 1N4007 models]


def test_loaded_rail_approaches_the_closed_form_as_the_source_resistance_vanishes():
    from fixbench.physics.bulk_rail import loaded_rail

    rail = loaded_rail(230, 50, 47e-6, 20.0, source_ohm=0.05)
    peak = rectified_peak(230)
    assert rail.v_max == pytest.approx(peak, rel=0.003)
    assert rail.v_min == pytest.approx(bulk_minimum(peak, 20.0, 50, 47e-6), rel=0.005)


@given(st.floats(1.0, 20.0), st.floats(2.0, 60.0))
@settings(max_examples=25, deadline=None)
def test_more_source_resistance_or_load_never_raises_the_valley(resistance, watts):
    from fixbench.physics.bulk_rail import loaded_rail

    base = loaded_rail(230, 50, 47e-6, watts, resistance)
    assert loaded_rail(230, 50, 47e-6, watts, resistance * 1.5).v_min <= base.v_min + 1e-6
    assert loaded_rail(230, 50, 47e-6, watts * 1.5, resistance).v_min <= base.v_min + 1e-6
