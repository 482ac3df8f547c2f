"""Output voltage windows and ripple limits."""

from __future__ import annotations

import pytest

from fixbench.physics.outputs import USB2_VBUS, output_window, ripple_limit


def test_usb2_vbus_window():
    assert output_window(5.0) == (4.75, 5.25)  # [src: USB 2.0 specification, table 7-7]
    assert USB2_VBUS == (4.75, 5.25)  # [src: USB 2.0 specification, table 7-7]


@pytest.mark.parametrize("v_out", [9.0, 15.0, 20.0])
def test_usb_pd_fixed_voltages_held_to_five_percent(v_out):
    low, high = output_window(v_out)
    assert (low, high) == (pytest.approx(0.95 * v_out), pytest.approx(1.05 * v_out))  # [src: USB PD fixed voltages 5/9/15/20 V; +/-5 % memory]


def test_other_adapters_held_to_five_percent():
    assert output_window(12.0) == (pytest.approx(11.4), pytest.approx(12.6))  # [practice]
    assert output_window(3.3) == (pytest.approx(3.135), pytest.approx(3.465))  # [practice]


def test_ripple_limit_for_a_5v_charger():
    assert 0.100 <= ripple_limit(5.0) <= 0.200  # [practice: chargers held to 100-200 mV p-p]


def test_ripple_limit_passes_a_unit_meeting_the_reference_design():
    # A healthy 12 V unit at the reference design's 100 mV p-p must not be flagged.
    assert ripple_limit(12.0) >= 0.100  # [src: TI UCC28C4x 12 V/48 W reference design, <= 100 mV p-p]


def test_ripple_limit_grows_with_output_voltage():
    assert ripple_limit(48.0) == pytest.approx(0.48)  # [practice: 1 % of Vo]
    assert ripple_limit(20.0) >= ripple_limit(5.0)
