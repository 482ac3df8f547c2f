"""A cold check as the technician makes it: the instrument, the probe pairs (red first), how the
readings of several legs make the one number entered, and a leg lifted first.

Several legs make one number. The four diodes of a bridge: the leg that stands out from the others,
or any of them when they agree, so a shorted leg (near 0) and an open one (OL) both show in the
number entered [practice: a bridge is judged by the diode that reads unlike the rest]. A
transistor's junctions and collector-emitter: the lowest, so a short on any pair shows, and an open
transistor (both junctions OL) reads OL [practice].
"""

from __future__ import annotations

import math
import statistics
from dataclasses import dataclass
from functools import lru_cache

import networkx as nx

from fixbench.physics.cold.ac import capacitance_reading, esr_reading
from fixbench.physics.cold.board_part import BoardPart, lifted_node
from fixbench.physics.cold.elements import Capacitor, Element
from fixbench.physics.cold.meter import HANDHELD, Meter
from fixbench.physics.cold.netlist import ColdNetlist
from fixbench.physics.cold.readings import diode_test, ohms
from fixbench.physics.cold.part_models import cold_elements, joined_in_any_mode

INSTRUMENTS = ("ohmmeter", "diode_test", "capacitance", "esr")
COMBINES = ("one", "odd_one_out", "lowest")
LIFTED = "lifted"  # a probe node written this way goes on the lifted leg


@dataclass(frozen=True)
class Probing:
    """How one cold check is measured."""

    instrument: str
    pairs: tuple[tuple[str, str], ...]  # (red node, black node) per leg
    combine: str = "one"
    lift: tuple[str, str] | None = None  # (part id, pin) lifted off its pad before measuring

    def __post_init__(self) -> None:
        if self.instrument not in INSTRUMENTS:
            raise ValueError(f"no cold reading with instrument '{self.instrument}'")
        if self.combine not in COMBINES:
            raise ValueError(f"no way to combine legs called '{self.combine}' (known: {', '.join(COMBINES)})")
        if not self.pairs or (self.combine == "one" and len(self.pairs) != 1):
            raise ValueError(f"'{self.combine}' needs {'one pair' if self.combine == 'one' else 'pairs'} of probe nodes")

    def board(self, netlist: ColdNetlist) -> ColdNetlist:
        """The board as measured: with the leg lifted, if the check lifts one."""
        return netlist.with_lifted(*self.lift) if self.lift else netlist

    def legs(self) -> tuple[tuple[str, str], ...]:
        """The probe pairs with the lifted leg's own node in place of ``lifted``."""
        def node(name: str) -> str:
            if name != LIFTED:
                return name
            if self.lift is None:
                raise ValueError("a probe on the lifted leg needs a leg lifted")
            return lifted_node(*self.lift)

        return tuple((node(red), node(black)) for red, black in self.pairs)


def leg_reading(netlist: ColdNetlist, instrument: str, red: str, black: str, meter: Meter = HANDHELD) -> float:
    """One leg's settled display value, SI (inf for OL)."""
    if instrument == "ohmmeter":
        return ohms(netlist, red, black, meter, touch=False).value
    if instrument == "diode_test":
        return diode_test(netlist, red, black, meter, touch=False).value
    if instrument == "capacitance":
        return capacitance_reading(netlist, red, black)
    return esr_reading(netlist, red, black)


def odd_one_out(values: tuple[float, ...]) -> float:
    """The value furthest from the others on a log scale (the first when they agree)."""
    finite = [v for v in values if not math.isinf(v)]
    if not finite:
        return math.inf
    middle = max(statistics.median(finite if len(finite) == len(values) else values), 1e-9)

    def distance(v: float) -> float:
        return math.inf if math.isinf(v) else abs(math.log(max(v, 1e-9) / middle))

    return max(values, key=distance)


def reading(netlist: ColdNetlist, probing: Probing, meter: Meter = HANDHELD) -> float:
    """The number the technician enters for this check on this board."""
    board = probing.board(netlist)
    values = tuple(leg_reading(board, probing.instrument, red, black, meter) for red, black in probing.legs())
    if probing.combine == "lowest":
        return min(values)
    return values[0] if probing.combine == "one" else odd_one_out(values)


def parts_in_reach(netlist: ColdNetlist, probing: Probing) -> frozenset[str]:
    """Parts whose state can change this check's reading, alone or with other failures: those
    joining two nodes of a leg's measured block when every part joins all the nodes any of its
    states joins (a graph of every failure at once). Failures of the other parts cannot reach the
    probes: they hang off that block at one node at most [textbook: blocks of a graph]."""
    board = probing.board(netlist)
    graph = nx.Graph()
    joins = {part.id: joined_in_any_mode(part) for part in board.parts}
    for pairs in joins.values():
        graph.add_edges_from((a, b) for a, b in pairs if a != b)
    reach: set[str] = set()
    for red, black in probing.legs():
        if red == black:
            continue
        measured = graph.copy()
        measured.add_edge(red, black)
        block = next(b for b in nx.biconnected_components(measured) if red in b and black in b)
        reach.update(p for p, pairs in joins.items() if any(a in block and b in block and a != b for a, b in pairs))
    if probing.lift:
        reach.add(probing.lift[0])
    return frozenset(reach)


# Readings already made, by what the instrument sees of the parts in reach: DC instruments do not
# see a capacitor that is not shorted, so a dried capacitor reads on the ohms range as a good one.
_MEMO: dict[tuple, float] = {}
_MEMO_LIMIT = 200_000


@lru_cache(maxsize=16384)
def _seen(part: BoardPart, instrument: str) -> tuple[Element, ...]:
    elements = cold_elements(part)
    if instrument in ("ohmmeter", "diode_test"):
        return tuple(e for e in elements if not isinstance(e, Capacitor))
    return elements


def solved_readings() -> int:
    """How many distinct readings are remembered (each was solved once)."""
    return len(_MEMO)


def reading_in_reach(netlist: ColdNetlist, probing: Probing, reach: frozenset[str],
                     meter: Meter = HANDHELD) -> float:
    """:func:`reading` on the parts in ``reach`` alone (see :func:`parts_in_reach`), remembered by
    what the instrument sees of them, so the many faulty boards that differ only out of reach or
    in ways the instrument does not see are solved once."""
    parts = tuple(netlist.part(p) for p in sorted(reach))
    key = (probing, meter, tuple(_seen(p, probing.instrument) for p in parts))
    value = _MEMO.get(key)
    if value is None:
        if len(_MEMO) >= _MEMO_LIMIT:
            _MEMO.clear()
        value = _MEMO[key] = reading(ColdNetlist(parts), probing, meter)
    return value
