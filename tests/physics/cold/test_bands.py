"""Healthy bands of in-circuit readings from the spread of good parts and the meter's error."""

from __future__ import annotations

import math

import pytest

from fixbench.physics.cold.bands import healthy_band
from fixbench.physics.cold.meter import HANDHELD
from fixbench.physics.cold.part_models import AUX_WINDING_OHM
from fixbench.physics.cold.probing import Probing, reading
from tests.physics.cold import boards


def parallel(a: float, b: float) -> float:
    return a * b / (a + b)


def test_good_upper_fb_resistor_band_is_the_parallel_pair_with_both_tolerances():
    net = boards.primary_side()
    band = healthy_band(net, Probing("ohmmeter", (("aux", "fb"),)))
    relative, absolute = HANDHELD.ohms_accuracy
    # Worst case, first order: both 5 % resistors at their low (high) ends [textbook worst-case
    # tolerance analysis], then the meter's own error.
    low = parallel(47e3 * 0.95, 10e3 * 0.95 + AUX_WINDING_OHM) * (1 - relative) - absolute
    high = parallel(47e3 * 1.05, 10e3 * 1.05 + AUX_WINDING_OHM) * (1 + relative) + absolute
    assert band.nominal == pytest.approx(parallel(47e3, 10e3 + AUX_WINDING_OHM), rel=1e-6)  # [closed form]
    assert band.low == pytest.approx(low, rel=2e-3)  # [closed form; first-order sum of the two shifts]
    assert band.high == pytest.approx(high, rel=2e-3)


def test_every_single_failure_of_the_target_falls_outside_its_band_or_is_listed():
    # The in-circuit reading may hide a failure (a parallel path dominates); the lifted-leg check
    # never does.
    net = boards.primary_side()
    in_circuit = Probing("ohmmeter", (("fb", "pgnd"),))
    lifted = Probing("ohmmeter", (("lifted", "pgnd"),), lift=("R6", "a"))
    for probing in (in_circuit, lifted):
        band = healthy_band(net, probing)
        opened = reading(net.with_mode("R6", "open"), probing)
        assert opened > band.high
    drifted_in_circuit = reading(net.with_mode("R6", "drift"), in_circuit)
    assert drifted_in_circuit > healthy_band(net, in_circuit).high
    assert reading(net.with_mode("R6", "drift"), lifted) == pytest.approx(30e3, rel=1e-6)  # [closed form: 3 x 10k]


def test_reverse_reading_is_over_range_with_no_upper_bound():
    band = healthy_band(boards.primary_side(), Probing("diode_test", (("out", "sec"),)))
    assert math.isinf(band.nominal) and band.high is None


def test_diode_test_band_follows_the_junction_spread():
    band = healthy_band(boards.primary_side(), Probing("diode_test", (("aux", "vcc"),)))
    assert band.low < band.nominal < band.high
    assert band.high - band.low == pytest.approx(2 * 0.06, abs=0.03)  # fast-recovery spread +/-0.06 V [practice]
