"""Each kind of part as a meter sees it unplugged, healthy and in each failure mode.

A failure is a change to the part's elements: open removes its conducting path, short puts a low
resistance across its main terminals, drift raises a resistance, dried lowers a capacitance and
raises its ESR. Switches, controllers and optocouplers are unpowered, so only their junctions and
internal resistances show; a MOSFET's channel and a phototransistor are off [practice].
"""

from __future__ import annotations

from dataclasses import replace
from functools import lru_cache

from fixbench.knowledge.model import KIND_PINS, KIND_REQUIRED_PINS
from fixbench.physics.cold import junctions as jn
from fixbench.physics.cold.board_part import BoardPart
from fixbench.physics.cold.elements import Capacitor, Element, Junction, Resistor, Winding

# Pins of each kind, and those a netlist must place: the knowledge files' own table.
PINS = KIND_PINS
REQUIRED_PINS = KIND_REQUIRED_PINS

SHORT_OHM = 0.3  # a shorted junction, capacitor or fuse-class part reads a fraction of an ohm [practice]
SHORTED_CONTROLLER_OHM = 8.0  # a controller's supply input shorted inside: a few ohms [practice]
DRIFT_FACTOR = 3.0  # a resistor that drifted reads several times its value [practice]
DRIED_CAPACITANCE = 0.25  # a dried electrolytic keeps about a quarter of its value [practice]
DRIED_ESR = 8.0  # times the new part's ESR, far above the suspect limit of 2x [practice]
FUSE_OHM = 0.05  # a good glass or ceramic fuse [practice]
LEAD_OHM = 0.2  # a charger cable's conductor [practice]
# A controller's supply pin to ground, unpowered: internal bias and start-up circuits, tens to
# hundreds of kilohm [memory: UC384x-class controllers measured cold].
CONTROLLER_VCC_OHM = 150e3
AUX_WINDING_OHM = 1.0  # auxiliary winding of a charger transformer [practice]
SECONDARY_WINDING_OHM = 0.05  # secondary of a 5-20 V output [practice]
# Winding inductances, for the ESR meter's 100 kHz only: a charger primary of 0.5-3 mH; the other
# windings scale down by the square of their turns ratio, tens of microhenry [practice].
WINDING_HENRY = {"primary": 1.5e-3, "aux": 30e-6, "secondary": 15e-6}
INDUCTOR_HENRY = 0.5e-3  # a PFC choke of adapters of 75-150 W: a few hundred uH [practice]

# The failure modes each kind's cold model knows (besides "ok").
MODES: dict[str, tuple[str, ...]] = {
    "fuse": ("open",), "thermistor": ("open", "drift"), "resistor": ("open", "drift"), "lead": ("open",),
    "electrolytic": ("dried", "short", "open"), "film_capacitor": ("short", "open"),
    "rectifier_diode": ("open", "short"), "fast_diode": ("open", "short"), "schottky": ("open", "short"),
    "zener": ("open", "short"), "bridge": ("open", "short"), "mosfet": ("open", "short"),
    "bjt": ("open", "short"), "controller": ("dead", "short"), "optocoupler": ("open", "short"),
    "tl431": ("open", "short"), "transformer": ("open",), "integrated_controller": ("short", "dead"),
    "inductor": ("open",),
}

DIODE_JUNCTIONS = {"rectifier_diode": jn.SILICON_RECTIFIER, "fast_diode": jn.FAST_RECOVERY,
                   "schottky": jn.SCHOTTKY}
RESISTIVE = ("fuse", "thermistor", "resistor", "lead")
# The junction type whose spread a part's junctions share.
JUNCTION_KINDS: dict[str, jn.JunctionKind] = {
    **DIODE_JUNCTIONS, "zener": jn.ZENER_FORWARD, "bridge": jn.SILICON_RECTIFIER, "mosfet": jn.BODY_DIODE,
    "bjt": jn.TRANSISTOR_JUNCTION, "controller": jn.IC_SUBSTRATE, "optocoupler": jn.INFRARED_LED,
    "tl431": jn.SHUNT_REFERENCE_SUBSTRATE, "integrated_controller": jn.BODY_DIODE,
}


def _junction(part: BoardPart, name: str, anode: str, cathode: str, kind: jn.JunctionKind,
              offset_v: float = 0.0) -> Junction:
    """A junction of ``part``, its drop moved by the part's ``drop_shift_v`` (a part at the edge of
    its type's spread)."""
    shift = part.figure("drop_shift_v", 0.0)
    return Junction(name, anode, cathode, kind.shifted(shift) if shift else kind, offset_v)


def _check_pins(part: BoardPart) -> None:
    known = PINS.get(part.kind)
    if known is None:
        raise ValueError(f"{part.id}: no cold model for a part of kind '{part.kind}'")
    pins = dict(part.pins)
    unknown = [p for p in pins if p not in known]
    required = REQUIRED_PINS.get(part.kind, known)
    missing = [p for p in required if p not in pins]
    if unknown or missing:
        raise ValueError(f"{part.id} ({part.kind}): pins must be {', '.join(known)}"
                         f"{'; unknown ' + ', '.join(unknown) if unknown else ''}"
                         f"{'; missing ' + ', '.join(missing) if missing else ''}")


