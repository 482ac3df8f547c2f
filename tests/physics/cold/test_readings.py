"""In-circuit readings on the families' boards: the examples of issue 10, as a meter shows them.

Each example first reproduces what the issue measured on the textbook model (a healthy part read
out of circuit), then shows what the board in hand reads. Closed forms sit beside the resistive
figures; the junction figures are checked against ngspice in test_against_ngspice.py.
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fixbench.physics.cold.junctions import SCHOTTKY, SILICON_RECTIFIER
from fixbench.physics.cold.meter import HANDHELD
from fixbench.physics.cold.board_part import BoardPart
from fixbench.physics.cold.netlist import ColdNetlist
from fixbench.physics.cold.part_models import AUX_WINDING_OHM, SHORT_OHM, SHORTED_CONTROLLER_OHM
from fixbench.physics.cold.readings import both_ways, diode_test, ohms, ohms_on_range
from tests.physics.cold import boards


def parallel(*ohm: float) -> float:
    return 1.0 / sum(1.0 / r for r in ohm)


def test_good_upper_fb_resistor_reads_it_in_parallel_with_the_lower_one():
    # Issue 10: the expectation of the part out of circuit, 47 kohm taken 20 % low to 5 % high
    # (37.6-49.4 kohm), flagged the good part. On the board the aux winding closes R6 across R5:
    # R5 || (R6 + winding) = 8.25 kohm.
    out_of_circuit = (0.80 * 47e3, 1.05 * 47e3)
    reading = ohms(boards.primary_side(), "aux", "fb")
    assert reading.value == pytest.approx(parallel(47e3, 10e3 + AUX_WINDING_OHM), rel=1e-6)  # [closed form: parallel resistors]
    assert reading.value < out_of_circuit[0]


def test_output_rectifier_reads_near_zero_then_creeps_to_its_drop():
    forward, backward = both_ways(boards.primary_side(), "sec", "out", "diode_test")
    # At the touch the discharged output capacitor through the secondary shorts the diode.
    assert forward.initial < 0.01 and backward.initial < 0.01  # [practice: reads near 0 V at first]
    assert forward.creeps and backward.creeps
    # Settled: the Schottky's own drop at the meter's current one way, the capacitor charged to OL the other.
    assert forward.value == pytest.approx(SCHOTTKY.drop(forward.point.amps), rel=1e-3)  # [closed form: Shockley law at the test current]
    assert math.isinf(backward.value)


def test_vcc_to_ground_conducts_through_the_aux_diode_one_way():
    net = boards.primary_side()
    red_on_vcc, red_on_ground = both_ways(net, "vcc", "pgnd", "ohmmeter")
    assert red_on_ground.value < 0.5 * red_on_vcc.value  # the aux diode and winding conduct one way only
    assert red_on_ground.creeps  # the Vcc capacitor charges from the meter


def test_shorted_aux_diode_or_vcc_capacitor_reads_like_a_shorted_controller():
    net = boards.primary_side()
    shorted = {part: ohms(net.with_mode(part, mode), "vcc", "pgnd").value
               for part, mode in (("D2", "short"), ("C2", "short"), ("U1", "short"))}
    assert shorted["D2"] == pytest.approx(SHORT_OHM + AUX_WINDING_OHM, rel=0.01)  # [closed form: short plus winding]
    assert shorted["C2"] == pytest.approx(SHORT_OHM, rel=0.01)  # [closed form]
    assert shorted["U1"] == pytest.approx(SHORTED_CONTROLLER_OHM, rel=0.01)  # [closed form]
    # All three read a few ohms: in circuit the Vcc check cannot say which part is shorted.
    assert all(value < 10.0 for value in shorted.values())


def test_mosfet_drain_source_on_ohms_conducts_through_the_body_diode_one_way():
    net = boards.primary_side()
    red_on_drain, red_on_source = both_ways(net, "drain", "source", "ohmmeter")
    assert red_on_source.value < 0.6 * red_on_drain.value
    # On the low-voltage ohms range the body diode stays nearly off: both polarities read about the
    # same, the start-up resistor and the controller behind the primary winding.
    low = ohms(net, "source", "drain", low_voltage=True)
    assert low.value > 0.9 * red_on_drain.value and low.value > 1.5 * red_on_source.value


def test_clamp_diode_and_primary_sit_across_the_clamp_resistor_one_way():
    net = boards.primary_side()
    red_on_clamp, red_on_bulk = both_ways(net, "clamp", "bulk", "ohmmeter")
    assert red_on_clamp.value == pytest.approx(100e3, rel=0.02)  # [closed form: the clamp resistor, the diode reversed]
    assert red_on_bulk.value < 0.5 * red_on_clamp.value


def test_shorted_mosfet_reads_from_the_bulk_capacitor_through_primary_and_sense_resistor():
    net = boards.primary_side()
    healthy = ohms(net, "bulk", "pgnd")
    shorted = ohms(net.with_mode("Q1", "short"), "bulk", "pgnd")
    assert shorted.value == pytest.approx(2.0 + SHORT_OHM + 1.8, rel=0.01)  # [closed form: primary + short + sense resistor]
    assert healthy.value > 100e3
    assert shorted.initial < shorted.value  # the bulk capacitor's ESR at the touch


def test_tl431_divider_resistor_reads_half_then_creeps_to_its_value():
    forward = ohms(boards.opto_tl431(), "ref", "sgnd")
    # At the touch the discharged output capacitor puts R5 across R6: 10k || 10k.
    assert forward.initial == pytest.approx(parallel(10e3, 10e3), rel=0.01)  # [closed form; issue 10: reads ~5 kohm]
    assert forward.creeps
    assert forward.value == pytest.approx(10e3, rel=0.02)  # [closed form: R6 once the capacitor has charged]


def test_bridge_diodes_in_circuit_and_an_open_one():
    net = boards.primary_side()
    legs = [("ac1", "bulk"), ("N", "bulk"), ("pgnd", "ac1"), ("pgnd", "N")]
    healthy = [diode_test(net, red, black).value for red, black in legs]
    assert healthy == pytest.approx([SILICON_RECTIFIER.drop(1e-3)] * 4, abs=0.01)  # [closed form: Shockley law near 1 mA]
    opened = [diode_test(net.with_mode("BD1", "open"), red, black).value for red, black in legs]
    assert math.isinf(opened[0])  # the open diode reads OL in circuit: nothing else joins ~ to +
    assert opened[1:] == pytest.approx(healthy[1:])


def test_board_profile_value_replaces_the_generic_one():
    # A board whose start-up resistor is a chain of 2 x 2.2 Mohm instead of the family's 470 kohm.
    net = boards.primary_side().with_value("R1", 4.4e6, count=2)
    lifted = net.with_lifted("R1", "b")
    assert ohms(lifted, "bulk", "R1.b(lifted)").value == pytest.approx(4.4e6, rel=1e-6)  # [closed form: series chain]


def _exhaustive_autorange(net: ColdNetlist, red: str, black: str):
    for source in HANDHELD.ohms_ranges:
        value = ohms_on_range(net, red, black, source).value
        if not math.isinf(value):
            return value, source
    return math.inf, HANDHELD.ohms_ranges[-1]


def test_autorange_at_a_range_full_scale_takes_that_range():
    # Found by the property below: a 400 ohm resistor is the 400 ohm range's full scale; the middle
    # range's solve put it a rounding above (400.00000000000006) and the reading went to 4000 ohm.
    net = ColdNetlist((BoardPart("R0", "resistor", (("a", "a"), ("b", "b")), 400.0),))
    value, source = _exhaustive_autorange(net, "a", "b")
    reading = ohms(net, "a", "b")
    assert reading.source == source  # [closed form: the lowest range whose full scale holds V / I]
    assert reading.value == pytest.approx(400.0, rel=1e-9)


@st.composite
def junction_networks(draw):
    nodes = ["a", "b", "c", "d"]
    parts = []
    for k in range(draw(st.integers(1, 6))):
        x, y = draw(st.sampled_from([(p, q) for p in nodes for q in nodes if p != q]))
        if draw(st.booleans()):
            parts.append(BoardPart(f"R{k}", "resistor", (("a", x), ("b", y)), draw(st.floats(10.0, 5e6))))
        else:
            kind = draw(st.sampled_from(["rectifier_diode", "schottky", "fast_diode"]))
            parts.append(BoardPart(f"D{k}", kind, (("anode", x), ("cathode", y))))
    return ColdNetlist(tuple(parts))


@settings(max_examples=80, deadline=None)
@given(junction_networks())
def test_autorange_from_the_middle_finds_the_lowest_range_that_holds_the_reading(net):
    value, source = _exhaustive_autorange(net, "a", "b")
    reading = ohms(net, "a", "b")
    assert reading.source == source
    assert reading.value == pytest.approx(value, rel=1e-9)
