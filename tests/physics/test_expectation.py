"""Expectation bands: never inverted, membership, and how they read to a person."""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from fixbench.physics.expectation import Expectation, around

finite = st.floats(min_value=-1e6, max_value=1e6, allow_nan=False)
bound = st.one_of(st.none(), finite)


def test_around_gives_a_symmetric_band():
    band = around(4700.0, 0.05, "ohm")
    assert (band.low, band.high) == (pytest.approx(4465.0), pytest.approx(4935.0))
    assert band.contains(4700.0) and band.contains(4465.0) and band.contains(4935.0)
    assert not band.contains(4400.0) and not band.contains(5000.0)


def test_constructing_an_inverted_band_raises():
    with pytest.raises(ValueError, match="inverted"):
        Expectation(nominal=None, low=10.0, high=5.0, unit="V")


def test_negative_tolerance_is_refused_rather_than_inverting():
    with pytest.raises(ValueError, match="inverted"):
        around(5.0, -0.05, "V")


def test_one_sided_bands():
    at_least = Expectation(None, 2.0, None, "V")
    at_most = Expectation(None, None, 0.5, "ohm")
    assert at_least.contains(1e9) and not at_least.contains(1.9)
    assert at_most.contains(-1.0) and not at_most.contains(0.6)
    assert at_most.contains(0.5)


def test_open_circuit_reading_is_outside_an_upper_bound():
    assert not Expectation(None, None, 1.0, "ohm").contains(math.inf)
    assert Expectation(None, 1e6, None, "ohm").contains(math.inf)


def test_describe_reads_in_the_shop_s_units():
    assert around(325.0, 0.10, "V").describe() == "325 V (292 V to 358 V)"
    assert Expectation(None, 2.0, None, "V").describe() == "at least 2 V"
    assert Expectation(None, None, 0.5, "ohm").describe() == "at most 500 mohm"
    assert Expectation(None, None, None, "V").describe() == "any"


@given(low=bound, high=bound)
def test_a_band_is_never_inverted(low, high):
    try:
        band = Expectation(None, low, high, "V")
    except ValueError:
        assert low is not None and high is not None and low > high
        return
    if band.low is not None and band.high is not None:
        assert band.low <= band.high


@given(nominal=finite, tolerance=st.floats(min_value=0.0, max_value=1.0))
def test_around_always_contains_its_nominal(nominal, tolerance):
    band = around(nominal, tolerance, "V")
    assert band.low <= band.nominal <= band.high
    assert band.contains(nominal)
