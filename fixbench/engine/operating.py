"""The operating model: from the state of every part to what the unit does when powered.

Theory of operation. Power is followed stage by stage in the order the family graph gives (mains
input, rectifier, bulk, start-up, drive, switch, transformer, output rectifier, output filter,
lead); the feedback stage is a control stage, so its set-point (regulating, open loop, pulled low) is
found first, from its own parts, and handed to the drive. Each stage reads the modes of the parts
that play a role in it (``fuse``, ``start_resistor``, ``switch`` ...) and the results of the stages
before it, and writes the signals it produces. The result is an operating state (no power, no start,
hiccup, running regulated, running high, running low, excessive ripple) and a value for every
signal a live check reads, plus outcome probabilities for the symptoms a customer or a look reports.

Figures for failed units (a hiccuping output averages to a small fraction of its rating, an open
loop runs well above it, ...) are the trade's usual observations [practice; the project's trade
primer, section 6]; healthy figures come from :mod:`fixbench.physics.healthy`.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from functools import lru_cache

from fixbench.knowledge.graph import power_order
from fixbench.knowledge.model import Family
from fixbench.physics import bulk_rail, series_lamp
from fixbench.physics.healthy import HealthyUnit, auxiliary_vcc
from fixbench.physics.ratings import Ratings
from fixbench.physics.sizing import bulk_capacitance, input_power, part_value
from fixbench.physics.startup import Hiccup, hiccup

from fixbench.engine.front_end import pfc_stage, settle_bulk
from fixbench.engine.part_readings import DRIED_CAPACITANCE

HICCUP_OUTPUT = 0.15  # meter average of a pulsing output, fraction of rated [practice]
OPEN_LOOP_OUTPUT = 1.6  # output with no feedback, before the device or protection stops it [practice]
PULLED_LOW_OUTPUT = 0.4  # output with feedback stuck full on (bursting) [practice]
DRIED_OUTPUT_SAG = 0.9  # loaded output with a dried output capacitor [practice]
WEAK_LIMIT_SAG = 0.6  # loaded output with a current-limit set too low [practice]
HEALTHY_RIPPLE_FRACTION = 0.4  # healthy output ripple as a share of its limit [practice]
BURST_FREQUENCY = 0.2  # a frequency meter on a bursting gate reads a fraction of the clock [practice]
PRIMARY_SHORT_ROLES = ("bridge", "bulk_capacitor", "switch", "pfc_switch", "boost_diode")
# An integrated controller is the controller and its switch in one part: a shorted drain is a
# shorted switch (the whole IC is gone), a dead one is a dead controller.
INTEGRATED_READS_AS = {"switch": {"short": "short"}, "controller": {"dead": "dead", "short": "dead"}}
STATES = ("no_power", "no_start", "hiccup", "running_regulated", "running_high", "running_low",
          "excessive_ripple")


@dataclass(frozen=True)
class Operation:
    """What the unit does under plain mains: its state, numeric signals and outcome chances."""

    state: str
    values: dict[str, float]
    outcomes: dict[str, dict[str, float]]
    primary_short: bool
    fuse_blows: bool  # plain mains would (again) blow the fuse
    hiccup: Hiccup | None = None  # Vcc saw-tooth and its period, where the controller restarts
    # Parts that fail within the first switching cycles of a power-up (part id, mode): the values
    # and outcomes above are those of the unit after that damage.
    damage: tuple[tuple[str, str], ...] = ()


@dataclass
class _Work:
    """The signals as the stages write them, in the order power reaches them."""

    family: Family
    ratings: Ratings
    healthy: HealthyUnit
    modes: dict[str, str]
    values: dict[str, float] = field(default_factory=dict)
    flags: dict[str, object] = field(default_factory=dict)

    def mode(self, role: str) -> str:
        for part in self.family.parts_with_role(role):
            mode = self.modes.get(part.id, "ok")
            if mode != "ok":
                return mode
        if role in INTEGRATED_READS_AS:
            for part in self.family.parts_with_role("integrated_switch"):
                if self.modes.get(part.id, "ok") in INTEGRATED_READS_AS[role]:
                    return INTEGRATED_READS_AS[role][self.modes[part.id]]
        return "ok"

    @property
    def integrated(self) -> bool:
        """The switch sits inside the controller's package and starts it from its drain pin."""
        return bool(self.family.parts_with_role("integrated_switch"))

    def nominal(self, signal: str) -> float:
        return self.healthy.numeric[signal].nominal

    @property
    def v_out(self) -> float:
        return self.ratings.output_v


