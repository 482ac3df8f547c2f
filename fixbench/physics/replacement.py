"""What to buy for a part that is replaced: the ratings a new part needs, computed from the unit's
ratings and the stresses the physics gives, each rule with its source. A board profile's marking
wins over the family's typical value (the part's value and rating then are the board's).

The stresses, worst case at the top of the unit's mains range:
- bulk rail: the rectified peak of the highest mains, Vbulk_max = sqrt(2) Vac_max - 2 VF
  [src: IEC 60038 Table 1 for +10 %; Power Integrations AN-17: 265 VAC gives 375 V DC];
- switch off-state: Vbulk_max + VOR + leakage spike [src: Power Integrations AN-19];
- primary peak current of a discontinuous flyback at the lowest bulk: 2 Pin / (Vbulk_min Dmax),
  Dmax 0.45 [textbook discontinuous flyback]; its rms Ipk sqrt(D/3) [textbook triangular wave];
- output rectifier reverse voltage: Vout + Vbulk_max Ns/Np [textbook flyback relations].
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from fixbench.knowledge.design import Design
from fixbench.knowledge.model import Part
from fixbench.physics import bulk_rail, flyback
from fixbench.physics.part_values import rated_voltage, value_of
from fixbench.physics.ratings import Ratings
from fixbench.physics.sizing import input_power
from fixbench.quantities import format_quantity

# Switch voltage ratings on the market for chargers and adapters [practice].
SWITCH_SERIES_V = (400.0, 500.0, 600.0, 650.0, 700.0, 800.0, 900.0, 1000.0)
DIODE_SERIES_V = (20.0, 30.0, 40.0, 45.0, 60.0, 100.0, 150.0, 200.0, 400.0, 600.0, 800.0, 1000.0)
CAPACITOR_SERIES_V = (6.3, 10.0, 16.0, 25.0, 35.0, 50.0, 63.0, 100.0, 160.0, 200.0, 250.0, 400.0, 450.0)
POWER_SERIES_W = (0.125, 0.25, 0.5, 1.0, 2.0, 3.0, 5.0)
VOLTAGE_MARGIN = 1.2  # a semiconductor's rating at least 20 % over its worst-case stress [practice: derating]
# The bulk capacitor's rating over the peak of the highest mains (a 400 V part for 265 V mains,
# 375 V peak [practice; AN-17]); that peak is already the worst case.
BULK_MARGIN = 1.05
POWER_DERATING = 2.0  # a resistor run at no more than half its rated power [practice]
SWITCH_CURRENT_MARGIN = 3.0  # switch current rating over the peak primary current [practice]
DIODE_CURRENT_MARGIN = 2.0  # rectifier average current rating over the load current [practice]
RESISTOR_ELEMENT_V = 200.0  # limiting element voltage of a 1206 thick-film resistor [memory: datasheets]
DUTY_MAX = 0.45  # [textbook discontinuous flyback, as sizing.sense_resistance]
CAPACITOR_GRADE_C = 105  # chargers run warm: 105 C electrolytics [practice]


@dataclass(frozen=True)
class Spec:
    """What a new part must be: one line per figure, and where the rules come from."""

    lines: tuple[str, ...]
    sources: tuple[str, ...] = ()

    @property
    def text(self) -> str:
        return "; ".join(self.lines)


def _series(value: float, series: tuple[float, ...]) -> float:
    return next((s for s in series if s >= value), series[-1])


def bulk_max(ratings: Ratings) -> float:
    """The rectified peak of the highest mains the unit is designed for (its label's top, +10 % on a
    single-voltage label: IEC 60038)."""
    return bulk_rail.rectified_peak(ratings.design_high)


def _primary_peak(ratings: Ratings) -> float:
    v_bulk_min = math.sqrt(2.0) * ratings.design_low * 0.8
    return 2.0 * input_power(ratings) / (v_bulk_min * DUTY_MAX)


def _vor(ratings: Ratings) -> float:
    return flyback.reflected_voltage_design(ratings.universal or ratings.design_low > 150)


def replacement_spec(part: Part, ratings: Ratings, design: Design) -> Spec:
    """The ratings a new part playing ``part``'s role must have on a unit of these ratings."""
    rule = _RULES.get(part.role) or _KIND_RULES.get(part.kind)
    spec = rule(part, ratings, design) if rule else Spec(("the same type as fitted",))
    if part.package:
        spec = Spec(spec.lines + (f"package {part.package}",), spec.sources)
    if part.marked and part.kind not in _VALUED:
        spec = Spec((f"marked {part.marking}",) + spec.lines, spec.sources)
    return spec


