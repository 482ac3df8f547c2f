"""Boards for the cold-network checks: the three families' circuits as a meter meets them unplugged,
with the families' generic values for a 5 V 2 A charger at 230 V or universal mains.

Node names: ``pgnd`` primary ground (bulk -), ``bulk`` bulk +, ``vcc`` the controller's supply pin,
``aux`` the hot end of the auxiliary winding, ``drain``/``source``/``gate`` the MOSFET, ``clamp`` the
clamp diode's cathode, ``sec`` the secondary's hot end (output rectifier anode), ``out`` output +,
``sgnd`` secondary ground, ``ref`` the TL431's reference node, ``k`` the opto LED's cathode.
"""

from __future__ import annotations

from fixbench.physics.cold.board_part import BoardPart
from fixbench.physics.cold.netlist import ColdNetlist


def _part(part_id: str, kind: str, value: float | None = None, tolerance: float = 0.0,
          extra: tuple = (), **pins: str) -> BoardPart:
    return BoardPart(part_id, kind, tuple(pins.items()), value, spread=(1.0 - tolerance, 1.0 + tolerance),
                     extra=extra)


def _mains_and_bulk(fuse_kind: str = "fuse", thermistor: bool = True) -> list[BoardPart]:
    parts = [_part("F1", fuse_kind, 10.0 if fuse_kind == "resistor" else 2.0, a="L", b="fuse_out")]
    if thermistor:
        parts.append(_part("RT1", "thermistor", 10.0, 0.25, a="fuse_out", b="ac1"))
    ac1 = "ac1" if thermistor else "fuse_out"
    parts += [
        _part("BD1", "bridge", ac1=ac1, ac2="N", plus="bulk", minus="pgnd"),
        _part("C1", "electrolytic", 22e-6, 0.2, (("esr_ohm", 1.4),), plus="bulk", minus="pgnd"),
    ]
    return parts


def _controller_primary(vcc_capacitance: float) -> list[BoardPart]:
    return [
        _part("R1", "resistor", 470e3, 0.05, a="bulk", b="vcc"),
        _part("C2", "electrolytic", vcc_capacitance, 0.2, (("esr_ohm", 8.0),), plus="vcc", minus="pgnd"),
        _part("D2", "fast_diode", anode="aux", cathode="vcc"),
        _part("U1", "controller", vcc="vcc", gnd="pgnd"),
        _part("Q1", "mosfet", drain="drain", gate="gate", source="source"),
        _part("R2", "resistor", 22.0, 0.05, a="drive", b="gate"),
        _part("R3", "resistor", 1.8, 0.05, a="source", b="pgnd"),
        _part("D3", "fast_diode", anode="drain", cathode="clamp"),
        _part("R4", "resistor", 100e3, 0.05, a="clamp", b="bulk"),
        _part("T1", "transformer", 2.0, 0.2, primary_a="bulk", primary_b="drain", aux_a="aux", aux_b="pgnd",
              secondary_a="sec", secondary_b="sgnd"),
    ]


def _output() -> list[BoardPart]:
    return [
        _part("D4", "schottky", anode="sec", cathode="out"),
        _part("C3", "electrolytic", 680e-6, 0.2, (("esr_ohm", 0.17),), plus="out", minus="sgnd"),
        _part("W1", "lead", a="out", b="plug"),
    ]


def primary_side() -> ColdNetlist:
    """Primary-side regulation: the FB divider hangs on the auxiliary winding."""
    return ColdNetlist(tuple(_mains_and_bulk() + _controller_primary(10e-6) + _output() + [
        _part("R5", "resistor", 47e3, 0.05, a="aux", b="fb"),
        _part("R6", "resistor", 10e3, 0.05, a="fb", b="pgnd"),
    ]))


def opto_tl431() -> ColdNetlist:
    """PWM controller with TL431 and optocoupler: opto LED from output + to the TL431's cathode."""
    return ColdNetlist(tuple(_mains_and_bulk() + _controller_primary(22e-6) + _output() + [
        _part("U2", "optocoupler", anode="out", cathode="k", collector="comp", emitter="pgnd"),
        _part("U3", "tl431", cathode="k", anode="sgnd", ref="ref"),
        _part("R5", "resistor", 10e3, 0.05, a="out", b="ref"),
        _part("R6", "resistor", 10e3, 0.05, a="ref", b="sgnd"),
    ]))


def self_oscillating() -> ColdNetlist:
    """Ringing-choke converter: an NPN switch started from the bulk rail, driven from a feedback
    winding through C4 and R2, its base pulled down by a cut-off transistor; Zener and opto LED in
    series across the output."""
    return ColdNetlist(tuple(_mains_and_bulk("resistor", thermistor=False) + [
        _part("R1", "resistor", 2.2e6, 0.05, a="bulk", b="base"),
        _part("C4", "film_capacitor", 10e-9, 0.1, a="fbw", b="drv"),
        _part("R2", "resistor", 100.0, 0.05, a="drv", b="base"),
        _part("Q2", "bjt", base="emitter", collector="base", emitter="pgnd"),
        _part("Q1", "bjt", base="base", collector="collector", emitter="emitter"),
        _part("R3", "resistor", 4.7, 0.05, a="emitter", b="pgnd"),
        _part("D3", "fast_diode", anode="collector", cathode="clamp"),
        _part("R4", "resistor", 100e3, 0.05, a="clamp", b="bulk"),
        _part("T1", "transformer", 2.0, 0.2, primary_a="bulk", primary_b="collector", aux_a="fbw",
              aux_b="pgnd", secondary_a="sec", secondary_b="sgnd"),
        *_output(),
        _part("U2", "optocoupler", anode="out", cathode="z", collector="fbw", emitter="emitter"),
        _part("ZD1", "zener", 3.9, anode="sgnd", cathode="z"),
    ]))
