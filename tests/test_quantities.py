"""The one parser and formatter of quantities: what a technician types and what the tool shows."""

from __future__ import annotations

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st
from quantiphy import Quantity

from fixbench.quantities import ReadingError, format_band, format_quantity, parse_quantity, quantiphy_value

# Input prefixes the project accepts; quantiphy reads the others too (R = ronna, a = atto, ...).
EVERYDAY_PREFIXES = "TGMkmunp"


@pytest.mark.parametrize(
    ("text", "expect_unit", "value", "unit"),
    [
        ("325 V", None, 325.0, "V"),
        ("325", "V", 325.0, "V"),
        ("325V", "V", 325.0, "V"),
        ("4k7", "ohm", 4700.0, "ohm"),
        ("4k7", None, 4700.0, None),
        ("0R47", None, 0.47, "ohm"),
        ("2M2", "ohm", 2.2e6, "ohm"),
        ("4n7", "F", 4.7e-9, "F"),
        ("0.45R", None, 0.45, "ohm"),
        ("0.45 ohm", "ohm", 0.45, "ohm"),
        ("100 \u00b5F", None, 100e-6, "F"),
        ("100 uF", "F", 100e-6, "F"),
        ("68 kHz", None, 68e3, "Hz"),
        ("2.2M\u03a9", None, 2.2e6, "ohm"),
        ("3.3 k\u2126", "ohm", 3.3e3, "ohm"),
        ("10 mA", "A", 0.01, "A"),
        ("15 W", None, 15.0, "W"),
        ("-5 V", None, -5.0, "V"),
        ("230 VAC", "V", 230.0, "V"),
        # Zener voltages printed letter-for-point [src: IEC 60062, letter and digit code]
        ("5V1", "V", 5.1, "V"),
        ("4V9", None, 4.9, "V"),
    ],
)
def test_parses_what_a_technician_types(text, expect_unit, value, unit):
    measured = parse_quantity(text, expect_unit)
    assert measured.value == pytest.approx(value, rel=1e-12)
    assert measured.unit == unit


def test_trailing_r_is_ohms_not_ronna():
    # quantiphy on its own reads "R" as ronna (1e27); the shop means ohms.
    assert float(Quantity("0.45R")) == pytest.approx(0.45e27)  # [src: quantiphy default scale factors, R = ronna (SI 2022)]
    assert parse_quantity("0.45R").value == pytest.approx(0.45)


def test_microfarads_scale_exactly():
    assert parse_quantity("100 uF").value == 1e-4


@pytest.mark.parametrize(("text", "value"), [("5e3mV", 5.0), ("5E3 mV", 5.0), ("1e-3 kV", 1.0),
                                             ("2.5e-3 kohm", 2.5), ("4.7e2 uF", 4.7e-4)])
def test_an_exponent_with_a_prefix_adds_up(text, value):
    # "5e3mV" was a ValueError (float("5e3e-3")) instead of 5 V.
    # quantiphy is no cross-check here: it takes "mV" after an exponent as the unit's name.
    assert parse_quantity(text).value == pytest.approx(value, rel=1e-12)  # [src: SI Brochure 9th ed., 3.1: a prefix multiplies the unit by its power of ten]


@pytest.mark.parametrize("text", ["1e400 V", "1e308 kV", "-1e400"])
def test_a_number_too_large_for_a_float_is_refused_not_read_as_over_range(text):
    with pytest.raises(ReadingError, match="too large a number"):
        parse_quantity(text, "V")


@pytest.mark.parametrize("text", ["OL", "ol", "O.L.", "open", "  OL  "])
def test_over_range_reads_as_infinity(text):
    measured = parse_quantity(text, "ohm")
    assert math.isinf(measured.value) and measured.over_range
    assert measured.unit == "ohm"


@pytest.mark.parametrize(
    ("text", "expect_unit", "message"),
    [
        ("325 V", "ohm", "in volts, but this check reads ohms"),
        ("3,3", None, "use a point for decimals, for example 3.3"),
        ("3,3 V", "V", "use a point for decimals"),
        ("", None, "empty"),
        ("   ", "V", "empty"),
        ("abc", None, "cannot read 'abc'"),
        ("5 xyz", None, "unknown unit 'xyz'"),
        ("5 %", None, "not a percentage"),
        ("12 aV", "V", "unknown unit"),
    ],
)
def test_refuses_with_a_message_that_says_what_to_do(text, expect_unit, message):
    with pytest.raises(ReadingError, match=message):
        parse_quantity(text, expect_unit)


def test_empty_none_is_refused():
    with pytest.raises(ReadingError, match="empty"):
        parse_quantity(None)  # type: ignore[arg-type]


PLAIN_CASES = ["325 V", "4.7 kohm", "100 uF", "68 kHz", "2.2 Mohm", "0.45 ohm", "47 pF", "1.5 mA",
               "12 V", "4.7 nF", "250 mA", "1 GHz", "0.1 s"]


@pytest.mark.parametrize("text", PLAIN_CASES)
def test_agrees_with_quantiphy_on_plain_cases(text):
    with Quantity.prefs(input_sf=EVERYDAY_PREFIXES):
        independent = float(Quantity(text))
    assert parse_quantity(text).value == pytest.approx(independent, rel=1e-12)  # [src: quantiphy, independent parser]


@pytest.mark.parametrize("text", PLAIN_CASES)
def test_quantiphy_value_helper_matches_parse_quantity(text):
    assert quantiphy_value(text) == pytest.approx(parse_quantity(text).value, rel=1e-12)  # [src: quantiphy, independent parser]


def test_quantiphy_value_helper_restricts_prefixes():
    # With input prefixes restricted, "R" is a unit, not ronna.
    assert quantiphy_value("0.45R") == pytest.approx(0.45)  # [src: quantiphy input_sf preference]


@pytest.mark.parametrize(
    ("value", "unit", "shown"),
    [
        (4700.0, "ohm", "4.7 kohm"),
        (325.0, "V", "325 V"),
        (68e3, "Hz", "68 kHz"),
        (100e-6, "F", "100 uF"),
        (2.2e6, "ohm", "2.2 Mohm"),
        (0.012345, "A", "12.3 mA"),
        (math.inf, "ohm", "OL"),
        (None, "V", "-"),
        (3.14159, "", "3.14"),
    ],
)
def test_formats_for_display(value, unit, shown):
    assert format_quantity(value, unit) == shown


def test_formats_bands():
    assert format_band(300.0, 340.0, "V") == "300 V to 340 V"
    assert format_band(2.0, None, "V") == "at least 2 V"
    assert format_band(None, 0.5, "ohm") == "at most 500 mohm"


# Magnitudes from 1 pF/pA to the tera range: the prefixes the parser accepts.
magnitudes = st.floats(min_value=1e-12, max_value=9e14, allow_nan=False, allow_infinity=False)


@given(magnitude=magnitudes, negative=st.booleans(), unit=st.sampled_from(["V", "A", "Hz", "F", "ohm"]))
def test_format_then_parse_round_trips_within_display_precision(magnitude, negative, unit):
    value = -magnitude if negative else magnitude
    shown = format_quantity(value, unit)
    back = parse_quantity(shown, unit)
    # Three significant figures: the shown value is within half a unit of the third figure.
    assert back.value == pytest.approx(value, rel=5e-3)
    assert back.unit == unit


@given(unit=st.sampled_from(["V", "A", "Hz", "F", "ohm"]))
def test_over_range_round_trips(unit):
    assert math.isinf(parse_quantity(format_quantity(math.inf, unit), unit).value)