_VALUED = ("fuse", "thermistor", "electrolytic", "film_capacitor", "resistor", "zener")


def _value_text(part: Part, ratings: Ratings, design: Design, unit: str) -> str:
    value = value_of(part, ratings, design)
    if part.count > 1:
        return f"{part.count} x {format_quantity(value / part.count, unit)} in series"
    return format_quantity(value, unit)


def _fuse(part: Part, ratings: Ratings, design: Design) -> Spec:
    if part.kind != "fuse":  # a fusible resistor
        return _resistor(part, ratings, design, fusible=True)
    amps = value_of(part, ratings, design)
    return Spec((f"{format_quantity(amps, 'A')}", "time-lag (T): a capacitor-input supply draws an inrush",
                 "ceramic body, high breaking capacity, 250 V"),
                ("IEC 60127-2 (time-lag, high breaking capacity); inrush of capacitor-input supplies [practice]",))


def _capacitor(part: Part, ratings: Ratings, design: Design) -> Spec:
    value = _value_text(part, ratings, design, "F")
    working = {"bulk_capacitor": bulk_max(ratings), "output_capacitor": ratings.output_v}.get(part.role)
    if part.marked and part.rated:
        volts = rated_voltage(part, ratings, design)
        voltage = f"{format_quantity(volts, 'V')} (as fitted) or more"
    elif working is not None:
        volts = _series(BULK_MARGIN * working if part.role == "bulk_capacitor" else 1.25 * working,
                        CAPACITOR_SERIES_V)
        voltage = f"{format_quantity(volts, 'V')} or more (works at {format_quantity(working, 'V')})"
    else:
        volts = rated_voltage(part, ratings, design)
        voltage = f"{format_quantity(volts, 'V')} or more"
    lines = [value, voltage, f"{CAPACITOR_GRADE_C} \u00b0C"]
    if part.role in ("output_capacitor", "vcc_capacitor"):
        lines.append("low-ESR (switching-frequency ripple current)")
    return Spec(tuple(lines), ("bulk: the peak of the highest mains [src: AN-17], 5 % over; output: 25 % over "
                               "the output [practice]; 105 C and low ESR [practice]",))


def _resistor(part: Part, ratings: Ratings, design: Design, fusible: bool = False) -> Spec:
    ohms = value_of(part, ratings, design)
    lines = [_value_text(part, ratings, design, "ohm")]
    sources = []
    across = {"start_resistor": bulk_max(ratings), "base_resistor": bulk_max(ratings),
              "clamp_resistor": _vor(ratings)}.get(part.role)
    if across is not None:
        watts = across**2 / ohms
        lines.append(f"{format_quantity(_series(POWER_DERATING * watts, POWER_SERIES_W), 'W')} or more")
        needed = across  # the peak of the highest mains is already the worst case
        each = needed / part.count
        lines.append(f"{format_quantity(each, 'V')} or more across each resistor"
                     + ("" if each <= RESISTOR_ELEMENT_V else
                        f": more than a 1206 chip resistor's {RESISTOR_ELEMENT_V:g} V, so use "
                        f"{math.ceil(needed / RESISTOR_ELEMENT_V)} in series or a high-voltage resistor"))
        sources.append("P = V^2/R at the peak of the highest mains, run at half its rating; chip resistor "
                       "element voltage 200 V [memory: 1206 thick-film datasheets]")
    elif part.role == "sense_resistor":
        i_peak = _primary_peak(ratings)
        watts = i_peak**2 * DUTY_MAX / 3.0 * ohms
        lines.append(f"{format_quantity(_series(POWER_DERATING * watts, POWER_SERIES_W), 'W')} or more, "
                     "non-inductive (metal film or chip)")
        sources.append("I_rms^2 R with I_rms = Ipk sqrt(D/3) [textbook triangular current]")
    elif part.role in ("feedback_upper", "feedback_lower"):
        lines.append("1 % tolerance: it sets the output voltage")
        sources.append("the divider ratio sets Vout [src: TI SLVS543]")
    elif fusible:
        lines.append("fusible (flameproof) type: it is the input fuse")
        sources.append("fusible resistor as the input fuse [practice]")
    return Spec(tuple(lines), tuple(sources))


