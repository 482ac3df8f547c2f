"""The series lamp named from a unit's ratings, and what its instructions say a technician sees."""

from __future__ import annotations

from fixbench.physics.ratings import parse_ratings
from fixbench.physics.series_lamp import lamp_how, lamp_watts


def test_a_small_charger_at_230_v_takes_a_40_w_lamp():
    # 40-60 W at 230 V for chargers and small adapters [practice; trade primer section 8]
    assert lamp_watts(parse_ratings({"mains": "230 V", "output": "5 V", "current": "1 A"})) == 40
    assert lamp_watts(parse_ratings({"mains": "230 V", "output": "12 V", "current": "2 A"})) == 40


def test_a_small_charger_at_120_v_takes_a_60_w_lamp():
    # 60-100 W at 120 V for chargers and small adapters [practice; trade primer section 8]
    assert lamp_watts(parse_ratings({"mains": "120 V", "output": "5 V", "current": "2 A"})) == 60


def test_a_laptop_adapter_takes_a_lamp_at_least_its_input_power():
    # about the unit's input power, up to 2-3x [practice; trade primer section 8]: 65 W out at
    # 87 % efficiency is about 75 W in
    ratings = parse_ratings({"mains": "universal", "bench_mains": "230 V", "output": "19 V", "current": "3.42 A"})
    assert lamp_watts(ratings) == 75
    assert "glows on this unit under load" in lamp_how(ratings)


def test_the_instructions_tell_the_three_outcomes_by_what_is_seen():
    how = lamp_how(parse_ratings({"mains": "230 V", "output": "5 V", "current": "1 A"}))
    # steady bright: a short; flash then dim or dark: healthy; no flash: no path [practice; trade primer 8]
    assert "40 W" in how and "nothing on its output" in how
    assert "a flash, then dim or dark is a healthy unit" in how
    assert "steady bright is a short on the primary" in how
    assert "no flash at all means no path" in how and "says nothing about a short behind it" in how
