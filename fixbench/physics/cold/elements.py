"""The circuit elements a meter meets on a cold board: resistances (resistors, fuses, conductors,
shorts), transformer windings, capacitors and junctions. Plain frozen values, so identical
sub-networks hash alike and solve once."""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.physics.cold.junctions import JunctionKind


@dataclass(frozen=True)
class Resistor:
    """A resistance between two nodes: resistors, fuses, thermistors, winding DC resistance,
    conductors, and the low resistance a shorted part leaves."""

    name: str
    a: str
    b: str
    ohm: float

    @property
    def nodes(self) -> tuple[str, str]:
        return (self.a, self.b)


@dataclass(frozen=True)
class Winding:
    """A transformer winding: its DC resistance; its inductance matters only to AC instruments."""

    name: str
    a: str
    b: str
    ohm: float
    henry: float = 0.0

    @property
    def nodes(self) -> tuple[str, str]:
        return (self.a, self.b)


@dataclass(frozen=True)
class Capacitor:
    """A capacitor: open to a settled DC reading, a short (its ESR) at the touch of the probes
    while discharged."""

    name: str
    plus: str
    minus: str
    farad: float
    esr_ohm: float = 0.0

    @property
    def nodes(self) -> tuple[str, str]:
        return (self.plus, self.minus)


@dataclass(frozen=True)
class Junction:
    """A pn or Schottky junction from anode to cathode; ``offset_v`` shifts its law (a Zener's
    breakdown is a junction from cathode to anode offset by the Zener voltage)."""

    name: str
    anode: str
    cathode: str
    kind: JunctionKind
    offset_v: float = 0.0

    @property
    def nodes(self) -> tuple[str, str]:
        return (self.anode, self.cathode)


Element = Resistor | Winding | Capacitor | Junction
