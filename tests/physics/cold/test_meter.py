"""The meter model against the figures the trade primer states for handheld meters."""

from __future__ import annotations

import pytest

from fixbench.physics.cold.junctions import BODY_DIODE, FAST_RECOVERY, SILICON_RECTIFIER, TRANSISTOR_JUNCTION
from fixbench.physics.cold.meter import HANDHELD, Meter, MeterSource


def test_diode_test_drives_about_a_milliamp_from_two_to_three_and_a_half_volts():
    diode = HANDHELD.diode_test
    assert 2.0 <= diode.open_circuit_v <= 3.5  # [memory: meter manuals; trade primer section 7]
    at_junction = (diode.open_circuit_v - 0.6) / diode.source_ohm
    assert 0.5e-3 <= at_junction <= 1.5e-3  # [memory: meter manuals; trade primer section 7]
    # An open junction shows OL, a lit infrared LED (about 1.05 V) still shows a number.
    assert 1.3 < diode.full_scale < diode.open_circuit_v


def test_ohms_ranges_drive_under_a_milliamp_and_a_tenth_per_range():
    ranges = HANDHELD.ohms_ranges
    assert all(r.short_circuit_a <= 1e-3 for r in ranges)  # [memory: meter manuals; trade primer section 7]
    for lower, upper in zip(ranges, ranges[1:]):
        assert upper.full_scale == pytest.approx(10 * lower.full_scale)
        assert upper.short_circuit_a == pytest.approx(lower.short_circuit_a / 10)
    assert all(0.1 <= r.open_circuit_v <= 3.0 for r in ranges + HANDHELD.low_voltage_ohms)  # [memory: a few hundred mV to about 3 V]


def test_silicon_junctions_conduct_on_the_standard_ranges_and_not_on_low_voltage_ohms():
    # Open probes see the open-circuit voltage: above a silicon junction's drop at the range's test
    # current on the standard ranges [memory: meter manuals; trade primer section 7] ...
    for source in HANDHELD.ohms_ranges:
        assert source.open_circuit_v > SILICON_RECTIFIER.drop(source.short_circuit_a)
    # ... while on low-voltage ohms up to 40 kohm a junction across a full-scale resistor takes under
    # 5 % of the test current [memory: low-power ohms ranges for in-circuit work].
    for source in HANDHELD.low_voltage_ohms:
        assert source.open_circuit_v < SILICON_RECTIFIER.drop(1e-6)
        if source.full_scale <= 40e3:
            volts = source.full_scale_volts()
            for kind in (SILICON_RECTIFIER, FAST_RECOVERY, BODY_DIODE, TRANSISTOR_JUNCTION):
                assert kind.current(volts) < 0.05 * volts / source.full_scale, kind.name


def test_a_meter_without_low_voltage_ohms_says_so():
    meter = Meter("plain meter", HANDHELD.ohms_ranges, (), HANDHELD.diode_test, (0.01, 0.2), (0.01, 0.002))
    with pytest.raises(ValueError, match="no low-voltage ohms"):
        meter.ranges(low_voltage=True)


def test_ranges_must_ascend():
    first, second = HANDHELD.ohms_ranges[:2]
    with pytest.raises(ValueError, match="ascend"):
        Meter("muddled", (second, first), (), HANDHELD.diode_test, (0.01, 0.2), (0.01, 0.002))


def test_source_resistance_follows_open_circuit_voltage_over_short_circuit_current():
    source = MeterSource("x", 3.0, 1e-3, 400.0)
    assert source.source_ohm == pytest.approx(3000.0)
    assert source.full_scale_volts() == pytest.approx(3.0 * 400.0 / 3400.0)  # [closed form: divider]
