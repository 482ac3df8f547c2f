"""Behavioural ngspice decks of a family's live circuit, with any parts failed.

The deck is built from the family itself: every part of the family file becomes the cards its kind
and role call for, on the family's own node names (the names the cold netlist uses), with its value
from the family's sizing rules and design figures. A failed part is drawn failed: open leaves it out,
short puts a small resistance across its main terminals, dried keeps a quarter of a capacitor's
value at eight times its ESR, drift triples a resistor (the cold model's own factors). A new kind or
role is one more entry in ``KIND_CARDS`` or ``ROLE_CARDS``.

What is behavioural, and why:
- the controller is its under-voltage lockout (a hysteresis switch at the family's start and stop
  thresholds), a supply current, the Vcc clamp, and a current-mode PWM: a clock at the family's
  switching frequency sets a latch that the sense-resistor voltage resets against the threshold its
  feedback pin asks for (at most the 1 V current-sense limit), with a maximum duty;
- the MOSFET is a voltage-controlled switch with its output capacitance and body diode;
- the TL431 is a transconductance shunt around its 2.495 V reference, and the optocoupler its LED
  with a current-controlled current source at the collector (CTR);
- a primary-side controller peak-samples its FB pin (the auxiliary winding through the divider) and
  pulls its COMP node down when the sample passes its reference;
- the transformer is coupled inductors sized from the family's figures (reflected voltage, aux turns
  for the Vcc design point, a discontinuous-mode primary inductance from the sense rule's peak
  current).

Time scaling (said once, here): the mains frequency is raised MAINS_SCALE times with the bulk
capacitor lowered as many times, which keeps the ripple of a constant-power load (dV = P / (V f C))
and shows several ripple cycles in a short run; the mains rises over its first cycle
(the inrush, which a time-lag fuse takes, is left out); and the controller's time in under-voltage
lockout runs UVLO_SCALE times faster (the start-up resistor's current and the controller's start-up
current are both multiplied while the controller is off, so whether it starts at all is unchanged
and only the seconds of charging shrink); and the Vcc and output capacitors and the controller's
compensation capacitor are SLOW_SCALE times smaller, so the hold-up of Vcc, the output's rise and the
loop keep their proportions and run SLOW_SCALE times faster. The switching cycle runs at its real
speed.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Callable

from fixbench.knowledge.model import Family, Part
from fixbench.physics import flyback
from fixbench.physics.capacitors import esr_new_max
from fixbench.physics.cold import junctions as jn
from fixbench.physics.cold.part_models import (AUX_WINDING_OHM, DRIED_CAPACITANCE, DRIED_ESR, DRIFT_FACTOR,
                                               FUSE_OHM, LEAD_OHM, SECONDARY_WINDING_OHM)
from fixbench.physics.healthy import AUX_DIODE_DROP, SCHOTTKY_DROP, SILICON_DROP
from fixbench.physics.part_values import rated_voltage, value_of
from fixbench.physics.ratings import Ratings
from fixbench.physics.semiconductors import OPTO_CTR_RANGE, TL431_VREF
from fixbench.physics.sizing import fuse_rating, input_power
from fixbench.physics.startup import RUN_CURRENT

MAINS_SCALE = 4.0
UVLO_SCALE = 200.0
SLOW_SCALE = 3.0
SLOW_ROLES = ("vcc_capacitor", "output_capacitor")
SHORT_OHM = 0.01
# Current-sense limit of a UC384x-class controller [src: UC3842 datasheet, current sense threshold
# 1 V]; the same figure physics.sizing.sense_resistance sizes the sense resistor for.
CURRENT_SENSE_LIMIT_V = 1.0
# Largest duty the deck's PWM allows: the figure the sense rule assumes [textbook discontinuous
# flyback, as in physics.sizing.sense_resistance].
DUTY_MAX = 0.45
# Supply current before start: 0.5 mA typical for the UC3842 it names [src: TI UC3842 datasheet,
# start-up current 0.5 mA typ, 1 mA max]; primary-side controllers start on a few tens of
# microamps [memory].
START_CURRENT_A = {"UC3842": 0.5e-3, None: 30e-6}
# UC384x COMP pin: its error amplifier sources about 1 mA [src: UC3842 datasheet, output source
# current 0.8 mA min]; the current-sense threshold is (Vcomp - 2 Vbe) / 3 [src: UC3842 datasheet,
# block diagram].
COMP_PULLUP_V, COMP_PULLUP_OHM, COMP_OFFSET_V, COMP_DIVIDE = 5.0, 5e3, 1.4, 3.0
OPTO_CTR = 1.0  # within the project's OPTO_CTR_RANGE
MOSFET_RON = 2.0  # a 2 A, 650 V charger MOSFET [practice: 2-4 ohm]
MOSFET_COSS = 50e-12  # [memory: tens of pF for small 650 V MOSFETs]
CLAMP_CAPACITOR = 2.2e-9  # the RCD clamp's capacitor, which the stage file leaves out (no fault of its own) [practice]
# Leading-edge blanking: the sense input ignores the first few hundred ns of each pulse, where the
# switch's output capacitance discharges [src: UC3842-class datasheets, leading-edge spike filtering; memory: 100-300 ns].
LEADING_EDGE_BLANK_S = 250e-9
# Below this secondary current the sample is taken: the later part of the diode's conduction (about
# 6 A peak at rated load in the 5 V / 2 A deck); a behavioural stand-in for knee sampling, set so the
# healthy deck regulates at its rated output.
KNEE_CURRENT_A = 4.0
COUPLING = 0.99  # leakage about 1 % of the primary [practice]
GATE_DRIVE_V = 12.0  # the PWM output swings to Vcc, at most this [memory: UC3842 output clamp 13.5 V... Vcc]
TL431_GM = 0.02  # A/V above its reference [behavioural: the loop gain a stable deck allows, 36 mV of output error]

assert OPTO_CTR_RANGE[0] <= OPTO_CTR <= OPTO_CTR_RANGE[1]


def _step(x: str, width: float) -> str:
    """A smooth 0-to-1 step of the expression ``x`` over about ``width``: logic the solver can follow
    without cutting its time step to nothing at every edge."""
    return f"(0.5+0.5*tanh(({x})/{width:g}))"


def _diode_model(name: str, kind: jn.JunctionKind, extra: str = "") -> str:
    return f".model {name} D(IS={kind.saturation:.6g} N={kind.emission:.6g} {extra})"


MODELS = "\n".join([
    # A commonly published SPICE model of the 1N4007 [memory], as in tests/support/ngspice.py.
    ".model D1N4007 D(IS=7.02767n RS=0.0341512 N=1.80803 EG=1.05743 XTI=5 BV=1000 IBV=5e-08 "
    "CJO=1e-11 VJ=0.7 M=0.5 FC=0.5 TT=1e-07)",
    _diode_model("DFAST", jn.FAST_RECOVERY, "RS=0.1"),
    _diode_model("DSCHOTTKY", jn.SCHOTTKY, "RS=0.02"),
    _diode_model("DBODY", jn.BODY_DIODE, "RS=0.1"),
    _diode_model("DLED", jn.INFRARED_LED, "RS=5"),
    ".model DIDEAL D(IS=1e-12 N=0.3)",
    ".model SWMOS SW(VT=4 VH=0.5 RON={ron} ROFF=1e9)".format(ron=MOSFET_RON),
    ".model DEBO D(IS=1e-18 N=1 BV=7 IBV=1m)",
    ".model QNPN NPN(BF=30 IS=1e-14 VAF=100 CJE=20p CJC=10p TF=20n TR=200n)",
])


@dataclass
class DeckContext:
    """What every part's cards may read: the family, ratings, the failed parts, derived figures."""

    family: Family
    ratings: Ratings
    modes: dict[str, str]
    cards: list[str] = field(default_factory=list)
    figures: dict[str, float] = field(default_factory=dict)

    @property
    def design(self):
        return self.family.design

    def mode(self, part: Part) -> str:
        return self.modes.get(part.id, "ok")

    def value(self, part: Part) -> float:
        return value_of(part, self.ratings, self.design)

    def add(self, *cards: str) -> None:
        self.cards.extend(cards)

    def role_part(self, role: str) -> Part | None:
        parts = self.family.parts_with_role(role)
        return parts[0] if parts else None


