"""Intake reads the label ratings with the one ratings parser: what the parser accepts (a
universal input written "85-265 V") the intake accepts, and what it refuses is refused beside the
field with the parser's own words. Universal input range 85-265 V [src: TI UCC28C4x datasheet
design example, as in fixbench.physics.ratings]."""

from __future__ import annotations

import pytest

from fixbench.physics.ratings import UNIVERSAL_WORDS, parse_ratings
from fixbench.quantities import ReadingError
from fixbench.workflows.intake import REFERENCE_LABEL, is_universal, label_ratings, read_rating_field


@pytest.mark.parametrize("typed", ["85-265 V", "85-265 v", "100-240 V", "universal", "Universal",
                                   "90-264 V"])
def test_every_universal_mains_the_parser_reads_is_accepted_at_intake(typed):
    assert parse_ratings({**REFERENCE_LABEL, "mains": typed}).universal
    assert read_rating_field("mains", typed) == typed
    assert is_universal(typed)


def test_the_parser_and_the_intake_agree_on_every_universal_word():
    for word in UNIVERSAL_WORDS:
        assert read_rating_field("mains", word) == word


@pytest.mark.parametrize("key, typed, says", [
    ("output", "3,3", "use a point for decimals"),
    ("output", "5 A", "this check reads volts"),
    ("output", "5000 V", "outside what fixbench models"),
    ("mains", "12 V", "not a mains voltage"),
    ("current", "2 kohm", "this check reads amps"),
    ("bulk", "-22 uF", "positive"),
])
def test_a_rating_the_parser_refuses_is_refused_with_its_words(key, typed, says):
    with pytest.raises(ReadingError) as refused:
        parse_ratings({**REFERENCE_LABEL, key: typed})
    with pytest.raises(ReadingError, match=says) as at_intake:
        read_rating_field(key, typed)
    assert str(refused.value).endswith(str(at_intake.value))
    assert not str(at_intake.value).startswith("rating '")


def test_the_bench_mains_is_kept_only_for_a_universal_unit():
    universal = label_ratings({"mains": "85-265 V", "bench_mains": "120 V", "output": "12 V",
                               "current": "2 A", "bulk": " "})
    assert universal == {"mains": "85-265 V", "bench_mains": "120 V", "output": "12 V",
                         "current": "2 A"}
    fixed = label_ratings({"mains": "230 V", "bench_mains": "120 V", "output": "12 V",
                           "current": "2 A"})
    assert "bench_mains" not in fixed
    with pytest.raises(ReadingError, match="250 W"):
        label_ratings({"mains": "230 V", "output": "60 V", "current": "5 A"})


def test_ratings_the_family_cannot_describe_are_refused_before_anything_is_kept(tmp_path, knowledge):
    # In the window a pwm_flyback case at 2 V was kept first, then the engine failed ("band
    # inverted"), and the case could never be resumed.
    from fixbench.store import open_store
    from fixbench.store.case_list import case_count
    from fixbench.store.people import add_technician
    from fixbench.workflows.intake import IntakeForm, open_new_case

    store = open_store(tmp_path / "shop.sqlite")
    try:
        tech = add_technician(store, "Rowan Vell")
        form = IntakeForm("BW-2", "Quillon", "QX-9", "", "phone charger", "pwm_flyback",
                          {"mains": "230 V", "output": "2 V", "current": "1 A"}, ("symptom_dead",))
        with pytest.raises(ReadingError, match="reference of the TL431"):
            open_new_case(store, knowledge, tech, form)
        assert case_count(store) == 0
    finally:
        store.close()
