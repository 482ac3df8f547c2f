"""Published figures of rectifiers, Schottkys, the TL431, the optocoupler and controller UVLO."""

from __future__ import annotations

import pytest

from fixbench.physics.semiconductors import (
    CONTROLLER_UVLO,
    DIODE_TEST_FAST,
    DIODE_TEST_SCHOTTKY,
    DIODE_TEST_SHORT_BELOW,
    DIODE_TEST_SILICON,
    OPTO_CTR_RANGE,
    OPTO_LED_VF_MAX,
    OPTO_LED_VF_TYP,
    RECTIFIER_1N4007_VF_MAX_1A,
    SCHOTTKY_VF_MAX_1A,
    TL431_MIN_CATHODE_CURRENT_MAX,
    TL431_VREF,
    tl431_output,
)


def test_1n4007_forward_drop_at_one_amp():
    assert RECTIFIER_1N4007_VF_MAX_1A == 1.1  # [src: 1N4007 datasheets, VF max 1.0-1.1 V at 1 A]


def test_schottky_forward_drops_at_one_amp():
    assert SCHOTTKY_VF_MAX_1A["1N5817"] == 0.45  # [src: onsemi 1N5817/D]
    assert SCHOTTKY_VF_MAX_1A["1N5818"] == 0.55  # [src: onsemi 1N5817/D]
    assert SCHOTTKY_VF_MAX_1A["1N5819"] == 0.60  # [src: onsemi 1N5817/D]


def test_diode_test_bands_are_ordered_and_fit_the_parts():
    # A meter's ~1 mA diode test: a shorted junction reads below a healthy silicon one; Schottkys read
    # below silicon; the healthy 1N4007 reading of 0.5-0.7 V sits in the silicon band.
    assert DIODE_TEST_SHORT_BELOW < DIODE_TEST_SILICON[0]  # [practice]
    assert DIODE_TEST_SHORT_BELOW < DIODE_TEST_SCHOTTKY[0]  # a good Schottky must not look shorted [practice]
    assert DIODE_TEST_SCHOTTKY[0] < DIODE_TEST_SCHOTTKY[1] <= DIODE_TEST_SILICON[0]  # [practice]
    assert DIODE_TEST_SILICON[0] <= 0.5 and 0.7 <= DIODE_TEST_SILICON[1]  # [practice: 1N4007 reads 0.5-0.7 V on diode test]
    assert DIODE_TEST_FAST[0] < DIODE_TEST_FAST[1]  # [practice]
    # A meter reading at ~1 mA cannot exceed the part's datasheet VF at 1 A.
    assert DIODE_TEST_SILICON[1] < RECTIFIER_1N4007_VF_MAX_1A  # [src: 1N4007 datasheets]
    assert DIODE_TEST_SCHOTTKY[1] <= max(SCHOTTKY_VF_MAX_1A.values())  # [src: onsemi 1N5817/D]


def test_tl431_reference_grades():
    assert (TL431_VREF["plain"].low, TL431_VREF["plain"].high) == (2.440, 2.550)  # [src: TI SLVS543]
    assert (TL431_VREF["A"].low, TL431_VREF["A"].high) == (2.470, 2.520)  # [src: TI SLVS543]
    assert (TL431_VREF["B"].low, TL431_VREF["B"].high) == (2.483, 2.507)  # [src: TI SLVS543]
    for grade in TL431_VREF.values():
        assert grade.typical == 2.495  # [src: TI SLVS543]
        assert grade.low < grade.typical < grade.high
    assert TL431_MIN_CATHODE_CURRENT_MAX == pytest.approx(0.7e-3)  # [src: TI SLVS543]


def test_tl431_divider_sets_the_output():
    # Equal resistors double Vref: 4.99 V, the usual 5 V charger divider.
    assert tl431_output(10e3, 10e3) == pytest.approx(4.99)  # [src: TI SLVS543, Vout = Vref*(1 + R1/R2)]
    # 12 V: R1/R2 = 12/2.495 - 1 = 3.81, e.g. 38.3k over 10k (E96) gives 12.05 V.
    assert tl431_output(38.3e3, 10e3) == pytest.approx(12.05, abs=0.01)  # [src: TI SLVS543, Vout = Vref*(1 + R1/R2)]
    # The grade's spread carries straight to the output: a plain-grade 5 V supply is 4.88-5.10 V.
    low = tl431_output(10e3, 10e3, TL431_VREF["plain"].low)
    high = tl431_output(10e3, 10e3, TL431_VREF["plain"].high)
    assert (low, high) == (pytest.approx(4.88), pytest.approx(5.10))  # [src: TI SLVS543 plain grade 2.440-2.550 V]


def test_optocoupler_figures():
    assert OPTO_CTR_RANGE == (0.5, 6.0)  # [src: Sharp PC817 datasheet, CTR 50-600 % at IF 5 mA]
    assert (OPTO_LED_VF_TYP, OPTO_LED_VF_MAX) == (1.2, 1.4)  # [src: Sharp PC817 datasheet]


@pytest.mark.parametrize(
    ("part", "start", "stop"),
    [
        ("UC3842", 16.0, 10.0),  # [src: onsemi/ST UC3842 datasheet]
        ("UC3844", 16.0, 10.0),  # [src: onsemi/ST UC3844 datasheet]
        ("UC3843", 8.4, 7.6),  # [src: onsemi/ST UC3843 datasheet]
        ("UC3845", 8.4, 7.6),  # [src: onsemi/ST UC3845 datasheet]
        ("VIPer22A", 14.5, 8.0),  # [src: ST VIPer22A datasheet]
    ],
)
def test_controller_start_and_stop_thresholds(part, start, stop):
    uvlo = CONTROLLER_UVLO[part]
    assert (uvlo.start, uvlo.stop) == (start, stop)  # [src: named in the parameter comment above]
    assert uvlo.start > uvlo.stop  # hysteresis is what makes a dried Vcc capacitor tick
    assert uvlo.source