def node(part: Part, pin: str) -> str:
    """The deck's node for a pin: the family's node name; the two grounds are one node (the
    secondary is isolated by the transformer; tying it to the primary ground changes no current)."""
    name = part.node(pin)
    return "0" if name in ("primary_ground", "out_minus") else name


def _two_pins(ctx: DeckContext, part: Part, a: str, b: str, healthy: Callable[[], None]) -> None:
    mode = ctx.mode(part)
    if mode == "open":
        return
    if mode == "short":
        ctx.add(f"R{part.id}_short {node(part, a)} {node(part, b)} {SHORT_OHM}")
        return
    healthy()


def _resistor(ctx: DeckContext, part: Part, ohm: float | None = None) -> None:
    ohm = ctx.value(part) if ohm is None else ohm
    if ctx.mode(part) == "drift":
        ohm *= DRIFT_FACTOR
    _two_pins(ctx, part, "a", "b", lambda: ctx.add(f"R{part.id} {node(part, 'a')} {node(part, 'b')} {ohm:.6g}"))


def _capacitor(ctx: DeckContext, part: Part, plus: str, minus: str, scale: float = 1.0,
               initial_v: float = 0.0) -> None:
    farad = ctx.value(part) / scale
    esr = esr_new_max(ctx.value(part), rated_voltage(part, ctx.ratings, ctx.design)) if part.kind == "electrolytic" else 0.01
    if ctx.mode(part) == "dried":
        farad, esr = farad * DRIED_CAPACITANCE, esr * DRIED_ESR
    inner = f"{part.id}_esr"
    _two_pins(ctx, part, plus, minus, lambda: ctx.add(
        f"R{part.id}_esr {node(part, plus)} {inner} {esr:.6g}",
        f"C{part.id} {inner} {node(part, minus)} {farad:.6g} IC={initial_v:.6g}"))