def _feedback(w: _Work) -> None:
    """Set-point of the loop, from the feedback parts alone (a control stage: evaluated first)."""
    loop = "regulating"
    upper, lower, reference = w.mode("feedback_upper"), w.mode("feedback_lower"), w.mode("shunt_reference")
    if w.mode("optocoupler") == "open" or reference == "open" or upper == "open":
        loop = "open"
    if reference == "short" or lower == "open" or w.mode("optocoupler") == "short":
        loop = "pulled_low"
    if w.mode("cutoff_transistor") == "open":
        loop = "open"  # self-oscillating: the opto acts through the cut-off transistor
    w.flags["loop"] = loop


def _input(w: _Work) -> None:
    shorts = [role for role in PRIMARY_SHORT_ROLES if w.mode(role) == "short"]
    w.flags["primary_short"] = bool(shorts)
    w.flags["fuse_open"] = w.mode("fuse") == "open"
    w.flags["path_open"] = w.flags["fuse_open"] or w.mode("inrush_limiter") == "open"
    # Plain mains on a short: the fuse goes (again); nothing downstream sees power.
    w.flags["mains_ok"] = not w.flags["path_open"] and not shorts
    w.values["bridge_ac"] = w.nominal("bridge_ac") if w.flags["mains_ok"] else 0.0


def _rectifier(w: _Work) -> None:
    w.flags["half_wave"] = w.mode("bridge") == "open"


def _bulk(w: _Work) -> None:
    if not w.flags["mains_ok"]:
        w.values.update(bulk_voltage=0.0, bulk_ripple=0.0, drain_peak=0.0)
        return
    peak = w.nominal("bulk_voltage")
    capacitance = bulk_capacitance(w.ratings, w.family.design)
    if w.mode("bulk_capacitor") == "dried":
        capacitance *= DRIED_CAPACITANCE
    hz = w.ratings.mains_hz / (2.0 if w.flags["half_wave"] else 1.0)
    rail = bulk_rail.rail_at_load(w.ratings.bench_mains, hz, capacitance, input_power(w.ratings),
                                  w.family.design.source_ohm)
    w.values.update(bulk_voltage=peak, bulk_ripple=rail.ripple)
    w.flags["bulk_sags"] = w.values["bulk_ripple"] > w.healthy.numeric["bulk_ripple"].high


