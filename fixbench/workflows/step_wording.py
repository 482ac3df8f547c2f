"""The words a step card uses: power state, instrument, meter range and the expected value.

Plain Python so it can be tested without a window. Every quantity goes through the one formatter
(fixbench.quantities.format_quantity).
"""

from __future__ import annotations

import math

from fixbench.quantities import format_quantity

POWER_WORDS = {
    "none": "No power: ask, look, listen",
    "cold": "UNPLUGGED, bulk capacitor confirmed discharged",
    "lamp": "LIVE through the series lamp",
    "live": "LIVE on mains (through the isolation transformer)",
}
POWER_SHORT = {"none": "no power", "cold": "unplugged", "lamp": "live, series lamp", "live": "live, mains"}
INSTRUMENT_WORDS = {
    "ohmmeter": "Meter on ohms", "diode_test": "Meter on diode test", "capacitance": "Capacitance meter",
    "esr": "ESR meter", "dc_volts": "Meter on DC volts", "ac_volts": "Meter on AC volts",
    "ripple": "Scope, AC coupled (ripple)", "frequency": "Scope or frequency meter",
    "eyes": "Look", "ears": "Listen", "nose": "Smell", "series_lamp": "Series lamp",
    "question": "Ask the customer or try the unit",
}
# Ranges of an ordinary handheld meter, per unit (the top one is the meter's limit) [practice].
METER_RANGES = {
    "V": (0.2, 2.0, 20.0, 200.0, 600.0, 1000.0),
    "ohm": (200.0, 2e3, 20e3, 200e3, 2e6, 20e6),
    "F": (2e-9, 20e-9, 200e-9, 2e-6, 20e-6, 200e-6, 2e-3, 20e-3),
}
RANGE_MARGIN = 1.2  # pick a range at least this far above the highest healthy value
POWERED = ("lamp", "live")


def meter_range(instrument: str, unit: str | None, low: float | None, high: float | None,
                nominal: float | None) -> str:
    """The range to set, e.g. 'range 600 V (or auto)'; empty where ranges mean nothing."""
    if instrument == "diode_test":
        return "diode range"
    if instrument in ("esr", "frequency", "ripple") or unit not in METER_RANGES:
        return "auto range" if unit else ""
    if instrument == "ohmmeter" and (high is None or math.isinf(high)):
        return "highest ohms range (reads OL when healthy)"
    top = high if high is not None else nominal if nominal is not None else low
    if top is None:
        return "auto range"
    wanted = abs(top) * RANGE_MARGIN
    for limit in METER_RANGES[unit]:
        if limit >= wanted:
            return f"range {format_quantity(limit, unit)} (or auto)"
    return f"range {format_quantity(METER_RANGES[unit][-1], unit)}: above the meter's limit, stop"


def expected_words(proposal) -> tuple[str, str]:
    """(big line, band line) for what a healthy unit shows at this step."""
    if proposal.expected is not None:
        e = proposal.expected
        from fixbench.quantities import format_band

        big = format_quantity(e.nominal, e.unit) if e.nominal is not None else format_band(e.low, e.high, e.unit)
        band = f"healthy band {format_band(e.low, e.high, e.unit)}"
        return big, band
    if proposal.expected_outcome is not None:
        return proposal.expected_outcome, "what a healthy unit gives"
    return "-", ""


def point_words(family, check) -> str:
    titles = [family.test_point(p).title for p in check.points]
    if not titles:
        return ""
    if len(titles) == 1:
        return f"At: {titles[0]}"
    return "Between: " + " and ".join(titles)


def entry_hint(check) -> str:
    if check.unit is None:
        return f"type {' / '.join(_outcomes(check))} and press Enter"
    return f"type the reading in {check.unit} (for example with k, m, u) or OL, and press Enter"


def _outcomes(check) -> tuple[str, ...]:
    return check.outcomes or ("yes", "no")


def outcome_names(state, check_id: str) -> tuple[str, ...]:
    """The answers an outcome check takes (from the engine's classes of that check)."""
    model = state.model
    return tuple(model.checks[model.check_index(check_id)].classes.names)