def _diode(ctx: DeckContext, part: Part, model: str) -> None:
    _two_pins(ctx, part, "anode", "cathode",
              lambda: ctx.add(f"D{part.id} {node(part, 'anode')} {node(part, 'cathode')} {model}"))


def _fuse(ctx: DeckContext, part: Part) -> None:
    """A fuse (or fusible resistor) that opens for good when the mean square of its current over
    about 10 ms passes twice its rating squared [practice: a fuse carries its rating, opens within
    milliseconds at many times it]; a leaky integrator of i^2 and a latch."""
    if ctx.mode(part) == "open":
        return
    ohm = ctx.value(part) if part.kind == "resistor" else FUSE_OHM
    rating = fuse_rating(ctx.ratings, ctx.design)
    a, b, p = node(part, "a"), node(part, "b"), part.id
    ctx.add(f"V{p}_i {a} {p}_m 0",
            f"S{p} {p}_m {p}_s {p}_latch 0 SWFUSE",
            f"R{p} {p}_s {b} {ohm:.6g}",
            f"B{p}_sq 0 {p}_heat I=i(V{p}_i)*i(V{p}_i)",
            f"R{p}_heat {p}_heat 0 1", f"C{p}_heat {p}_heat 0 10m",
            f"B{p}_cmp {p}_cmp 0 V={_step(f'V({p}_heat)-{(2 * rating) ** 2:.6g}', 0.01)}",
            f"D{p}_latch {p}_cmp {p}_latch DIDEAL", f"C{p}_latch {p}_latch 0 1n",
            ".model SWFUSE SW(VT=0.3 VH=0.1 RON=1e9 ROFF=1e-3)")


