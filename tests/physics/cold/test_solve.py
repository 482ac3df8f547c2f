"""The cold-network solve against closed forms: series and parallel resistors, the Wheatstone bridge,
a diode behind a Thevenin source (Lambert W), and the block reduction's claim that a part of the board
joined at one node carries none of the meter's current."""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from fixbench.physics.cold.junctions import SILICON_RECTIFIER, THERMAL_VOLTAGE
from fixbench.physics.cold.meter import HANDHELD, MeterSource
from fixbench.physics.cold.board_part import BoardPart
from fixbench.physics.cold.elements import Junction, Resistor
from fixbench.physics.cold.netlist import ColdNetlist
from fixbench.physics.cold.readings import ohms, ohms_on_range
from fixbench.physics.cold.solve import measured_block, operating_point

SOURCE = MeterSource("test source", 3.0, 1e-4, 4e3)  # 3 V behind 30 kohm


def resistor(part_id: str, ohm: float, a: str, b: str, count: int = 1) -> BoardPart:
    return BoardPart(part_id, "resistor", (("a", a), ("b", b)), ohm, count=count)


def board(*parts: BoardPart) -> ColdNetlist:
    return ColdNetlist(tuple(parts))


def parallel(*ohm: float) -> float:
    return 1.0 / sum(1.0 / r for r in ohm)


def test_resistor_alone_reads_its_value_on_every_range():
    net = board(resistor("R1", 4700.0, "a", "b"))
    for source in HANDHELD.ohms_ranges[2:]:
        assert ohms_on_range(net, "a", "b", source).value == pytest.approx(4700.0, rel=1e-9)  # [closed form: V/I of one resistor]


def test_series_and_parallel_combination():
    # R1 + (R2 || (R3 + R4)): 1k + (10k || 15k) = 7k
    net = board(resistor("R1", 1e3, "a", "m"), resistor("R2", 10e3, "m", "b"),
                resistor("R3", 5e3, "m", "n"), resistor("R4", 10e3, "n", "b"))
    assert ohms(net, "a", "b").value == pytest.approx(1e3 + parallel(10e3, 15e3), rel=1e-9)  # [closed form: series/parallel]


def test_wheatstone_bridge_reads_its_delta_star_value():
    # Bridge a-(R1)-c, a-(R2)-d, c-(R3)-b, d-(R4)-b, c-(R5)-d. Closed form of the resistance a-b:
    # R = [R1 R2 (R3 + R4) + R3 R4 (R1 + R2) + R5 (R1 + R3)(R2 + R4)] /
    #     [(R1 + R2)(R3 + R4) + R5 (R1 + R2 + R3 + R4)]  [src: textbook bridge network, by delta-star]
    r1, r2, r3, r4, r5 = 100.0, 220.0, 330.0, 470.0, 680.0
    net = board(resistor("R1", r1, "a", "c"), resistor("R2", r2, "a", "d"), resistor("R3", r3, "c", "b"),
                resistor("R4", r4, "d", "b"), resistor("R5", r5, "c", "d"))
    expected = ((r1 * r2 * (r3 + r4) + r3 * r4 * (r1 + r2) + r5 * (r1 + r3) * (r2 + r4))
                / ((r1 + r2) * (r3 + r4) + r5 * (r1 + r2 + r3 + r4)))
    assert ohms(net, "a", "b").value == pytest.approx(expected, rel=1e-9)  # [closed form: bridge network]


def test_balanced_bridge_carries_nothing_in_its_middle_resistor():
    net = board(resistor("R1", 1e3, "a", "c"), resistor("R2", 2e3, "a", "d"), resistor("R3", 1e3, "c", "b"),
                resistor("R4", 2e3, "d", "b"), resistor("R5", 123.0, "c", "d"))
    assert ohms(net, "a", "b").value == pytest.approx(parallel(2e3, 4e3), rel=1e-9)  # [closed form: balanced bridge]


def test_chain_of_resistors_reads_the_sum_and_an_open_one_opens_it():
    chain = board(resistor("R1", 4.4e6, "bulk", "vcc", count=2))
    assert ohms(chain, "bulk", "vcc").value == pytest.approx(4.4e6, rel=1e-9)  # [closed form: series chain]
    assert math.isinf(ohms(chain.with_mode("R1", "open"), "bulk", "vcc").value)
    # One of two 2.2 Mohm drifted threefold: 6.6 + 2.2 Mohm.
    assert ohms(chain.with_mode("R1", "drift"), "bulk", "vcc").value == pytest.approx(8.8e6, rel=1e-9)  # [closed form]


def lambert_w(x: float) -> float:
    """Principal branch of Lambert's W by Halley's iteration (x > 0)."""
    w = math.log(x) - math.log(math.log(x)) if x > 3.0 else 0.5
    for _ in range(100):
        e = math.exp(w)
        f = w * e - x
        step = f / (e * (w + 1.0) - (w + 2.0) * f / (2.0 * w + 2.0))
        w -= step
        if abs(step) < 1e-15 * max(1.0, abs(w)):
            break
    return w