def _mode_error(part: BoardPart) -> ValueError:
    return ValueError(f"{part.id}: a {part.kind} has no failure mode '{part.mode}'")


def _resistive(part: BoardPart) -> tuple[Element, ...]:
    """A resistor chain (or fuse, thermistor, conductor): ``count`` equal resistors in series; a
    fault hits the first one."""
    if part.kind == "fuse":
        total = part.figure("ohm", FUSE_OHM)
    elif part.kind == "lead":
        total = part.figure("ohm", LEAD_OHM)
    else:
        total = part.value
    if total is None:
        raise ValueError(f"{part.id}: a {part.kind} needs a value in ohm")
    if part.mode not in ("ok", "open", "drift"):
        raise _mode_error(part)
    each = total / part.count
    nodes = [part.node("a")] + [f"{part.id}.chain{k}" for k in range(1, part.count)] + [part.node("b")]
    elements: list[Element] = []
    for k in range(part.count):
        name = part.id if part.count == 1 else f"{part.id}.{k + 1}"
        if k == 0 and part.mode == "open":
            continue
        ohm = each * DRIFT_FACTOR if (k == 0 and part.mode == "drift") else each
        elements.append(Resistor(name, nodes[k], nodes[k + 1], ohm))
    return tuple(elements)


def _two_terminal(part: BoardPart, a: str, b: str, healthy: tuple[Element, ...]) -> tuple[Element, ...]:
    """A part whose failures are open (nothing conducts) or short (a low resistance a-b)."""
    if part.mode == "ok":
        return healthy
    if part.mode == "open":
        return ()
    if part.mode == "short":
        return (Resistor(f"{part.id}.short", part.node(a), part.node(b), SHORT_OHM),)
    raise _mode_error(part)


def _capacitor(part: BoardPart) -> tuple[Element, ...]:
    a, b = PINS[part.kind]
    esr = part.figure("esr_ohm", 0.0)
    if part.value is None:
        raise ValueError(f"{part.id}: a capacitor needs a value in farad")
    if part.mode == "dried":
        return (Capacitor(part.id, part.node(a), part.node(b), part.value * DRIED_CAPACITANCE, esr * DRIED_ESR),)
    return _two_terminal(part, a, b, (Capacitor(part.id, part.node(a), part.node(b), part.value, esr),))


def _zener(part: BoardPart) -> tuple[Element, ...]:
    if part.value is None:
        raise ValueError(f"{part.id}: a Zener needs its voltage as value")
    anode, cathode = part.node("anode"), part.node("cathode")
    breakdown_offset = part.value - jn.ZENER_BREAKDOWN.drop(jn.ZENER_TEST_CURRENT)
    healthy = (_junction(part, part.id, anode, cathode, jn.ZENER_FORWARD),
               Junction(f"{part.id}.breakdown", cathode, anode, jn.ZENER_BREAKDOWN, breakdown_offset))
    return _two_terminal(part, "anode", "cathode", healthy)


def _bridge(part: BoardPart) -> tuple[Element, ...]:
    """Four rectifier junctions; a failed bridge has one failed diode, the first (ac1 to plus)."""
    ac1, ac2, plus, minus = (part.node(p) for p in ("ac1", "ac2", "plus", "minus"))
    diodes = [(f"{part.id}.1", ac1, plus), (f"{part.id}.2", ac2, plus),
              (f"{part.id}.3", minus, ac1), (f"{part.id}.4", minus, ac2)]
    if part.mode not in ("ok", "open", "short"):
        raise _mode_error(part)
    elements: list[Element] = []
    for k, (name, anode, cathode) in enumerate(diodes):
        if k == 0 and part.mode == "open":
            continue
        if k == 0 and part.mode == "short":
            elements.append(Resistor(f"{name}.short", anode, cathode, SHORT_OHM))
            continue
        elements.append(_junction(part, name, anode, cathode, jn.SILICON_RECTIFIER))
    return tuple(elements)


def _transformer(part: BoardPart) -> tuple[Element, ...]:
    """Each winding the netlist gives pins for; T.open is an open primary."""
    if part.value is None:
        raise ValueError(f"{part.id}: a transformer needs its primary winding resistance as value")
    if part.mode not in ("ok", "open"):
        raise _mode_error(part)
    pins = dict(part.pins)
    ohms = {"primary": part.value, "aux": part.figure("aux_ohm", AUX_WINDING_OHM),
            "secondary": part.figure("secondary_ohm", SECONDARY_WINDING_OHM)}
    elements: list[Element] = []
    for winding, ohm in ohms.items():
        if f"{winding}_a" not in pins or (winding == "primary" and part.mode == "open"):
            continue
        elements.append(Winding(f"{part.id}.{winding}", part.node(f"{winding}_a"), part.node(f"{winding}_b"),
                                ohm, part.figure(f"{winding}_henry", WINDING_HENRY[winding])))
    return tuple(elements)


