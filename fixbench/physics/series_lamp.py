"""The series lamp for a unit: which lamp to use from its ratings, and what the lamp shows.

A filament lamp in series with the mains lead limits the current a short can draw. Choose it from
the unit's input power: about that power, up to two or three times it; 40-60 W at 230 V or
60-100 W at 120 V for chargers and small adapters [practice; the project's trade primer, section 8].
A lamp much smaller than the unit's input power glows, and may stop the unit starting, on a healthy
unit under load, so the unit is powered unloaded and the lamp judged by what is seen at switch-on:

- steady bright: a low-impedance path across the rectified mains (a short on the primary);
- a flash, then dim or dark: the bulk capacitor charging, then a unit that draws little (healthy, or
  a fault past the primary that draws little);
- no flash at all: no path at all (open fuse, thermistor or lead); it proves nothing about a short
  behind the open part [practice; trade primer, section 8].
"""

from __future__ import annotations

from fixbench.physics.ratings import Ratings
from fixbench.physics.sizing import input_power

BRIGHT, FLASH, NO_FLASH = "bright", "flash", "no_flash"
OUTCOMES = (BRIGHT, FLASH, NO_FLASH)
SEEN = {BRIGHT: "steady bright", FLASH: "a flash, then dim or dark", NO_FLASH: "no flash at all"}
LAMP_SIZES_W = (25, 40, 60, 75, 100, 150)  # common incandescent lamp ratings [practice]
SMALLEST_W = {"high": 40, "low": 60}  # at 220-240 V and at 100-127 V mains [practice; trade primer 8]
GLOW_SHARE = 0.5  # input power over this share of the lamp's rating makes it glow under load [practice]


def lamp_watts(ratings: Ratings) -> int:
    """The lamp to use: the smallest common rating at or above the unit's full-load input power and
    the smallest the trade uses at the bench's mains."""
    floor = SMALLEST_W["high" if ratings.bench_mains >= 200 else "low"]
    wanted = max(floor, input_power(ratings))
    return next((w for w in LAMP_SIZES_W if w >= wanted), LAMP_SIZES_W[-1])


def lamp_how(ratings: Ratings) -> str:
    """The step's instructions, with the lamp named from the unit's ratings."""
    watts, drawn = lamp_watts(ratings), input_power(ratings)
    text = (f"Plug the unit into {ratings.bench_mains:.0f} V mains through a {watts} W incandescent lamp "
            f"in series (this unit draws about {drawn:.0f} W at full load), with nothing on its output. "
            f"Watch the lamp as you switch on and say what you see: {SEEN[FLASH]} is a healthy unit "
            f"(the bulk capacitor charging); {SEEN[BRIGHT]} is a short on the primary; "
            f"{SEEN[NO_FLASH]} means no path (open fuse, thermistor or lead) and says nothing about a "
            f"short behind it. Unplug before reading anything else.")
    if drawn > GLOW_SHARE * watts:
        text += (f" A {watts} W lamp glows on this unit under load and may stop it starting: judge it "
                 f"unloaded.")
    return text