def _bridge(ctx: DeckContext, part: Part) -> None:
    """Four 1N4007s; an open bridge has one diode open, a shorted bridge one diode shorted."""
    ac1, ac2, plus, minus = (node(part, pin) for pin in ("ac1", "ac2", "plus", "minus"))
    legs = [(ac1, plus), (ac2, plus), (minus, ac1), (minus, ac2)]
    mode = ctx.mode(part)
    for k, (a, c) in enumerate(legs):
        if k == 0 and mode == "open":
            continue
        if k == 0 and mode == "short":
            ctx.add(f"R{part.id}_{k}short {a} {c} {SHORT_OHM}")
            continue
        ctx.add(f"D{part.id}_{k} {a} {c} D1N4007")


def _electrolytic(ctx: DeckContext, part: Part) -> None:
    if part.role == "bulk_capacitor":
        _capacitor(ctx, part, "plus", "minus", scale=MAINS_SCALE)
    elif part.role in SLOW_ROLES:
        _capacitor(ctx, part, "plus", "minus", scale=SLOW_SCALE)
    else:
        _capacitor(ctx, part, "plus", "minus")


def _mosfet(ctx: DeckContext, part: Part) -> None:
    d, g, s = node(part, "drain"), node(part, "gate"), node(part, "source")
    _two_pins(ctx, part, "drain", "source", lambda: ctx.add(
        f"S{part.id} {d} {s} {g} {s} SWMOS", f"C{part.id}_oss {d} {s} {MOSFET_COSS:.6g}",
        f"D{part.id}_body {s} {d} DBODY", f"C{part.id}_gs {g} {s} 1n"))


def _bjt(ctx: DeckContext, part: Part) -> None:
    c, b, e = node(part, "collector"), node(part, "base"), node(part, "emitter")
    # The switch's output capacitance, and its base-emitter junction's reverse breakdown, which
    # limits how far the drive winding pulls the base below the emitter [memory: BVEBO 7-9 V for
    # high-voltage NPNs].
    extra = [f"C{part.id}_oss {c} {e} {MOSFET_COSS:.6g}", f"D{part.id}_ebo {b} {e} DEBO"] \
        if part.role == "switch" else []
    _two_pins(ctx, part, "collector", "emitter", lambda: ctx.add(f"Q{part.id} {c} {b} {e} QNPN", *extra))


def _transformer(ctx: DeckContext, part: Part) -> None:
    """Coupled primary, auxiliary and secondary windings; dots set for a flyback (secondary and
    auxiliary conduct while the switch is off), except the base-drive winding of a self-oscillating
    switch, which drives the base while the switch is on."""
    f = ctx.figures
    p = part.id
    lines = []
    if ctx.mode(part) != "open":
        lines += [f"L{p}_p {node(part, 'primary_a')} {p}_pm {f['lp']:.6g}",
                  f"V{p}_ip {p}_pm {p}_pr 0",
                  f"R{p}_p {p}_pr {node(part, 'primary_b')} {ctx.value(part):.6g}"]
    lines += [f"L{p}_s {node(part, 'secondary_b')} {p}_sm {f['ls']:.6g}", f"V{p}_is {p}_sm {p}_sx 0",
              f"R{p}_s {p}_sx {node(part, 'secondary_a')} {SECONDARY_WINDING_OHM}"]
    ctx.figures["secondary_probe"] = f"V{p}_is"
    aux_a, aux_b = node(part, "aux_a"), node(part, "aux_b")
    dot, other = (aux_a, aux_b) if ctx.design.drive == "self_oscillating" else (aux_b, aux_a)
    lines += [f"L{p}_a {dot} {p}_am {f['la']:.6g}", f"R{p}_a {p}_am {other} {AUX_WINDING_OHM}"]
    windings = [w for w in ("p", "s", "a") if any(line.startswith(f"L{p}_{w} ") for line in lines)]
    for i, w1 in enumerate(windings):
        for w2 in windings[i + 1:]:
            lines.append(f"K{p}_{w1}{w2} L{p}_{w1} L{p}_{w2} {COUPLING}")
    ctx.add(*lines)
    ctx.figures["primary_probe"] = f"V{p}_ip" if ctx.mode(part) != "open" else ""


