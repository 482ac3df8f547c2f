"""What a healthy part reads on a cold check (unplugged, discharged), by kind of part and instrument.

Meter figures are for a handheld meter on the part in circuit unless the how-to says to lift a leg.
"""

from __future__ import annotations

from fixbench.knowledge.design import Design
from fixbench.knowledge.model import Part
from fixbench.physics import semiconductors as semi
from fixbench.physics.capacitors import ELECTROLYTIC_TOLERANCE, esr_new_max, esr_suspect_above
from fixbench.physics.expectation import Expectation
from fixbench.physics.ratings import Ratings
from fixbench.physics.sizing import part_value

RESISTOR_TOLERANCE = 0.05  # common 5 % parts [practice]
# In circuit, parallel paths pull a resistor's reading down; 20 % low is still taken as good [practice].
IN_CIRCUIT_LOW = 0.80
FUSE_MAX_OHM = 1.0  # a good glass or ceramic fuse reads well under an ohm [practice]
LEAD_MAX_OHM = 1.0  # a good charger cable's conductor reads well under an ohm [practice]
SWITCH_OFF_MIN_OHM = 100e3  # a good MOSFET/transistor drain-source (collector-emitter) reads high [practice]
CONTROLLER_VCC_MIN_OHM = 1e3  # Vcc pin to ground reads at least kilohms once the cap has charged [practice]
THERMISTOR_TOLERANCE = 0.25  # NTC cold resistance tolerance at room temperature [practice]
WINDING_BAND = (0.2, 10.0)  # ohm, primary winding of chargers and adapters [practice]
OPTO_LED_DIODE_TEST = (0.9, 1.3)  # infrared LED on a meter's diode test [practice]
TL431_DIODE_TEST = (0.55, 0.85)  # anode-to-cathode junction of a TL431 on diode test [practice]

VALUE_UNITS = {"fuse": "A", "thermistor": "ohm", "electrolytic": "F", "film_capacitor": "F",
               "resistor": "ohm", "transformer": "ohm", "zener": "V"}


def value_of(part: Part, ratings: Ratings, design: Design) -> float | None:
    """The part's nominal value in SI units (capacitance, resistance, fuse current...)."""
    unit = VALUE_UNITS.get(part.kind)
    return part_value(part.value, unit, ratings, design) if unit else None


def rated_voltage(part: Part, ratings: Ratings, design: Design) -> float:
    return part_value(part.rated, "V", ratings, design) if part.rated else 25.0


def cold_expectation(part: Part, instrument: str, ratings: Ratings, design: Design) -> Expectation:
    """What a healthy ``part`` reads with ``instrument`` on a cold check."""
    kind = part.kind
    value = value_of(part, ratings, design)
    if instrument == "ohmmeter":
        if kind == "fuse":
            return Expectation(0.05, 0.0, FUSE_MAX_OHM, "ohm")
        if kind == "lead":
            return Expectation(0.2, 0.0, LEAD_MAX_OHM, "ohm")
        if kind == "thermistor":
            return Expectation(value, value * (1 - THERMISTOR_TOLERANCE), value * (1 + THERMISTOR_TOLERANCE), "ohm")
        if kind == "resistor":
            return Expectation(value, value * IN_CIRCUIT_LOW, value * (1 + RESISTOR_TOLERANCE), "ohm")
        if kind == "transformer":
            return Expectation(value, *WINDING_BAND, "ohm")
        if kind in ("mosfet", "bjt"):
            return Expectation(None, SWITCH_OFF_MIN_OHM, None, "ohm")
        if kind == "controller":
            return Expectation(None, CONTROLLER_VCC_MIN_OHM, None, "ohm")
    if instrument == "diode_test":
        band = {
            "bridge": semi.DIODE_TEST_SILICON, "rectifier_diode": semi.DIODE_TEST_SILICON,
            "fast_diode": semi.DIODE_TEST_FAST, "schottky": semi.DIODE_TEST_SCHOTTKY,
            "zener": semi.DIODE_TEST_SILICON, "optocoupler": OPTO_LED_DIODE_TEST,
            "tl431": TL431_DIODE_TEST, "bjt": semi.DIODE_TEST_SILICON,
            "mosfet": semi.DIODE_TEST_SILICON,  # the body diode, source to drain [practice]
        }.get(kind)
        if band:
            return Expectation((band[0] + band[1]) / 2, band[0], band[1], "V")
    if instrument == "capacitance" and kind in ("electrolytic", "film_capacitor"):
        tol = ELECTROLYTIC_TOLERANCE if kind == "electrolytic" else 0.10
        return Expectation(value, value * (1 - tol), value * (1 + tol), "F")
    if instrument == "esr" and kind == "electrolytic":
        rated = rated_voltage(part, ratings, design)
        return Expectation(esr_new_max(value, rated), None, esr_suspect_above(value, rated), "ohm")
    raise ValueError(f"no cold reading for a {kind} ({part.id}) with instrument '{instrument}'")
