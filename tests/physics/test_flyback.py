"""Flyback relations against the LM3101 worked example and Power Integrations AN-19."""

from __future__ import annotations

import pytest

from fixbench.physics.flyback import (
    VOR_LOW_LINE,
    VOR_WIDE_OR_HIGH_LINE,
    auxiliary_voltage,
    aux_turns_for,
    drain_peak,
    primary_to_secondary_ratio,
    reflected_voltage_design,
    secondary_to_primary_ratio,
)


def test_lm3101_worked_example_turns_ratio():
    ns_np = secondary_to_primary_ratio(v_out=5.0, v_diode=0.7, v_in_min=127.0, v_switch=0.9, duty_max=0.28)
    assert round(ns_np, 2) == 0.12  # [src: LM3101 datasheet application example, Ns/Np = 0.12]
    # The datasheet rounds to 8.5:1; the unrounded ratio is 8.6:1.
    assert 1.0 / ns_np == pytest.approx(8.5, rel=0.02)  # [src: LM3101 datasheet application example, 8.5:1]


def test_volt_second_balance_closes_at_the_design_point():
    # Putting the ratio back into (Vo + VD) = (Vin - VDS) * (Ns/Np) * D / (1 - D) returns Vo + VD.
    ns_np = secondary_to_primary_ratio(12.0, 0.5, 100.0, 1.0, 0.45)
    assert (100.0 - 1.0) * ns_np * 0.45 / 0.55 == pytest.approx(12.5)  # [src: textbook flyback relations]


def test_an19_reflected_voltage_by_input_range():
    assert reflected_voltage_design(universal_or_high_line=False) == VOR_LOW_LINE == 60.0  # [src: Power Integrations AN-19, VOR about 60 V for 100/115 VAC]
    assert reflected_voltage_design(universal_or_high_line=True) == VOR_WIDE_OR_HIGH_LINE == 135.0  # [src: Power Integrations AN-19, VOR about 135 V for 230 VAC / universal]


def test_primary_to_secondary_ratio_from_reflected_voltage():
    # A universal 5 V charger: 135 / (5 + 0.7) = 23.7.
    assert primary_to_secondary_ratio(135.0, 5.0, 0.7) == pytest.approx(23.68, abs=0.01)  # [src: textbook flyback relations, Np/Ns = VOR/(Vo+VD)]


def test_drain_peak_is_bulk_plus_reflected_plus_spike():
    assert drain_peak(375.0, 135.0, spike_fraction=0.0) == 510.0  # [src: Power Integrations AN-19, VDS = Vbulk_max + VOR + spike]
    peak = drain_peak(375.0, 135.0)
    assert 510.0 < peak
    # Universal designs use 600-800 V switches, so the expected stress at 265 VAC stays under 700 V.
    assert peak < 700.0  # [src: Power Integrations AN-19, 600-800 V switches; 700 V limit memory]


def test_auxiliary_winding_turns_and_voltage_round_trip():
    na_ns = aux_turns_for(vcc_target=12.0, v_out=5.0, v_diode=0.7, v_aux_diode=0.7)
    assert na_ns == pytest.approx(12.7 / 5.7)
    assert auxiliary_voltage(5.0, 0.7, na_ns, 0.7) == pytest.approx(12.0)  # [src: textbook flyback relations, Vaux = (Vo+VD)*Na/Ns - VDa]


def test_auxiliary_voltage_tracks_the_output():
    # A low output (e.g. an overloaded secondary) drags Vcc down in proportion: the aux winding
    # sees the same flyback plateau, scaled by turns.
    normal = auxiliary_voltage(5.0, 0.7, 2.5, 0.7)
    sagging = auxiliary_voltage(2.5, 0.7, 2.5, 0.7)
    assert normal == pytest.approx(13.55)  # [src: textbook flyback relations]
    assert sagging == pytest.approx(7.3)  # [src: textbook flyback relations]


def test_auxiliary_winding_figures_follow_the_turns_ratios():
    from fixbench.knowledge import load_knowledge
    from fixbench.physics.healthy import healthy_unit
    from fixbench.physics.ratings import parse_ratings

    family = load_knowledge().family("pwm_flyback")
    unit = healthy_unit(family.design, parse_ratings({"mains": "230 V", "output": "5 V", "current": "2 A"}))
    target = family.design.vcc_target_v
    # Vaux = (Vo + VD) Na/Ns - VDa with Na/Ns chosen for the Vcc design point [textbook flyback relations]
    assert unit.figures["aux_rectified"].nominal == pytest.approx(target)
    assert unit.figures["aux_flyback"].nominal == pytest.approx(target + 0.7)
    # While the switch conducts the winding reflects -Vbulk Na/Np; Np/Ns = VOR/(Vo+VD), VOR 135 V
    # for 230 V designs [src: Power Integrations AN-19]
    na_ns = (target + 0.7) / (5.0 + 0.5)
    np_ns = 135.0 / (5.0 + 0.5)
    assert unit.figures["aux_forward"].nominal == pytest.approx(-unit.numeric["bulk_voltage"].nominal * na_ns / np_ns)