def _startup_and_drive(w: _Work) -> None:
    """Whether the switch is driven, and the Vcc the controller sees."""
    design = w.family.design
    if not w.flags["mains_ok"] or w.flags.get("bulk_dead"):
        w.flags["drive"] = "none"
        return
    if design.drive == "self_oscillating":
        if w.mode("base_resistor") == "open" or w.mode("cutoff_transistor") == "short":
            w.flags["drive"] = "none"
        elif w.mode("drive_resistor") == "open" or w.mode("sense_resistor") == "open":
            w.flags["drive"] = "stalled"  # base held up, no feedback winding drive: no oscillation
        elif w.mode("drive_capacitor") == "open":
            # No path from the feedback winding to the base: nothing keeps the switch on once the
            # bias resistor has turned it on, as with an open drive resistor [practice].
            w.flags["drive"] = "stalled"
        elif w.mode("drive_capacitor") in ("dried", "short"):
            w.flags["drive"] = "bursting"
        else:
            w.flags["drive"] = "running"
        return
    if w.mode("controller") == "short" or w.mode("vcc_capacitor") == "short":
        w.flags["drive"], w.values["vcc_voltage"] = "none", 0.3
    elif w.mode("start_resistor") == "open":
        w.flags["drive"], w.values["vcc_voltage"] = "none", 0.0
    elif w.mode("aux_diode") == "short":
        # Vcc joined to the auxiliary winding, a few ohms to primary ground: the start-up current
        # (a fraction of a milliamp) leaves millivolts on Vcc; the controller never starts.
        w.flags["drive"], w.values["vcc_voltage"] = "none", 0.0
    elif w.mode("controller") == "dead" and w.integrated:
        # The start-up current source off the drain charges the supply pin to the start threshold;
        # the part never switches, so the pin sags to the stop threshold and the source starts again
        # [src: ST VIPer22A datasheet, start-up and auto-restart; practice]: cycling, silently.
        w.flags["drive"] = "idle"
    elif w.mode("controller") == "dead":
        w.flags["drive"], w.values["vcc_voltage"] = "latched", design.vcc_clamp_v
    elif w.mode("optocoupler") == "short":
        # The opto transistor holds the error amplifier's output (COMP/FB) at ground: below its two
        # diode offsets the current-sense reference is zero and no gate pulse leaves the controller
        # [src: UC3842 datasheet, block diagram and error-amplifier section]. The controller starts,
        # draws its running current with no help from the auxiliary winding and stops at its stop
        # threshold: Vcc cycles, silently, with the drive off.
        w.flags["drive"] = "idle"
    elif w.mode("vcc_capacitor") == "dried" or w.mode("aux_diode") != "ok":
        w.flags["drive"] = "bursting"  # starts, cannot hold Vcc until the aux winding takes over
    else:
        w.flags["drive"] = "running"


def _switch_and_transfer(w: _Work) -> None:
    """Whether energy reaches the secondary, and what shuts it down."""
    drive = w.flags["drive"]
    transfer = drive in ("running", "bursting")
    if w.mode("switch") == "open" or w.mode("gate_resistor") == "open" or w.mode("transformer") == "open":
        transfer = False
    if w.family.design.drive == "controller" and w.mode("sense_resistor") == "open":
        transfer = False
    output_shorted = w.mode("output_rectifier") == "short" or w.mode("output_capacitor") == "short"
    no_secondary = w.mode("output_rectifier") == "open"
    self_oscillating = w.family.design.drive == "self_oscillating"
    if self_oscillating and drive in ("running", "bursting") and not transfer:
        drive = "stalled"  # no collector current, no feedback-winding drive: nothing restarts it
    elif drive == "running" and (not transfer or output_shorted or no_secondary):
        drive = "bursting"  # nothing comes back on the aux winding: the controller restarts
    elif drive == "running" and w.integrated and w.flags["loop"] == "open":
        # Integrated parts stop on an open loop and restart after a delay: the unit ticks rather
        # than running high [src: ST VIPer22A datasheet, overvoltage protection in hiccup mode;
        # Power Integrations LinkSwitch datasheets, auto-restart on open loop].
        drive = "bursting"
    elif drive == "running" and not self_oscillating:
        # The auxiliary winding mirrors the output the loop holds; under the stop threshold the
        # controller stops and restarts from the start-up resistor: a loop held low hiccups
        # [src: UC3842 datasheet, UVLO 16 V on / 10 V off; textbook flyback aux relation].
        design = w.family.design
        aux = min(auxiliary_vcc(design, w.ratings, _held_output(w)), design.vcc_clamp_v)
        w.values["vcc_voltage"] = aux
        if aux < design.stop_v:
            drive = "bursting"
    # Energy reaches the transformer in pulses that a person hears (ticking) only while the switch
    # conducts; a controller cycling on its Vcc with the switch, its drive or the primary open is silent.
    audible = transfer and drive in ("running", "bursting")
    w.flags.update(drive=drive, transfer=transfer, output_shorted=output_shorted, no_secondary=no_secondary,
                   audible=audible)