def _controller(ctx: DeckContext, part: Part) -> None:
    """UVLO, supply current, Vcc clamp and a current-mode PWM (see the module's docstring)."""
    d, p = ctx.design, part.id
    vcc, drive, fb = node(part, "vcc"), node(part, "drive"), node(part, "fb")
    mode = ctx.mode(part)
    if mode == "short":
        ctx.add(f"R{p}_short {vcc} 0 {SHORT_OHM}")
        return
    start_current = START_CURRENT_A.get(d.controller_ref, START_CURRENT_A[None])
    period = 1.0 / d.switching_hz
    sense = ctx.role_part("sense_resistor")
    cs = node(sense, "a") if sense is not None else "0"
    on = ctx.figures["controller_on"] = f"{p}_on"
    # A dead controller never leaves lockout: it draws its start-up current and its clamp holds Vcc.
    vt, vh = ((d.start_v + d.stop_v) / 2, (d.start_v - d.stop_v) / 2) if mode != "dead" else (1e6, 1)
    ctx.add(f".model SW{p}UVLO SW(VT={vt:.6g} VH={vh:.6g} RON=1 ROFF=1e9)",
            f"V{p}_one {p}_one 0 1", f"S{p}_uvlo {p}_one {on} {vcc} 0 SW{p}UVLO", f"R{p}_on {on} 0 1k",
            f"B{p}_icc {vcc} 0 I=(V({on})*{RUN_CURRENT} + (1-V({on}))*{start_current * UVLO_SCALE:.6g})"
            f"*min(max(V({vcc}),0),1)",
            f".model DZ{p} D(BV={d.vcc_clamp_v:.6g} IBV=1m RS=1)", f"D{p}_clamp 0 {vcc} DZ{p}")
    # The COMP node: pulled up inside, pulled down by the optocoupler (or by the primary-side error
    # amplifier); the current-sense threshold follows it.
    comp = fb if d.feedback != "primary_side" else f"{p}_comp"
    ctx.add(f"V{p}_ref {p}_ref 0 {COMP_PULLUP_V}", f"R{p}_pu {p}_ref {comp} {COMP_PULLUP_OHM:.6g}",
            f"C{p}_comp {comp} 0 {1e-6 / SLOW_SCALE:.6g}")
    if d.feedback == "primary_side":
        # Sample the FB pin's plateau (peak detector behind a buffer) and sink COMP current when it
        # passes the reference the divider was designed for.
        # The sample tracks FB only near the end of the secondary's conduction, where its current
        # has fallen below KNEE_CURRENT_A (what the controller's knee detection achieves: the
        # diode's drop is small there), and holds it otherwise.
        secondary = ctx.figures["secondary_probe"]
        ctx.add(f"B{p}_smp 0 {p}_smp I=1m*(V({fb})-V({p}_smp))*{_step(f'i({secondary})-0.05', 0.02)}"
                f"*{_step(f'{KNEE_CURRENT_A}-i({secondary})', 0.05)}",
                f"C{p}_smp {p}_smp 0 1n",
                f"B{p}_ea {comp} 0 I=min(max(10m*(V({p}_smp)-{ctx.figures['fb_reference']:.6g}),-0.1m),2m)")
    ctx.add(f"B{p}_thr {p}_thr 0 V=min(max((V({comp})-{COMP_OFFSET_V})/{COMP_DIVIDE},0),{CURRENT_SENSE_LIMIT_V})",
            f"V{p}_ramp {p}_ramp 0 PULSE(0 1 0 {period - 20e-9:.6g} 10n 10n {period:.6g})",
            f"V{p}_clk {p}_clk 0 PULSE(0 1 {period - 10e-9:.6g} 5n 5n 60n {period:.6g})",
            # Cycle by cycle: a peak detector holds how far the sense voltage has passed the
            # threshold since the clock discharged it; the gate is on from the clock until then (or
            # until the maximum duty). No latch, so no loop for the solver to chase.
            f"B{p}_err {p}_err 0 V=-1+{_step(f'V({p}_ramp)-{LEADING_EDGE_BLANK_S * d.switching_hz:.4g}', 0.003)}*(V({cs})-V({p}_thr)+1.05)", f"D{p}_pk {p}_err {p}_pk DIDEAL",
            f"C{p}_pk {p}_pk 0 10p", f"V{p}_neg {p}_neg 0 -1",
            f"S{p}_clr {p}_pk {p}_neg {p}_clk 0 SWCLK", ".model SWCLK SW(VT=0.5 VH=0.1 RON=10 ROFF=1e9)",
            f"B{p}_q {p}_qr 0 V={_step(f'V({on})-0.5', 0.05)}*{_step(f'{DUTY_MAX}-V({p}_ramp)', 0.005)}"
            f"*{_step(f'-V({p}_pk)', 0.005)}",
            f"R{p}_q {p}_qr {p}_q 100", f"C{p}_q {p}_q 0 100p",
            f"B{p}_out {p}_out 0 V=V({p}_q)*min(max(V({vcc}),0),{GATE_DRIVE_V})",
            f"R{p}_out {p}_out {drive} 10")


