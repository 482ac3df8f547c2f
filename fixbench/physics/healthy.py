"""The live readings of a healthy unit: the value and band at each signal the checks observe.

Computed from the ratings and the family's design figures with the relations in bulk_rail, flyback,
semiconductors and outputs. Signals a check reads as an outcome (steady/cycling, lamp, symptoms)
get the outcome a healthy unit shows.
"""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.knowledge.design import Design
from fixbench.physics import bulk_rail, flyback, outputs, semiconductors as semi
from fixbench.physics.expectation import Expectation
from fixbench.physics.ratings import Ratings
from fixbench.physics.sizing import bulk_capacitance, input_power

AUX_DIODE_DROP = 0.7  # fast silicon diode at the aux winding's few milliamps [practice]
SCHOTTKY_DROP = 0.5  # output Schottky at rated current [src: onsemi 1N5817/D, SS34 datasheets]
SILICON_DROP = 0.8  # output fast silicon diode at rated current [src: 1N4007-class datasheets, approx.]
RESIDUAL_SAFE_V = 5.0  # volts left on the bulk capacitor that count as discharged [practice]
BULK_RIPPLE_MARGIN = 1.5  # healthy ripple limit over the computed figure (tolerance, ageing) [practice]
# A PFC holds its output within a few percent of its set point at any mains and load [practice].
PFC_BULK_TOLERANCE = 0.035
VCC_RUN_HEADROOM = 6.0  # Vcc of a running controller stays within this above its design point [practice]


@dataclass(frozen=True)
class HealthyUnit:
    """Numeric expectations by signal, outcomes by signal, and the figures behind them."""

    numeric: dict[str, Expectation]
    outcome: dict[str, str]
    figures: dict[str, Expectation]  # thresholds shown to the technician (start/stop Vcc...)


def output_diode_drop(design: Design) -> float:
    return SCHOTTKY_DROP if design.output_diode == "schottky" else SILICON_DROP


def aux_to_secondary(design: Design, ratings: Ratings) -> float:
    """Na/Ns of a controller family: chosen so the auxiliary winding holds Vcc at its design point
    with the output in regulation [textbook flyback relations]."""
    return flyback.aux_turns_for(design.vcc_target_v, ratings.output_v, output_diode_drop(design),
                                 AUX_DIODE_DROP)


def auxiliary_vcc(design: Design, ratings: Ratings, output_v: float) -> float:
    """Vcc the auxiliary winding gives with the output at ``output_v``: it mirrors the output through
    Na/Ns, Vaux = (Vo + VD) Na/Ns - VDa [textbook flyback relations]. At 0.4 x Vo it is about 0.4 of
    the design point, under every controller's stop threshold."""
    if output_v <= 0.0:
        return 0.0
    return max(flyback.auxiliary_voltage(output_v, output_diode_drop(design), aux_to_secondary(design, ratings),
                                         AUX_DIODE_DROP), 0.0)