def _switch(part: Part, ratings: Ratings, design: Design) -> Spec:
    stress = flyback.drain_peak(bulk_max(ratings), _vor(ratings))
    volts = _series(max(VOLTAGE_MARGIN * stress, design.switch_rating_v), SWITCH_SERIES_V)
    amps = SWITCH_CURRENT_MARGIN * _primary_peak(ratings)
    what = {"mosfet": "MOSFET, drain-source", "bjt": "NPN transistor, collector-base",
            "integrated_controller": "the same controller type (its MOSFET is inside), drain"}.get(
        part.kind, "switch")
    return Spec((f"{what} {format_quantity(volts, 'V')} or more (off-state peak about "
                 f"{format_quantity(stress, 'V')})", f"{format_quantity(amps, 'A', 2)} or more",
                 "same package and pin-out as fitted"),
                ("VDS = Vbulk_max + VOR + leakage spike [src: Power Integrations AN-19]; 20 % margin "
                 "and current three times the peak [practice]",))


def _bridge(part: Part, ratings: Ratings, design: Design) -> Spec:
    volts = _series(VOLTAGE_MARGIN * bulk_max(ratings), DIODE_SERIES_V)
    amps = DIODE_CURRENT_MARGIN * input_power(ratings) / (ratings.design_low * 0.55)
    return Spec((f"{format_quantity(volts, 'V')} or more reverse voltage",
                 f"{format_quantity(max(amps, 0.5), 'A', 2)} or more", "standard recovery is fine (mains frequency)"),
                ("reverse voltage: the bulk peak of the highest mains [src: AN-17]; input current at a "
                 "power factor of about 0.55 [practice]",))


def _output_diode(part: Part, ratings: Ratings, design: Design) -> Spec:
    out_diode = 0.5 if design.output_diode == "schottky" else 0.8
    ns_np = 1.0 / flyback.primary_to_secondary_ratio(_vor(ratings), ratings.output_v, out_diode)
    reverse = ratings.output_v + bulk_max(ratings) * ns_np
    volts = _series(VOLTAGE_MARGIN * reverse, DIODE_SERIES_V)
    kind = "Schottky" if design.output_diode == "schottky" else "ultrafast (trr 50 ns or less)"
    return Spec((kind, f"{format_quantity(volts, 'V')} or more reverse voltage (sees about "
                       f"{format_quantity(reverse, 'V')})",
                 f"{format_quantity(DIODE_CURRENT_MARGIN * ratings.output_a, 'A', 2)} or more"),
                ("VR = Vout + Vbulk_max Ns/Np [textbook flyback relations; AN-19 for VOR]; current "
                 "twice the load [practice]",))


def _clamp_diode(part: Part, ratings: Ratings, design: Design) -> Spec:
    stress = flyback.drain_peak(bulk_max(ratings), _vor(ratings))
    return Spec(("fast or ultrafast recovery (a standard rectifier lets the spike through)",
                 f"{format_quantity(_series(VOLTAGE_MARGIN * stress, DIODE_SERIES_V), 'V')} or more"),
                ("the clamp diode blocks the drain peak [src: AN-19]; fast recovery [practice]",))


def _aux_diode(part: Part, ratings: Ratings, design: Design) -> Spec:
    vor = _vor(ratings)
    target = design.vcc_target_v or 15.0
    reverse = target + bulk_max(ratings) * (target / vor)  # Na/Np = Vaux / VOR, plus Vcc
    return Spec(("fast recovery", f"{format_quantity(_series(VOLTAGE_MARGIN * reverse, DIODE_SERIES_V), 'V')} "
                                  "or more"),
                ("the auxiliary winding swings to -Vbulk Na/Np [textbook flyback relations]",))


def _zener(part: Part, ratings: Ratings, design: Design) -> Spec:
    return Spec((f"{format_quantity(value_of(part, ratings, design), 'V')} Zener", "0.5 W"),
                ("the Zener with the opto LED sets the output [practice]",))


def _thermistor(part: Part, ratings: Ratings, design: Design) -> Spec:
    current = input_power(ratings) / (ratings.design_low * 0.55)
    return Spec((f"NTC {_value_text(part, ratings, design, 'ohm')} cold",
                 f"rated for {format_quantity(max(current, 0.5), 'A', 2)} or more steady current"),
                ("input current at a power factor of about 0.55 [practice]",))


_RULES = {
    "fuse": _fuse, "bulk_capacitor": _capacitor, "vcc_capacitor": _capacitor,
    "output_capacitor": _capacitor, "drive_capacitor": _capacitor, "switch": _switch,
    "integrated_switch": _switch, "bridge": _bridge, "output_rectifier": _output_diode, "clamp_diode": _clamp_diode,
    "aux_diode": _aux_diode, "inrush_limiter": _thermistor,
}
_KIND_RULES = {"resistor": _resistor, "zener": _zener, "electrolytic": _capacitor,
               "film_capacitor": _capacitor}