def _start_resistor(ctx: DeckContext, part: Part) -> None:
    _resistor(ctx, part)
    if ctx.mode(part) == "open" or "controller_on" not in ctx.figures:
        return
    ohm = ctx.value(part) * (DRIFT_FACTOR if ctx.mode(part) == "drift" else 1.0)
    a, b, on = node(part, "a"), node(part, "b"), ctx.figures["controller_on"]
    # The UVLO time compression: while the controller is off, the resistor's current counts
    # UVLO_SCALE times (the bulk does not supply the extra).
    ctx.add(f"B{part.id}_fast 0 {b} I=(1-V({on}))*{UVLO_SCALE - 1:.6g}*max(V({a},{b}),0)/{ohm:.6g}")


def _optocoupler(ctx: DeckContext, part: Part) -> None:
    """LED (anode-cathode) and a transistor whose collector current is CTR times the LED current,
    falling off as the transistor saturates. Open: neither conducts; short: collector-emitter."""
    a, k, c, e = (node(part, pin) for pin in ("anode", "cathode", "collector", "emitter"))
    p = part.id
    mode = ctx.mode(part)
    if mode == "open":
        return
    if mode == "short":
        ctx.add(f"D{p}_led {a} {p}_k DLED", f"V{p}_led {p}_k {k} 0", f"R{p}_short {c} {e} {SHORT_OHM}")
        return
    ctx.add(f"D{p}_led {a} {p}_k DLED", f"V{p}_led {p}_k {k} 0",
            f"B{p}_ce {c} {e} I={OPTO_CTR}*max(i(V{p}_led),0)*(1-exp(-max(V({c},{e}),0)/0.2))")


def _tl431(ctx: DeckContext, part: Part) -> None:
    k, a, r, p = node(part, "cathode"), node(part, "anode"), node(part, "ref"), part.id
    vref = TL431_VREF["plain"].typical
    _two_pins(ctx, part, "cathode", "anode", lambda: ctx.add(
        # The reference input as the shunt's internal amplifier sees it: averaged over about
        # 100 us (what its compensation does), so the output's ESR spikes are not rectified.
        f"E{p}_buf {p}_buf {a} {r} {a} 1", f"R{p}_flt {p}_buf {p}_flt 100k", f"C{p}_flt {p}_flt {a} 1n",
        f"B{p} {k} {a} I={TL431_GM}*max(V({p}_flt,{a})-{vref},0)*min(max(V({k},{a})/2,0),1)"))