def healthy_unit(design: Design, ratings: Ratings) -> HealthyUnit:
    peak = bulk_rail.rectified_peak(ratings.bench_mains)
    peak_low = bulk_rail.rectified_peak(ratings.bench_low)
    peak_high = bulk_rail.rectified_peak(ratings.bench_high)
    capacitance = bulk_capacitance(ratings, design)
    p_in = input_power(ratings)
    rail = bulk_rail.rail_at_load(ratings.bench_mains, ratings.mains_hz, capacitance, p_in, design.source_ohm)
    v_min, ripple = rail.v_min, rail.ripple
    out_low, out_high = outputs.output_window(ratings.output_v)
    f_sw = design.switching_hz if ratings.switching_hz is None else ratings.switching_hz
    f_tol = design.switching_tolerance
    vor = flyback.reflected_voltage_design(ratings.universal or ratings.design_low > 150)
    numeric = {
        "bulk_voltage": Expectation(peak, peak_low, peak_high, "V"),
        "bulk_ripple": Expectation(ripple, None, BULK_RIPPLE_MARGIN * ripple, "V"),
        "switching_frequency": Expectation(f_sw, f_sw * (1 - f_tol), f_sw * (1 + f_tol), "Hz"),
        "output_voltage": Expectation(ratings.output_v, out_low, out_high, "V"),
        "output_loaded": Expectation(ratings.output_v, out_low, out_high, "V"),
        "plug_voltage": Expectation(ratings.output_v, out_low, out_high, "V"),
        "output_ripple": Expectation(None, None, outputs.ripple_limit(ratings.output_v), "V"),
        "opto_led_voltage": Expectation(1.1, semi.OPTO_LED_VF_MIN_LIT, semi.OPTO_LED_VF_MAX, "V"),
        "residual_bulk": Expectation(0.0, None, RESIDUAL_SAFE_V, "V"),
        "bridge_ac": Expectation(ratings.bench_mains, ratings.bench_low, ratings.bench_high, "V"),
    }
    figures = {}
    if design.pfc_bulk_v is not None:
        # With the PFC running the bulk sits at its set point whatever the mains; stopped, at the
        # rectified peak [practice; trade primer section 9].
        boosted = design.pfc_bulk_v
        numeric["bulk_voltage"] = Expectation(boosted, boosted * (1 - PFC_BULK_TOLERANCE),
                                              boosted * (1 + PFC_BULK_TOLERANCE), "V")
        numeric["pfc_frequency"] = Expectation(design.pfc_hz, design.pfc_hz * (1 - f_tol),
                                               design.pfc_hz * (1 + f_tol), "Hz")
        figures["bulk_without_pfc"] = Expectation(peak, peak_low, peak_high, "V")
    bulk = numeric["bulk_voltage"].nominal
    numeric["drain_peak"] = Expectation(flyback.drain_peak(bulk, vor), bulk + 0.5 * vor,
                                        0.95 * design.switch_rating_v, "V")
    if design.feedback == "opto_tl431":
        grade = semi.TL431_VREF["plain"]
        numeric["feedback_reference"] = Expectation(grade.typical, grade.low, grade.high, "V")
    if design.drive == "controller":
        start, stop, target = design.start_v, design.stop_v, design.vcc_target_v
        numeric["vcc_voltage"] = Expectation(target, stop + 0.5, target + VCC_RUN_HEADROOM, "V")
        figures["vcc_start"] = Expectation(start, None, None, "V")
        figures["vcc_stop"] = Expectation(stop, None, None, "V")
        # The auxiliary winding: Na/Ns chosen to hold Vcc at its design point with the output in
        # regulation; on a scope at the aux diode's anode it swings to (Vo + VD) Na/Ns during the
        # flyback interval and to -Vbulk Na/Np while the switch conducts [textbook flyback relations].
        out_diode = output_diode_drop(design)
        na_ns = aux_to_secondary(design, ratings)
        ns_np = 1.0 / flyback.primary_to_secondary_ratio(vor, ratings.output_v, out_diode)
        flyback_v = (ratings.output_v + out_diode) * na_ns
        figures["aux_flyback"] = Expectation(flyback_v, None, None, "V")
        figures["aux_forward"] = Expectation(-bulk * na_ns * ns_np, None, None, "V")
        figures["aux_rectified"] = Expectation(auxiliary_vcc(design, ratings, ratings.output_v), None, None, "V")
    else:
        # Base of a self-oscillating switch: the meter averages the drive to a few tenths of a volt,
        # negative-going drive pulls it below zero [practice].
        numeric["base_voltage"] = Expectation(-0.3, -1.5, -0.05, "V")
    figures["bulk_minimum_at_load"] = Expectation(v_min, None, None, "V")
    figures["bulk_capacitance"] = Expectation(capacitance, None, None, "F")
    outcome = {
        "vcc_behaviour": "steady", "lamp": "flash",
        **{s: "no" for s in ("dead", "intermittent", "output_low", "output_high", "ticking", "whine",
                             "hot", "fuse_blackened", "bulged", "scorched", "burnt_smell")},
    }
    return HealthyUnit(numeric, outcome, figures)