def _held_output(w: _Work) -> float:
    """The output the feedback loop holds while the unit runs (no load)."""
    factor = {"open": OPEN_LOOP_OUTPUT, "pulled_low": PULLED_LOW_OUTPUT}.get(w.flags["loop"], 1.0)
    return factor * w.v_out


def _output(w: _Work) -> None:
    """Output on the board at no load and at rated load, and its ripple."""
    vo, limit = w.v_out, w.healthy.numeric["output_ripple"].high
    drive, loop = w.flags.get("drive", "none"), w.flags["loop"]
    if not w.flags.get("transfer") or drive == "none":
        no_load = loaded = ripple = 0.0
    elif w.flags["output_shorted"]:
        no_load = loaded = ripple = 0.02
    elif w.flags["no_secondary"]:
        no_load = loaded = ripple = 0.0
    elif drive == "bursting":
        no_load, loaded, ripple = HICCUP_OUTPUT * vo, 0.5 * HICCUP_OUTPUT * vo, 5 * limit
    elif loop == "open":
        no_load, loaded, ripple = OPEN_LOOP_OUTPUT * vo, 1.3 * vo, 2 * limit
    elif loop == "pulled_low":
        no_load, loaded, ripple = PULLED_LOW_OUTPUT * vo, 0.3 * vo, 2 * limit
    else:
        no_load, loaded, ripple = vo, vo, HEALTHY_RIPPLE_FRACTION * limit
        if w.mode("output_capacitor") == "dried":
            loaded, ripple = DRIED_OUTPUT_SAG * vo, 6 * limit
        if w.mode("sense_resistor") == "drift":
            loaded = WEAK_LIMIT_SAG * vo
        if w.flags.get("bulk_sags"):
            ripple = max(ripple, 2 * limit)  # mains-frequency ripple gets through
    w.values.update(output_voltage=no_load, output_loaded=loaded, output_ripple=ripple)
    w.values["plug_voltage"] = 0.0 if w.mode("lead") == "open" else no_load


def _control_signals(w: _Work) -> None:
    """Vcc, drive frequency, drain peak, feedback reference, opto LED, switch base."""
    design, values, drive, loop = w.family.design, w.values, w.flags.get("drive", "none"), w.flags["loop"]
    f_sw = w.nominal("switching_frequency")
    if design.drive == "controller":
        start, stop = design.start_v, design.stop_v
        if drive in ("bursting", "idle"):
            values["vcc_voltage"] = (start + stop) / 2  # a meter averages the saw-tooth
        values.setdefault("vcc_voltage", 0.0)
        values["vcc_behaviour"] = values["vcc_voltage"]
    if drive == "running":
        # Feedback held full on: a PWM controller skips cycles (lower average rate); a ringing-choke
        # converter runs faster at light load [src: EP1150417, paragraphs 0002-0003].
        light = 1.5 if design.drive == "self_oscillating" else 0.3
        frequency = f_sw * (light if loop == "pulled_low" else 1.0)
    elif drive == "bursting":
        frequency = BURST_FREQUENCY * f_sw
    else:
        frequency = 0.0
    if w.mode("gate_resistor") == "open":
        frequency = 0.0  # measured at the gate
    values["switching_frequency"] = frequency
    bulk = values.get("bulk_voltage", 0.0)
    if w.mode("transformer") == "open":
        values["drain_peak"] = 0.0  # no path from bulk + to the drain: it sits at the source
    elif frequency == 0.0 or not w.flags.get("transfer"):
        values["drain_peak"] = bulk  # through the primary's few ohms, the switch off
    else:
        values["drain_peak"] = w.nominal("drain_peak")
    out = values["output_voltage"]
    if "feedback_reference" in w.healthy.numeric:
        ref = w.nominal("feedback_reference")
        if w.mode("feedback_upper") == "open":
            values["feedback_reference"] = 0.0
        elif w.mode("feedback_lower") == "open":
            values["feedback_reference"] = out
        else:
            values["feedback_reference"] = ref * out / w.v_out
    lit = w.nominal("opto_led_voltage")
    if out == 0.0:
        values["opto_led_voltage"] = 0.0
    elif out < 0.5 * w.v_out and loop == "regulating":
        values["opto_led_voltage"] = 0.0 if out == 0.0 else 0.3
    elif w.mode("optocoupler") == "open":
        values["opto_led_voltage"] = min(2.5, out)
    elif w.mode("optocoupler") == "short":
        values["opto_led_voltage"] = 0.6  # output held low: the shunt is off, the LED barely lit
    elif loop == "open":
        values["opto_led_voltage"] = 0.6  # LED unlit: the shunt does not conduct
    elif loop == "pulled_low":
        values["opto_led_voltage"] = 1.25 if out > 0 else 0.0
    else:
        values["opto_led_voltage"] = lit
    if design.drive == "self_oscillating":
        base = {"running": -0.3, "bursting": 0.2, "stalled": 0.7, "none": 0.0}[drive]
        values["base_voltage"] = base if w.flags["mains_ok"] else 0.0