def _lead(ctx: DeckContext, part: Part) -> None:
    _resistor(ctx, part, LEAD_OHM)


def _zener(ctx: DeckContext, part: Part) -> None:
    p = part.id
    _two_pins(ctx, part, "anode", "cathode", lambda: ctx.add(
        f".model DZ{p} D(IS={jn.ZENER_FORWARD.saturation:.6g} N={jn.ZENER_FORWARD.emission:.6g} "
        f"BV={ctx.value(part):.6g} IBV=1m NBV=2 RS=2)",
        f"D{p} {node(part, 'anode')} {node(part, 'cathode')} DZ{p}"))


KIND_CARDS: dict[str, Callable[[DeckContext, Part], None]] = {
    "fuse": _fuse, "thermistor": lambda ctx, part: _resistor(ctx, part, ctx.design.source_ohm),
    "resistor": _resistor, "bridge": _bridge, "electrolytic": _electrolytic,
    "film_capacitor": lambda ctx, part: _capacitor(ctx, part, "a", "b"),
    "fast_diode": lambda ctx, part: _diode(ctx, part, "DFAST"),
    "schottky": lambda ctx, part: _diode(ctx, part, "DSCHOTTKY"),
    "rectifier_diode": lambda ctx, part: _diode(ctx, part, "D1N4007"),
    "mosfet": _mosfet, "bjt": _bjt, "transformer": _transformer, "controller": _controller,
    "optocoupler": _optocoupler, "tl431": _tl431, "lead": _lead, "zener": _zener,
}
# Roles whose live behaviour is not their kind's alone.
ROLE_CARDS: dict[str, Callable[[DeckContext, Part], None]] = {
    "fuse": _fuse, "start_resistor": _start_resistor,
}


def _clamp_resistor(ctx: DeckContext, part: Part) -> None:
    _resistor(ctx, part)
    ctx.add(f"C{part.id}_clamp {node(part, 'a')} {node(part, 'b')} {CLAMP_CAPACITOR:.6g}")


ROLE_CARDS["clamp_resistor"] = _clamp_resistor
# The controller's cards first: the start-up resistor's compression reads its lockout node.
FIRST_ROLES = ("transformer", "controller")

# What the run writes, by name; a family without a signal (no Vcc) writes 0 there.
TRACES = ("bulk", "vcc", "switch", "out", "iprimary", "drive")


def _figures(ctx: DeckContext) -> None:
    """Transformer and feedback figures from the family's design and the project's physics."""
    d, r = ctx.design, ctx.ratings
    v_diode = SCHOTTKY_DROP if d.output_diode == "schottky" else SILICON_DROP
    # Discontinuous flyback at the sense rule's operating point: Ipk = 2 Pin / (Vmin Dmax) and
    # Lp = Vmin Dmax / (Ipk f) [textbook DCM flyback; the figures of physics.sizing.sense_resistance].
    v_min = math.sqrt(2.0) * r.design_low * 0.8
    i_peak = 2.0 * input_power(r) / (v_min * DUTY_MAX)
    lp = v_min * DUTY_MAX / (i_peak * d.switching_hz)
    vor = flyback.reflected_voltage_design(r.universal or r.design_low > 150)
    np_ns = flyback.primary_to_secondary_ratio(vor, r.output_v, v_diode)
    ls = lp / np_ns ** 2
    if d.drive == "controller":
        na_ns = flyback.aux_turns_for(d.vcc_target_v, r.output_v, v_diode, AUX_DIODE_DROP)
    else:
        na_ns = BASE_WINDING_TURNS_PER_SECONDARY
    ctx.figures.update(lp=lp, ls=ls, la=ls * na_ns ** 2, vor=vor)
    upper, lower = ctx.role_part("feedback_upper"), ctx.role_part("feedback_lower")
    if d.feedback == "primary_side" and upper is not None and lower is not None:
        plateau = (r.output_v + v_diode) * na_ns
        ctx.figures["fb_reference"] = plateau * ctx.value(lower) / (ctx.value(upper) + ctx.value(lower))


