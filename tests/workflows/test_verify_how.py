"""Verification that says how: the lamp, the load, the soak, the USB data lines and the insulation
test, with the figures worked out from the label ratings."""

from __future__ import annotations

import pytest

from fixbench.physics.ratings import parse_ratings
from fixbench.physics import series_lamp
from fixbench.workflows.verify_how import lamp_watts, load_resistor, verification_how


def test_a_5_v_2_a_charger_takes_a_2_5_ohm_10_w_load_and_a_40_w_lamp():
    ratings = parse_ratings({"mains": "230 V", "output": "5 V", "current": "2 A"})
    # R = V / I = 2.5 ohm, P = V * I = 10 W (the worked example); the lamp: the unit's
    # input power (about 13 W) up to 2-3x, at least 40 W at 230 V [practice; TRADE section 8].
    assert load_resistor(ratings) == (pytest.approx(2.5), 10)
    assert lamp_watts(ratings) == 40
    steps = {s.title: s.how for s in verification_how(ratings)}
    assert "2.5 ohm resistor rated 10 W" in steps["Under rated load"]
    assert "2 A constant current" in steps["Under rated load"]
    assert "30 min" in steps["Soak"] and "80 \u00b0C" in steps["Soak"]
    # USB Battery Charging 1.2: a dedicated charging port shorts D+ to D- through at most 200 ohm.
    usb = next(how for title, how in steps.items() if title.startswith("USB data lines"))
    assert "under 200 ohm" in usb
    assert "licensed" in steps["Insulation test, mains to output"]


def test_a_laptop_adapter_takes_a_bigger_lamp_and_load_and_no_usb_step():
    ratings = parse_ratings({"mains": "universal", "bench_mains": "230 V", "output": "19 V",
                             "current": "3.42 A"})
    # 65 W out: the lamp the series-lamp step names for this unit (75 W, tests/physics/test_series_lamp.py),
    # the same on the verification page; 5.56 ohm, 65 W -> a 75 W resistor.
    assert lamp_watts(ratings) == series_lamp.lamp_watts(ratings) == 75
    ohms, watts = load_resistor(ratings)
    assert ohms == pytest.approx(19 / 3.42) and watts == 75
    assert not any(s.title.startswith("USB") for s in verification_how(ratings))


def test_on_120_v_mains_the_lamp_starts_at_60_w():
    ratings = parse_ratings({"mains": "120 V", "output": "5 V", "current": "1 A"})
    assert lamp_watts(ratings) == 60  # 60-100 W at 120 V for chargers [practice; TRADE section 8]