def _symptoms(w: _Work, state: str) -> dict[str, dict[str, float]]:
    """Chances that a customer reports, or a first look finds, each symptom [practice]."""
    vo, values = w.v_out, w.values
    plug_dead = values["plug_voltage"] < 0.3 * vo
    loaded_low = values["output_loaded"] < w.healthy.numeric["output_loaded"].low
    dried_out = w.mode("output_capacitor") == "dried"
    dried_bulk = w.mode("bulk_capacitor") == "dried"
    hiccup = state == "hiccup" and bool(w.flags.get("audible"))  # heard only when energy is moved
    chance = {
        "dead": 0.9 if plug_dead else 0.25,
        "intermittent": 0.85 if w.mode("lead") == "open" else 0.3 if (dried_out or dried_bulk) else 0.05,
        "output_low": 0.7 if (state == "running_low" or (loaded_low and not plug_dead)) else 0.05,
        "output_high": 0.7 if state == "running_high" else 0.03,
        "ticking": 0.8 if hiccup else 0.4 if w.mode("sense_resistor") == "drift" else 0.03,
        "whine": 0.4 if (dried_out or dried_bulk) else 0.3 if hiccup else 0.05,
        "hot": 0.35 if (dried_out or state == "running_high") else 0.05,
        "fuse_blackened": 0.85 if (w.flags["primary_short"] and w.flags["fuse_open"]) else
                          0.2 if w.flags["fuse_open"] else 0.01,
        "bulged": 0.6 if dried_out else 0.35 if dried_bulk else 0.02,
        "scorched": 0.6 if w.mode("switch") == "short" else 0.3 if w.flags["primary_short"] else 0.03,
        "burnt_smell": 0.5 if w.flags["primary_short"] else 0.05,
    }
    return {name: {"yes": p, "no": 1.0 - p} for name, p in chance.items()}


def _state(w: _Work) -> str:
    if not w.flags["mains_ok"]:
        return "no_power"
    drive = w.flags.get("drive", "none")
    if drive in ("none", "latched", "stalled") or (drive == "running" and not w.flags["transfer"]):
        return "no_start"
    if drive in ("bursting", "idle"):
        return "hiccup"
    out, loaded = w.values["output_voltage"], w.values["output_loaded"]
    band = w.healthy.numeric["output_voltage"]
    if out > band.high:
        return "running_high"
    if out < band.low or loaded < band.low:
        return "running_low"
    if w.values["output_ripple"] > w.healthy.numeric["output_ripple"].high or w.flags.get("bulk_sags"):
        return "excessive_ripple"
    return "running_regulated"


# Stage role -> what it computes, in causal order. Feedback runs first (a control stage); these
# follow in the order power reaches their stages, which every family must agree with. A family
# may leave out the optional ones (an active PFC front end).
OPTIONAL_STEPS = ("pfc",)
STAGE_STEPS = {
    "input": _input, "rectifier": _rectifier, "pfc": pfc_stage, "bulk": _bulk, "startup": _startup_and_drive,
    "switch": _switch_and_transfer, "output_filter": _output,
}