# Base-drive winding of a self-oscillating switch: a few volts per secondary volt [practice: a few
# turns, enough to drive the base through its resistor and capacitor].
BASE_WINDING_TURNS_PER_SECONDARY = 2.0
RUN_S = {"controller": 12e-3, "self_oscillating": 12e-3}


def run_time(family: Family) -> float:
    return RUN_S[family.design.drive]


def live_deck(family: Family, ratings: Ratings, modes: dict[str, str], label: str = "healthy") -> str:
    """The deck of ``family`` at ``ratings`` with the parts in ``modes`` failed, its load the rated
    current at the plug, run for ``run_time(family)`` and writing ``TRACES`` to ``live.data``."""
    unknown = [p for p in modes if p not in {part.id for part in family.parts}]
    if unknown:
        raise ValueError(f"{family.id}: no part {', '.join(unknown)}")
    ctx = DeckContext(family, ratings, modes)
    _figures(ctx)
    parts = sorted(family.parts, key=lambda part: FIRST_ROLES.index(part.role) if part.role in FIRST_ROLES
                   else len(FIRST_ROLES))
    for part in parts:
        emit = ROLE_CARDS.get(part.role) or KIND_CARDS.get(part.kind)
        if emit is None:
            raise ValueError(f"{family.id}: no live cards for {part.id} ({part.kind}, role {part.role})")
        emit(ctx, part)
    r, d = ratings, family.design
    crest = math.sqrt(2.0) * r.bench_mains
    live = family.parts_with_role("fuse")[0].node("a")
    bridge = family.parts_with_role("bridge")[0]
    lead = family.parts_with_role("lead")[0]
    period = 1.0 / d.switching_hz
    mains_hz = r.mains_hz * MAINS_SCALE
    stop = run_time(family)
    probe = ctx.figures.get("primary_probe") or ""
    vcc = "V(vcc)" if d.drive == "controller" else "0*V(bulk_plus)"
    # The drive: the gate's volts; a bipolar switch's base-emitter volts times four, so its 0.6 V of
    # conduction passes the same 2 V mark.
    drive = "V(gate)" if d.drive == "controller" else "4*V(base,emitter)"
    traces = ["V(bulk_plus)", vcc, "V(switch_node)", f"V({node(lead, 'a')})",
              f"i({probe})" if probe else "0*V(bulk_plus)", drive]
    return "\n".join([
        f"* fixbench live deck: {family.id}, {label}; {r.bench_mains:g} V, {r.output_v:g} V / {r.output_a:g} A",
        f"* mains x{MAINS_SCALE:g} (bulk / {MAINS_SCALE:g}), lockout x{UVLO_SCALE:g}; traces {' '.join(TRACES)}",
        MODELS,
        # The mains rises over its first cycle: the real inrush, which a time-lag fuse takes, is
        # left out.
        f"BMAINS mains_src {node(bridge, 'ac2')} V={crest:.6g}*sin({2 * math.pi * mains_hz:.6g}*time)"
        f"*min(time*{mains_hz:g},1)",
        f"RSRC mains_src {live} 0.1",
        f"RLEAKA {live} 0 100Meg", f"RLEAKB {node(bridge, 'ac2')} 0 100Meg",
        *ctx.cards,
        f"RLOAD {node(lead, 'b')} 0 {r.output_v / r.output_a:.6g}",
        ".options rshunt=1e10 reltol=1e-3 itl4=100",
        ".control",
        f"tran {period / 20:.6g} {stop:.6g} 0 {period / 40:.6g} uic",
        f"wrdata live.data {' '.join(traces)}",
        "quit",
        ".endc",
        ".end",
        "",
    ])
