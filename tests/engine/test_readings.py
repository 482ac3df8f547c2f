"""Readings as typed at the bench: meter words, lamp words and short answers."""

from __future__ import annotations

import math

import pytest

from fixbench.quantities import ReadingError

from fixbench.engine.readings import read


def _check(model, check_id):
    return model.checks[model.check_index(check_id)]


@pytest.mark.parametrize("check", ["fuse_resistance", "start_resistor", "lead_continuity", "gate_resistor"])
def test_over_range_on_an_ohmmeter_reads_open(model, check):
    reading = read(_check(model, check), "OL")
    assert math.isinf(reading.value)
    assert reading.outcome == "open"  # OL on the display is an open circuit [practice]
    assert not reading.in_band


@pytest.mark.parametrize("check", ["bridge_diode_test", "mosfet_drain_source", "output_diode_test"])
def test_beep_on_diode_test_or_continuity_reads_short(model, check):
    reading = read(_check(model, check), "beeps")
    assert reading.outcome == "short"  # the continuity beeper sounds on a near-dead short [practice]


def test_glows_bright_on_the_series_lamp_reads_bright(model):
    assert read(_check(model, "series_lamp"), "glows bright").outcome == "bright"  # [practice]
    assert read(_check(model, "series_lamp"), "flash then dark").outcome == "flash"  # [practice]


@pytest.mark.parametrize("text, outcome", [("steady bright", "bright"), ("flash then dim", "flash"),
                                           ("dark after flash", "flash"), ("no flash", "no_flash"),
                                           ("never lights", "no_flash")])
def test_the_lamp_is_read_by_what_is_seen_at_switch_on(model, text, outcome):
    # steady bright / a flash then dim or dark / no flash at all [practice; trade primer section 8]
    assert read(_check(model, "series_lamp"), text).outcome == outcome


@pytest.mark.parametrize("text", ["dark", "off"])
def test_a_dark_lamp_asks_whether_it_flashed(model, text):
    # Reproduces issue 11: "dark" read as "never lights", an open input, and failed a verification
    # of a healthy unit, which keeps a 40-100 W lamp dark after its flash [trade primer section 8].
    with pytest.raises(ReadingError, match="did the lamp flash"):
        read(_check(model, "series_lamp"), text)


def test_a_flash_then_dark_passes_as_a_healthy_unit(model):
    assert read(_check(model, "series_lamp"), "flash then dark").in_band
    assert not read(_check(model, "series_lamp"), "no flash").in_band


@pytest.mark.parametrize("text, outcome", [("y", "yes"), ("Y", "yes"), ("n", "no"), ("yes", "yes")])
def test_short_answers_to_a_question(model, text, outcome):
    assert read(_check(model, "symptom_dead"), text).outcome == outcome


def test_number_reading_lands_in_the_class_of_its_value(model):
    vcc = _check(model, "vcc_voltage")
    assert read(vcc, "13 V").outcome == "ok" and read(vcc, "13 V").in_band
    assert read(vcc, "0 V").outcome == "zero"
    assert read(vcc, "34").outcome == "high"  # a bare number takes the check's unit


def test_healthy_fuse_reads_in_band(model):
    reading = read(_check(model, "fuse_resistance"), "0.05 ohm")
    assert reading.in_band and reading.outcome == "ok"


def test_a_bare_number_takes_the_prefix_the_step_shows(model):
    # The case: "5.46" on a capacitance step that shows microfarads is 5.46 uF, and the
    # reading says so for the echo.
    bulk = read(_check(model, "bulk_capacitance"), "5.46")
    assert bulk.value == pytest.approx(5.46e-6) and bulk.read_as == "uF"
    assert read(_check(model, "bulk_capacitance"), "5.46 uF").read_as == ""  # typed with its unit
    # A meter shows a diode drop in volts and a fuse in ohms: those bare numbers stay as typed
    # [practice].
    assert read(_check(model, "bridge_diode_test"), "0.55").value == pytest.approx(0.55)
    fuse = read(_check(model, "fuse_resistance"), "0.1")
    assert fuse.value == pytest.approx(0.1) and fuse.read_as == ""
    # Ohms are read as typed even where the step shows megohms: a shorted switch typed "0.3" is
    # 0.3 ohm, not 0.3 Mohm [practice: a meter shows a short as a fraction of an ohm].
    drain = _check(model, "mosfet_drain_source")
    assert drain.healthy.nominal > 1e5
    shorted = read(drain, "0.3")
    assert shorted.value == pytest.approx(0.3) and shorted.outcome == "short"