@lru_cache(maxsize=None)
def stage_steps(family: Family) -> tuple:
    """The family's stages in power order, as the steps above. A family whose graph lacks one of
    these stages, or orders them otherwise, cannot be run: that is said once, loudly."""
    roles = [role for role in dict.fromkeys(family.stage(s).role for s in power_order(family))
             if role in STAGE_STEPS]
    needed = [role for role in STAGE_STEPS if role not in OPTIONAL_STEPS or role in roles]
    if roles != needed:
        raise ValueError(f"{family.source_file}: the operating model needs stages with roles "
                         f"{', '.join(needed)} in that power order; the family gives {', '.join(roles)}")
    return tuple(STAGE_STEPS[role] for role in roles)


def operate(family: Family, ratings: Ratings, healthy: HealthyUnit, modes: dict[str, str]) -> Operation:
    """Run the unit with parts in ``modes`` (part id -> mode; missing means healthy) on plain mains."""
    w = _Work(family, ratings, healthy, modes)
    _feedback(w)
    for step in stage_steps(family):
        step(w)
    settle_bulk(w)  # a PFC front end boosts the bulk once the controller's Vcc is up
    _control_signals(w)
    damage = _switch_destroyed(w)
    if damage:
        after = operate(family, ratings, healthy, {**modes, **dict(damage)})
        return replace(after, damage=damage + after.damage)
    state = _state(w)
    outcomes = _symptoms(w, state)
    vcc = w.values.get("vcc_behaviour")
    if vcc is not None:
        behaviour = "zero" if vcc < 1.0 else "cycling" if state == "hiccup" else "steady"
        outcomes["vcc_behaviour"] = {behaviour: 1.0}
        del w.values["vcc_behaviour"]
    lamp = series_lamp.NO_FLASH if w.flags["path_open"] else \
        series_lamp.BRIGHT if w.flags["primary_short"] else series_lamp.FLASH
    outcomes["lamp"] = {lamp: 1.0}
    w.values["residual_bulk"] = 0.0
    return Operation(state, dict(w.values), outcomes, bool(w.flags["primary_short"]),
                     fuse_blows=bool(w.flags["primary_short"]) and not w.flags["path_open"],
                     hiccup=_hiccup(w) if state == "hiccup" else None)


def _switch_destroyed(w: _Work) -> tuple[tuple[str, str], ...]:
    """An open clamp leaves the leakage inductance's energy nowhere to go but the switch: each
    turn-off drives the drain past its rating into avalanche and the switch fails short within the
    first cycles [src: Power Integrations AN-19, the clamp limits VDS = Vbulk + VOR + spike below
    BVDSS; practice: the switch keeps failing until the clamp is replaced]. A hazard, never a running
    state: the unit is what it becomes once the switch has shorted."""
    clamp_open = w.mode("clamp_diode") == "open" or w.mode("clamp_resistor") == "open"
    switching = w.flags.get("transfer") and w.flags.get("drive") in ("running", "bursting")
    if not clamp_open or not switching:
        return ()
    switches = w.family.parts_with_role("switch") + w.family.parts_with_role("integrated_switch")
    return tuple((part.id, "short") for part in switches if w.modes.get(part.id, "ok") != "short")


def _hiccup(w: _Work) -> Hiccup | None:
    """Vcc swing and period of a restarting controller, from its start-up parts."""
    design = w.family.design
    caps, starts = w.family.parts_with_role("vcc_capacitor"), w.family.parts_with_role("start_resistor")
    if design.drive != "controller" or not caps or not starts:
        return None
    capacitance = part_value(caps[0].value, "F", w.ratings, design)
    if w.modes.get(caps[0].id) == "dried":
        capacitance *= DRIED_CAPACITANCE
    r_start = part_value(starts[0].value, "ohm", w.ratings, design)
    return hiccup(capacitance, design.start_v, design.stop_v, r_start,
                  w.values["bulk_voltage"])