@pytest.mark.parametrize("open_v, source_ohm", [(3.0, 2400.0), (3.0, 30e3), (1.0, 3e6), (0.3, 300.0)])
def test_diode_behind_a_thevenin_source_matches_lambert_w(open_v, source_ohm):
    # I = (n Vt / R) W( (Is R / n Vt) exp((Voc + Is R) / n Vt) ) - Is
    # [src: Banwell & Jayakumar, "Exact analytical solution for current flow through diode with
    # series resistance", Electronics Letters 36(4), 2000]
    kind = SILICON_RECTIFIER
    nvt = kind.emission * THERMAL_VOLTAGE
    x = kind.saturation * source_ohm / nvt * math.exp((open_v + kind.saturation * source_ohm) / nvt)
    current = nvt / source_ohm * lambert_w(x) - kind.saturation
    source = MeterSource("test", open_v, open_v / source_ohm, 1e9)
    point = operating_point((Junction("D1", "a", "k", kind),), "a", "k", source)
    assert point.amps == pytest.approx(current, rel=1e-6)  # [src: Banwell & Jayakumar 2000, Lambert W]
    assert point.volts == pytest.approx(open_v - current * source_ohm, rel=1e-6, abs=1e-9)


def test_dangling_parts_are_left_out_of_the_solve():
    # A network hanging off one node of the measured path: no current flows into it.
    net = board(resistor("R1", 1e3, "a", "b"), resistor("R2", 5e3, "b", "x"), resistor("R3", 7e3, "x", "y"),
                BoardPart("D9", "rectifier_diode", (("anode", "y"), ("cathode", "b"))))
    block = measured_block(net.elements, "a", "b")
    assert [e.name for e in block] == ["R1"]
    assert ohms(net, "a", "b").value == pytest.approx(1e3, rel=1e-12)  # [textbook: a block joined at one node carries no current]


def test_lifted_leg_reads_the_part_alone():
    # R5 from the aux winding to FB, with R6 from FB to ground and the winding back to R5: in circuit
    # R5 || (R6 + winding); one leg lifted, R5 alone.
    net = board(resistor("R5", 47e3, "aux", "fb"), resistor("R6", 10e3, "fb", "gnd"),
                BoardPart("T1", "transformer", (("primary_a", "p1"), ("primary_b", "p2"), ("aux_a", "aux"),
                                                ("aux_b", "gnd")), 2.0))
    in_circuit = ohms(net, "aux", "fb").value
    assert in_circuit == pytest.approx(parallel(47e3, 10e3 + 1.0), rel=1e-9)  # [closed form: parallel resistors]
    lifted = net.with_lifted("R5", "b")
    assert ohms(lifted, "aux", "R5.b(lifted)").value == pytest.approx(47e3, rel=1e-9)  # [closed form: one resistor]


@st.composite
def resistor_networks(draw):
    nodes = ["a", "b", "c", "d", "e"]
    count = draw(st.integers(2, 8))
    parts = []
    for k in range(count):
        a, b = draw(st.sampled_from([(x, y) for x in nodes for y in nodes if x < y]))
        parts.append(resistor(f"R{k}", draw(st.floats(10.0, 1e6)), a, b))
    return board(*parts)


@settings(max_examples=60, deadline=None)
@given(resistor_networks())
def test_linear_networks_are_reciprocal_and_match_the_laplacian(net):
    # For resistors alone the reading is the effective resistance: the same both ways, and equal to
    # (e_a - e_b)^T L^+ (e_a - e_b) with L the conductance Laplacian [src: Klein & Randic,
    # "Resistance distance", J. Math. Chem. 12 (1993)].
    import numpy as np

    names = sorted(net.nodes | {"a", "b"})
    index = {n: i for i, n in enumerate(names)}
    laplacian = np.zeros((len(names), len(names)))
    for e in net.elements:
        i, j, g = index[e.a], index[e.b], 1.0 / e.ohm
        laplacian[i, i] += g
        laplacian[j, j] += g
        laplacian[i, j] -= g
        laplacian[j, i] -= g
    forward = operating_point(net.elements, "a", "b", SOURCE)
    backward = operating_point(net.elements, "b", "a", SOURCE)
    if forward.amps < 1e-15:
        assert backward.amps < 1e-15
        return
    difference = np.zeros(len(names))
    difference[index["a"]], difference[index["b"]] = 1.0, -1.0
    expected = float(difference @ np.linalg.pinv(laplacian) @ difference)
    measured = forward.volts / forward.amps
    if expected > 1e9:  # a and b not joined: pinv gives a huge figure, the solve an open
        return
    assert measured == pytest.approx(expected, rel=1e-6)  # [src: Klein & Randic 1993, resistance distance]
    assert backward.volts / backward.amps == pytest.approx(measured, rel=1e-9)  # [textbook: reciprocity]


def test_autorange_settles_on_the_lowest_range_that_holds_the_reading():
    net = board(resistor("R1", 8.2e3, "a", "b"))
    reading = ohms(net, "a", "b")
    assert reading.source.full_scale == 40e3  # 8.2k is over the 4k range's full scale
    assert math.isinf(ohms_on_range(net, "a", "b", HANDHELD.ohms_ranges[1]).value)


def test_nothing_between_the_probes_reads_over_range():
    reading = ohms(board(resistor("R1", 1e3, "a", "b")), "a", "c")
    assert math.isinf(reading.value)
    assert reading.point.volts == pytest.approx(HANDHELD.ohms_ranges[-1].open_circuit_v)
    assert [e.name for e in measured_block((Resistor("R", "a", "b", 1.0),), "a", "c")] == []