def _integrated_controller(part: BoardPart) -> tuple[Element, ...]:
    """A controller with its MOSFET in the package, unpowered: the MOSFET's body diode from source
    to drain, and the supply pin's substrate junction and bias to the source pin, as a discrete
    controller's. A shorted switch is drain to source, and the surge that shorted it usually takes
    the supply pin's input with it; a dead one reads as a good one cold [practice]."""
    drain, source, vcc = part.node("drain"), part.node("source"), part.node("vcc")
    bias = part.value if part.value is not None else CONTROLLER_VCC_OHM
    supply = (_junction(part, f"{part.id}.substrate", source, vcc, jn.IC_SUBSTRATE),
              Resistor(f"{part.id}.bias", vcc, source, bias))
    if part.mode == "short":
        return (Resistor(f"{part.id}.short", drain, source, SHORT_OHM),
                Resistor(f"{part.id}.supply_short", vcc, source, SHORTED_CONTROLLER_OHM))
    if part.mode not in ("ok", "dead"):
        raise _mode_error(part)
    return (_junction(part, f"{part.id}.body", source, drain, jn.BODY_DIODE),) + supply


@lru_cache(maxsize=16384)
def cold_elements(part: BoardPart) -> tuple[Element, ...]:
    """The elements ``part`` shows a meter in its state."""
    _check_pins(part)
    kind, node = part.kind, part.node
    if kind in RESISTIVE:
        return _resistive(part)
    if kind in ("electrolytic", "film_capacitor"):
        return _capacitor(part)
    if kind in DIODE_JUNCTIONS:
        healthy = (_junction(part, part.id, node("anode"), node("cathode"), DIODE_JUNCTIONS[kind]),)
        return _two_terminal(part, "anode", "cathode", healthy)
    if kind == "zener":
        return _zener(part)
    if kind == "bridge":
        return _bridge(part)
    if kind == "mosfet":
        return _two_terminal(part, "drain", "source",
                             (_junction(part, f"{part.id}.body", node("source"), node("drain"), jn.BODY_DIODE),))
    if kind == "bjt":
        junctions = (_junction(part, f"{part.id}.be", node("base"), node("emitter"), jn.TRANSISTOR_JUNCTION),
                     _junction(part, f"{part.id}.bc", node("base"), node("collector"), jn.TRANSISTOR_JUNCTION))
        if part.mode == "short":  # collector to emitter, the junctions still there [practice]
            return junctions + (Resistor(f"{part.id}.short", node("collector"), node("emitter"), SHORT_OHM),)
        return _two_terminal(part, "collector", "emitter", junctions)
    if kind == "controller":
        bias = part.value if part.value is not None else CONTROLLER_VCC_OHM
        healthy = (_junction(part, f"{part.id}.substrate", node("gnd"), node("vcc"), jn.IC_SUBSTRATE),
                   Resistor(f"{part.id}.bias", node("vcc"), node("gnd"), bias))
        if part.mode == "dead":
            return healthy
        if part.mode == "short":
            return (Resistor(f"{part.id}.short", node("vcc"), node("gnd"), SHORTED_CONTROLLER_OHM),)
        return _two_terminal(part, "vcc", "gnd", healthy)
    if kind == "integrated_controller":
        return _integrated_controller(part)
    if kind == "optocoupler":
        return _two_terminal(part, "anode", "cathode",
                             (_junction(part, f"{part.id}.led", node("anode"), node("cathode"), jn.INFRARED_LED),))
    if kind == "tl431":
        return _two_terminal(part, "cathode", "anode",
                             (_junction(part, f"{part.id}.substrate", node("anode"), node("cathode"),
                                        jn.SHUNT_REFERENCE_SUBSTRATE),))
    if kind == "transformer":
        return _transformer(part)
    if kind == "inductor":
        if part.value is None:
            raise ValueError(f"{part.id}: an inductor needs its winding resistance as value")
        if part.mode not in ("ok", "open"):
            raise _mode_error(part)
        return () if part.mode == "open" else (
            Winding(part.id, node("a"), node("b"), part.value, part.figure("henry", INDUCTOR_HENRY)),)
    raise ValueError(f"{part.id}: no cold model for a part of kind '{kind}'")  # pragma: no cover


@lru_cache(maxsize=4096)
def joined_in_any_mode(part: BoardPart) -> frozenset[tuple[str, str]]:
    """Every pair of nodes some state of ``part`` joins with an element: a failure never joins
    nodes outside this set, so a reading whose measured network stays clear of it cannot change."""
    pairs: set[tuple[str, str]] = set()
    for mode in ("ok",) + MODES[part.kind]:
        pairs.update(tuple(sorted(e.nodes)) for e in cold_elements(replace(part, mode=mode)))
    return frozenset(pairs)
