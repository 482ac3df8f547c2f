"""A cold check as made on the board: legs, the odd one out, a lifted leg, and the parts in reach."""

from __future__ import annotations

import math

import pytest

from fixbench.physics.cold.part_models import MODES
from fixbench.physics.cold.probing import Probing, odd_one_out, parts_in_reach, reading, reading_in_reach
from tests.physics.cold import boards

BRIDGE = Probing("diode_test", (("ac1", "bulk"), ("N", "bulk"), ("pgnd", "ac1"), ("pgnd", "N")), "odd_one_out")


def test_odd_one_out_shows_a_short_or_an_open_leg():
    assert odd_one_out((0.55, 0.55, 0.55, 0.55)) == 0.55
    assert odd_one_out((0.55, 0.002, 0.55, 0.56)) == 0.002
    assert math.isinf(odd_one_out((0.55, 0.55, math.inf, 0.56)))


def test_bridge_check_tells_an_open_diode_and_a_shorted_one():
    net = boards.primary_side()
    assert reading(net, BRIDGE) == pytest.approx(0.556, abs=0.005)
    assert math.isinf(reading(net.with_mode("BD1", "open"), BRIDGE))
    assert reading(net.with_mode("BD1", "short"), BRIDGE) < 0.01


def test_lifted_leg_check_reads_the_part_alone_whatever_surrounds_it():
    net = boards.primary_side()
    lifted = Probing("ohmmeter", (("aux", "lifted"),), lift=("R5", "b"))
    assert reading(net, lifted) == pytest.approx(47e3, rel=1e-9)  # [closed form: one resistor]
    assert math.isinf(reading(net.with_mode("R5", "open"), lifted))
    assert parts_in_reach(net, lifted) == {"R5"}


def test_probing_needs_known_instruments_and_pairs():
    with pytest.raises(ValueError, match="instrument"):
        Probing("thermometer", (("a", "b"),))
    with pytest.raises(ValueError, match="one pair"):
        Probing("ohmmeter", (("a", "b"), ("b", "c")))
    with pytest.raises(ValueError, match="lifted"):
        Probing("ohmmeter", (("a", "lifted"),)).legs()


@pytest.mark.parametrize("probing", [
    BRIDGE,
    Probing("ohmmeter", (("aux", "fb"),)),
    Probing("ohmmeter", (("vcc", "pgnd"),)),
    Probing("diode_test", (("sec", "out"),)),
    Probing("esr", (("bulk", "pgnd"),)),
], ids=["bridge", "fb-upper", "vcc", "output-rectifier", "bulk-esr"])
def test_faults_out_of_reach_leave_the_reading_alone(probing):
    # Every single failure and every pair of failures of parts out of reach reads as the good
    # board; the reading on the parts in reach alone is the reading on the whole board.
    net = boards.primary_side()
    reach = parts_in_reach(net, probing)
    healthy = reading(net, probing)
    outside = [(p.id, mode) for p in net.parts if p.id not in reach for mode in MODES[p.kind]]
    for part_id, mode in outside:
        assert reading(net.with_mode(part_id, mode), probing) == pytest.approx(healthy, rel=1e-6)
    for a, b in zip(outside, outside[1:]):
        if a[0] != b[0]:
            assert reading(net.with_modes({a[0]: a[1], b[0]: b[1]}), probing) == pytest.approx(healthy, rel=1e-6)
    for part_id in sorted(reach):
        for mode in MODES[net.part(part_id).kind]:
            faulty = net.with_mode(part_id, mode)
            assert reading_in_reach(faulty, probing, reach) == pytest.approx(reading(faulty, probing), rel=1e-6)
