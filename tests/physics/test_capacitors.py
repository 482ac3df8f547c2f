"""Electrolytic ESR table, preferred values and stored energy."""

from __future__ import annotations

import pytest
from hypothesis import given
from hypothesis import strategies as st

from fixbench.physics.capacitors import (
    E6,
    E12,
    ESR_NEW_TABLE,
    SUSPECT_FACTOR,
    esr_new_max,
    esr_suspect_above,
    nearest_preferred,
    stored_energy,
)

GLODARK_CHART = [
    # (capacitance, rated V, worst-case ESR of a new part, ohm) [src: glodark.com ESR chart]
    (10e-6, 16, 8.0), (22e-6, 16, 3.6), (47e-6, 16, 1.6), (100e-6, 16, 0.7), (220e-6, 16, 0.33),
    (470e-6, 10, 0.24), (1000e-6, 10, 0.12), (10e-6, 250, 2.5), (47e-6, 250, 0.8),
]


@pytest.mark.parametrize(("capacitance", "rated_v", "esr"), GLODARK_CHART)
def test_esr_is_exact_at_table_points(capacitance, rated_v, esr):
    assert esr_new_max(capacitance, rated_v) == pytest.approx(esr, rel=1e-9)  # [src: glodark.com ESR chart]


def test_table_holds_the_chart_and_nothing_else():
    assert ESR_NEW_TABLE == {(c, v): esr for c, v, esr in GLODARK_CHART}  # [src: glodark.com ESR chart]


def test_suspect_threshold_is_twice_the_new_part_value():
    assert SUSPECT_FACTOR == 2.0  # [practice]
    assert esr_suspect_above(10e-6, 250) == pytest.approx(5.0)  # [src: glodark.com ESR chart 2.5 ohm; practice 2x]
    assert esr_suspect_above(1000e-6, 10) == pytest.approx(0.24)  # [src: glodark.com ESR chart 0.12 ohm; practice 2x]


def test_interpolation_falls_between_neighbouring_table_points():
    # 33 uF/16 V lies between 22 uF (3.6 ohm) and 47 uF (1.6 ohm).
    assert 1.6 < esr_new_max(33e-6, 16) < 3.6  # [src: glodark.com ESR chart]
    # 22 uF/400 V lies between 10 uF (2.5 ohm) and 47 uF (0.8 ohm) of the high-voltage class.
    assert 0.8 < esr_new_max(22e-6, 400) < 2.5  # [src: glodark.com ESR chart]


@given(
    c1=st.floats(min_value=1e-6, max_value=4.7e-3),
    c2=st.floats(min_value=1e-6, max_value=4.7e-3),
    rated_v=st.sampled_from([6.3, 10.0, 16.0, 25.0, 35.0, 50.0, 63.0, 160.0, 250.0, 400.0, 450.0]),
)
def test_esr_falls_as_capacitance_rises(c1, c2, rated_v):
    small, large = sorted((c1, c2))
    assert esr_new_max(large, rated_v) <= esr_new_max(small, rated_v)
    assert esr_new_max(small, rated_v) > 0


def test_nearest_preferred_value():
    assert nearest_preferred(31e-6) == pytest.approx(33e-6)  # [src: IEC 60063 E6 series]
    assert nearest_preferred(9.2e-6) == pytest.approx(10e-6)  # [src: IEC 60063 E6 series]
    assert nearest_preferred(5.5e3, E12) == pytest.approx(5.6e3)  # [src: IEC 60063 E12 series]
    assert E6 == (1.0, 1.5, 2.2, 3.3, 4.7, 6.8)  # [src: IEC 60063 E6 series]


def test_stored_energy_of_a_charged_bulk_capacitor():
    assert stored_energy(47e-6, 375.0) == pytest.approx(3.3, abs=0.01)  # [src: E = C*V^2/2; trade primer 47 uF at 375 V = 3.3 J]
