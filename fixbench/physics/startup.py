"""Start-up of a controller fed by a start-up resistor: how long Vcc takes to reach the start
threshold, and the period of the hiccup when the auxiliary winding cannot hold it up.

Charging: the start-up resistor feeds I = (Vbulk - Vcc) / R into the Vcc capacitor (the controller
draws well under a milliamp before it starts), so the time from stop to start threshold is
t = C * (Vstart - Vstop) / I. Once running the controller draws its operating current and, with no
help from the auxiliary winding, pulls Vcc from start back to stop in t = C * (Vstart - Vstop) / Irun
[src: textbook capacitor charge, I = C dV/dt; the threshold figures from the controller datasheets].
"""

from __future__ import annotations

from dataclasses import dataclass

# Operating supply current of a UC384x-class controller driving a small MOSFET [memory: about 11 mA
# typical without gate charge in the UC3842 datasheet; gate charge adds a few mA].
RUN_CURRENT = 0.012


@dataclass(frozen=True)
class Hiccup:
    """Vcc saw-tooth between the stop and start thresholds, and its repeat period."""

    vcc_low: float
    vcc_high: float
    charge_s: float
    run_s: float

    @property
    def period_s(self) -> float:
        return self.charge_s + self.run_s


def start_delay(capacitance: float, start_v: float, r_start: float, bulk_v: float) -> float:
    """Seconds from plugging in until Vcc first reaches the start threshold (from 0 V)."""
    current = (bulk_v - start_v / 2) / r_start
    return capacitance * start_v / current


def hiccup(capacitance: float, start_v: float, stop_v: float, r_start: float, bulk_v: float,
           run_current: float = RUN_CURRENT) -> Hiccup:
    """The saw-tooth a controller makes when its Vcc is not held up once it runs."""
    swing = start_v - stop_v
    charge_current = (bulk_v - (start_v + stop_v) / 2) / r_start
    return Hiccup(stop_v, start_v, capacitance * swing / charge_current, capacitance * swing / run_current)
