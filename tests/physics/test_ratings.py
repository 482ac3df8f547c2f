"""Label ratings read from text, the mains bands they imply, and refusals that name the rating."""

from __future__ import annotations

import pytest

from fixbench.physics.ratings import MAINS_TOLERANCE, UNIVERSAL_HIGH, UNIVERSAL_LOW, parse_ratings
from fixbench.quantities import ReadingError

CHARGER = {"mains": "230 V", "frequency": "50 Hz", "output": "5 V", "current": "2 A"}


def test_230v_mains_band_is_plus_minus_ten_percent():
    ratings = parse_ratings(CHARGER)
    assert MAINS_TOLERANCE == 0.10  # [src: IEC 60038, Table 1]
    assert (ratings.design_low, ratings.design_high) == (pytest.approx(207.0), pytest.approx(253.0))  # [src: IEC 60038, Table 1, 230 V +/-10 %]
    assert (ratings.bench_low, ratings.bench_high) == (pytest.approx(207.0), pytest.approx(253.0))  # [src: IEC 60038, Table 1, 230 V +/-10 %]
    assert ratings.bench_mains == 230.0 and ratings.mains_hz == 50.0
    assert ratings.output_w == pytest.approx(10.0)


def test_universal_input_is_85_to_265_volts():
    ratings = parse_ratings({"mains": "universal", "output": "5 V", "current": "1 A"})
    assert ratings.universal
    assert (UNIVERSAL_LOW, UNIVERSAL_HIGH) == (85.0, 265.0)  # [src: TI UCC28C4x datasheet design example, 85-265 V rms]
    assert (ratings.design_low, ratings.design_high) == (85.0, 265.0)  # [src: TI UCC28C4x datasheet design example]
    assert ratings.bench_mains == 230.0
    assert ratings.mains_hz == 50.0


@pytest.mark.parametrize("text", ["universal", "Universal", "100-240 V", "85-265", "90-264 V"])
def test_universal_label_wordings(text):
    assert parse_ratings({"mains": text, "output": "12 V", "current": "1 A"}).universal


def test_universal_unit_on_a_120v_bench():
    ratings = parse_ratings({"mains": "universal", "bench_mains": "120 V", "frequency": "60 Hz",
                             "output": "5 V", "current": "2 A"})
    assert ratings.bench_mains == 120.0 and ratings.mains_hz == 60.0


def test_120v_unit_defaults_to_60_hz():
    ratings = parse_ratings({"mains": "120 V", "output": "12 V", "current": "1 A"})
    assert ratings.mains_hz == 60.0
    assert (ratings.design_low, ratings.design_high) == (pytest.approx(108.0), pytest.approx(132.0))


def test_optional_ratings_and_text_round_trip():
    text = dict(CHARGER, bulk="22 uF", switching="65 kHz")
    ratings = parse_ratings(text)
    assert ratings.bulk_f == pytest.approx(22e-6) and ratings.switching_hz == pytest.approx(65e3)
    assert parse_ratings(ratings.as_text()) == ratings
    universal = parse_ratings({"mains": "universal", "bench_mains": "120 V", "output": "5 V", "current": "2 A"})
    assert parse_ratings(universal.as_text()) == universal


@pytest.mark.parametrize(
    ("change", "named"),
    [
        ({"mains": "12 V"}, "mains"),
        ({"mains": "230 A"}, "mains"),
        ({"mains": "lots"}, "mains"),
        ({"frequency": "400 Hz"}, "frequency"),
        ({"frequency": "50 V"}, "frequency"),
        ({"output": "5 A"}, "output"),
        ({"output": "0 V"}, "output"),
        ({"output": "100 V"}, "output"),
        ({"current": "abc"}, "current"),
        ({"current": "-2 A"}, "current"),
        ({"current": "OL"}, "current"),
        ({"current": "50 A"}, "current"),
        ({"bulk": "3,3 uF"}, "bulk"),
        ({"switching": "65 kV"}, "switching"),
        ({"output": ""}, "output"),
        ({"colour": "black"}, "colour"),
        ({"bench_mains": "4k7"}, "bench_mains"),
        ({"bench_mains": "12 V"}, "bench_mains"),
        ({"bulk": "1 pF"}, "bulk"),
        ({"bulk": "10 F"}, "bulk"),
        ({"switching": "1 Hz"}, "switching"),
        ({"switching": "10 GHz"}, "switching"),
    ],
)
def test_bad_rating_is_refused_naming_it(change, named):
    with pytest.raises(ReadingError, match=f"'{named}'"):
        parse_ratings(dict(CHARGER, **change))


def test_missing_rating_is_named():
    text = dict(CHARGER)
    del text["current"]
    with pytest.raises(ReadingError, match="rating 'current' is missing"):
        parse_ratings(text)


def test_more_than_250_watts_is_refused():
    with pytest.raises(ReadingError, match="250 W"):
        parse_ratings(dict(CHARGER, output="48 V", current="10 A"))


def test_label_reads_as_a_person_writes_it_without_the_bench_mains():
    from fixbench.physics.ratings import describe_label

    text = describe_label({"mains": "universal", "frequency": "50 Hz", "output": "12 V", "current": "2 A",
                           "bench_mains": "230 V"})
    assert text == "input 100-240 V 50 Hz, output 12 V 2 A"
    assert describe_label({"mains": "230 V", "output": "5 V", "current": "1 A"}) == "input 230 V, output 5 V 1 A"


@pytest.mark.parametrize("key", ["frequency", "bench_mains", "bulk", "switching"])
def test_a_blank_optional_rating_is_one_not_given(key):
    # {"frequency": " "} was a TypeError comparing None with 45.
    assert parse_ratings(dict(CHARGER, **{key: " "})) == parse_ratings(
        {k: v for k, v in CHARGER.items() if k != key})


@pytest.mark.parametrize("label, universal, low, high, bench, hz", [
    # Labels as printed; "~" is alternating current [src: IEC 60417-5032]. A range from 100 V to
    # 240 V is a universal input, designed for 85-265 V [src: TI UCC28C4x design example].
    ("100-240V~ 50/60Hz", True, 85.0, 265.0, 230.0, 50.0),
    ("AC 100-240V", True, 85.0, 265.0, 230.0, 50.0),
    ("85-265 V", True, 85.0, 265.0, 230.0, 50.0),
    # A narrow range: each end +/-10 % [src: IEC 60038 Table 1], tested on 230 V inside it.
    ("220-240V", False, 198.0, 264.0, 230.0, 50.0),
    ("230V~", False, 207.0, 253.0, 230.0, 50.0),
    ("230V~ 50Hz 0.3A", False, 207.0, 253.0, 230.0, 50.0),
    ("110-130V~ 60Hz", False, 99.0, 143.0, 120.0, 60.0),
])
def test_mains_is_read_as_labels_print_it(label, universal, low, high, bench, hz):
    ratings = parse_ratings({"mains": label, "output": "5 V", "current": "1 A"})
    assert ratings.universal is universal
    assert (ratings.design_low, ratings.design_high) == (pytest.approx(low), pytest.approx(high))
    assert (ratings.bench_mains, ratings.mains_hz) == (bench, hz)
    assert parse_ratings(ratings.as_text()) == ratings  # a case file keeps the label's range
