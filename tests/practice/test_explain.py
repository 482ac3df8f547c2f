"""What a reading told and why a check is worth taking, in words: suspects raised and ruled out,
the healthy value, what two suspects would each read, and the customer's complaint."""

from __future__ import annotations

from fixbench.engine.diagnosis import start_diagnosis
from fixbench.physics.ratings import parse_ratings
from fixbench.quantities import format_band, format_quantity
from fixbench.practice.explain import (complaint_words, healthy_words, predicted_words, separation_words,
                                       what_it_told, why_engine_chose)

RATINGS = {"mains": "230 V", "output": "12 V", "current": "2 A"}


def opening(family):
    return start_diagnosis(family, parse_ratings(RATINGS))


def test_a_shorted_drain_reading_raises_the_switch_and_rules_out_others(flyback):
    before = opening(flyback).with_reading("look_fuse", "yes")
    after = before.with_reading("mosfet_drain_source", "0.3")
    told = what_it_told(before, after)
    assert told.raised and told.raised[0].startswith("Switching MOSFET shorted (to ")
    assert "Bridge diode shorted" in told.cleared
    assert told.words().startswith("Raised Switching MOSFET shorted")


def test_a_reading_that_moves_nothing_says_so(flyback):
    state = opening(flyback).with_reading("mosfet_drain_source", "0.3")
    assert what_it_told(state, state).words().startswith("moved no suspect much")


def test_the_healthy_value_is_the_physics_band_or_the_healthy_outcome(flyback):
    state = opening(flyback)
    drain = state.model.checks[state.model.check_index("mosfet_drain_source")].healthy
    assert healthy_words(state, "mosfet_drain_source") == (
        f"{format_quantity(drain.nominal, 'ohm')} ({format_band(drain.low, drain.high, 'ohm')})")
    assert healthy_words(state, "series_lamp") == "flash"  # flashes, then dim or dark [practice]
    assert healthy_words(state, "fuse_resistance").startswith("50 mohm (")


def test_what_a_suspect_would_read_comes_from_the_engines_prediction(flyback):
    state = opening(flyback)
    assert predicted_words(state, "mosfet_drain_source", "Q1.short").startswith("about 3")  # ~0.3 ohm
    healthy = state.model.checks[state.model.check_index("mosfet_drain_source")].healthy.nominal
    assert predicted_words(state, "mosfet_drain_source", "C3.dried") == f"about {format_quantity(healthy, 'ohm')}"
    # A shorted switch usually took the fuse with it: the lamp stays dark; with the fuse read good,
    # the same fault lights it bright.
    assert predicted_words(state, "series_lamp", "Q1.short") == "no_flash"
    fuse_good = state.with_reading("fuse_resistance", "0.05")
    assert predicted_words(fuse_good, "series_lamp", "Q1.short", fuse_good.posterior) == "bright"


def test_the_engines_reason_names_two_suspects_and_what_each_would_read(flyback):
    state = opening(flyback).with_reading("look_fuse", "yes")
    words = separation_words(state, "mosfet_drain_source")
    assert words.startswith("it tells Switching MOSFET shorted (would read about")
    assert "from " in words and "(would read" in words.split("from ", 1)[1]
    assert why_engine_chose(state, "mosfet_drain_source").endswith("1 min")


def test_the_discharge_and_a_repeat_have_reasons_of_their_own(flyback):
    state = opening(flyback).with_reading("series_lamp", "bright")
    assert "bulk capacitor is discharged" in why_engine_chose(state, "bulk_discharged")
    assert "misread or a poor probe contact" in why_engine_chose(state, "series_lamp")


def test_the_complaint_leads_with_what_the_customer_reported(flyback):
    words = complaint_words(flyback, (("symptom_dead", "yes"), ("symptom_hot", "yes"), ("symptom_intermittent", "no")))
    assert words == ("Reported dead: no output at all; Runs hot. Not reported: works on and off, or when "
                     "the cable is moved.")
    assert complaint_words(flyback, (("symptom_dead", "no"),)).startswith("Nothing specific reported.")
