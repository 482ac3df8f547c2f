"""Capacitance and ESR ranges in circuit: small-signal readings of the same netlist, against closed
forms of series and parallel impedances."""

from __future__ import annotations

import math

import pytest

from fixbench.physics.cold.ac import (
    CAPACITANCE_METER_HZ,
    ESR_METER_HZ,
    capacitance_reading,
    esr_reading,
    impedance,
)
from fixbench.physics.cold.board_part import BoardPart
from fixbench.physics.cold.netlist import ColdNetlist
from fixbench.physics.cold.part_models import DRIED_CAPACITANCE, DRIED_ESR, SHORT_OHM
from tests.physics.cold import boards


def capacitor(part_id: str, farad: float, esr: float, plus: str, minus: str) -> BoardPart:
    return BoardPart(part_id, "electrolytic", (("plus", plus), ("minus", minus)), farad, extra=(("esr_ohm", esr),))


def test_capacitor_with_esr_matches_the_series_impedance():
    net = ColdNetlist((capacitor("C1", 22e-6, 1.4, "p", "n"),))
    omega = 2 * math.pi * ESR_METER_HZ
    assert impedance(net, "p", "n", ESR_METER_HZ) == pytest.approx(complex(1.4, -1 / (omega * 22e-6)))  # [closed form: Z = ESR + 1/(j w C)]
    assert esr_reading(net, "p", "n") == pytest.approx(1.4)  # [closed form]


def test_capacitance_reads_the_capacitor_whatever_its_esr_and_a_high_resistor_across_it():
    c, esr = 10e-6, 8.0
    alone = ColdNetlist((capacitor("C2", c, esr, "p", "n"),))
    assert capacitance_reading(alone, "p", "n") == pytest.approx(c, rel=1e-9)  # [closed form: series C of ESR + 1/(j w C)]
    # A resistor R across it: Z = R || (ESR + 1/(j w C)); its series capacitance moves by about
    # (1/(w C R))^2 [closed form], a few parts per million for 150 kohm.
    r = 150e3
    shunted = ColdNetlist((capacitor("C2", c, esr, "p", "n"), BoardPart("R1", "resistor", (("a", "p"), ("b", "n")), r)))
    omega = 2 * math.pi * CAPACITANCE_METER_HZ
    z = 1 / (1 / r + 1 / complex(esr, -1 / (omega * c)))
    assert capacitance_reading(shunted, "p", "n") == pytest.approx(-1 / (omega * z.imag), rel=1e-9)  # [closed form]
    assert capacitance_reading(shunted, "p", "n") == pytest.approx(c, rel=1e-3)


def test_parallel_capacitors_add():
    net = ColdNetlist((capacitor("C1", 470e-6, 0.1, "p", "n"), capacitor("C2", 220e-6, 0.2, "p", "n")))
    assert capacitance_reading(net, "p", "n") == pytest.approx(690e-6, rel=1e-2)  # [closed form: parallel capacitances add]


def test_in_circuit_capacitors_on_the_board_read_their_own_values():
    net = boards.primary_side()
    assert capacitance_reading(net, "bulk", "pgnd") == pytest.approx(22e-6, rel=0.01)  # the primary winding and the rest are open to it
    assert capacitance_reading(net, "out", "sgnd") == pytest.approx(680e-6, rel=0.01)
    assert esr_reading(net, "vcc", "pgnd") == pytest.approx(8.0, rel=0.01)
    # The secondary's inductance keeps the output rectifier's path out of the ESR reading.
    assert esr_reading(net, "out", "sgnd") == pytest.approx(0.17, rel=0.02)


def test_dried_and_shorted_capacitors():
    net = boards.primary_side()
    dried = net.with_mode("C1", "dried")
    assert capacitance_reading(dried, "bulk", "pgnd") == pytest.approx(22e-6 * DRIED_CAPACITANCE, rel=0.01)
    assert esr_reading(dried, "bulk", "pgnd") == pytest.approx(1.4 * DRIED_ESR, rel=0.01)
    shorted = net.with_mode("C1", "short")
    assert esr_reading(shorted, "bulk", "pgnd") == pytest.approx(SHORT_OHM, rel=0.01)
    assert capacitance_reading(shorted, "bulk", "pgnd") < 1e-9


def test_nothing_between_the_probes():
    net = ColdNetlist((capacitor("C1", 1e-6, 1.0, "p", "n"),))
    assert math.isinf(esr_reading(net, "p", "x"))
    assert capacitance_reading(net, "p", "x") == 0.0


def test_a_winding_across_the_capacitor_stops_the_capacitance_range():
    # A shorted aux diode puts the winding (about an ohm) across the Vcc capacitor: the impedance is
    # mostly resistive and the meter's charge never ramps [practice].
    net = boards.primary_side()
    assert capacitance_reading(net, "vcc", "pgnd") == pytest.approx(10e-6, rel=1e-3)
    assert capacitance_reading(net.with_mode("D2", "short"), "vcc", "pgnd") == 0.0
