"""The DC operating point of a board with a meter's test source across two nodes.

Topology first (networkx): with the meter added as an edge between its probes, only the elements of
the biconnected block that holds that edge can carry the meter's current; everything hanging off
the block at a single node carries none [textbook: the blocks of a graph; a subnetwork joined at
one node exchanges no current]. So the solve runs on that block alone, and a fault outside it does
not change the key under which the block's solution is cached.

Then modified nodal analysis with Newton iterations on the junctions, each linearised at its
present voltage, with SPICE's junction voltage limiting so the exponential cannot overshoot
[src: L. W. Nagel, SPICE2, UCB/ERL M520 (1975), pnjlim; the same scheme as ngspice]. A conductance
GMIN sits across every junction as in SPICE [src: ngspice manual, option GMIN default 1e-12 S].
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

import networkx as nx
import numpy as np

from fixbench.physics.cold.meter import MeterSource
from fixbench.physics.cold.elements import Capacitor, Element, Junction, Resistor, Winding

GMIN = 1e-12  # S [src: ngspice manual, GMIN default]
VOLT_TOLERANCE = 1e-9  # V: absolute node-voltage convergence
RELATIVE_TOLERANCE = 1e-7  # above the rounding noise of nearly floating nodes (a few 1e-9 V)
MAX_ITERATIONS = 300
DISCHARGED_FLOOR_OHM = 1e-3  # a discharged capacitor with no stated ESR still has its leads


class ConvergenceError(RuntimeError):
    """The Newton iterations did not settle (a programmer's netlist with no DC solution)."""


@dataclass(frozen=True)
class OperatingPoint:
    """The meter's view: probe voltage (red minus black), the current it drives into the red probe,
    and the voltage of every node of the measured block (black is 0 V)."""

    volts: float
    amps: float
    node_volts: tuple[tuple[str, float], ...]

    def node(self, name: str) -> float:
        return dict(self.node_volts).get(name, math.nan)


def conducting(element: Element, discharged: bool) -> Element | None:
    """The element as DC sees it: a capacitor is open once settled, its ESR while discharged."""
    if isinstance(element, Capacitor):
        if not discharged:
            return None
        return Resistor(element.name, element.plus, element.minus, max(element.esr_ohm, DISCHARGED_FLOOR_OHM))
    return element


@lru_cache(maxsize=8192)
def measured_block(elements: tuple[Element, ...], red: str, black: str,
                   discharged: bool = False) -> tuple[Element, ...]:
    """The elements that can carry current between ``red`` and ``black``, in a canonical order."""
    live = [c for c in (conducting(e, discharged) for e in elements) if c is not None]
    graph = nx.Graph()
    graph.add_edge(red, black)
    graph.add_edges_from(e.nodes for e in live if e.nodes[0] != e.nodes[1])
    block = next(nodes for nodes in nx.biconnected_components(graph) if red in nodes and black in nodes)
    kept = [e for e in live if e.nodes[0] != e.nodes[1] and e.nodes[0] in block and e.nodes[1] in block]
    return tuple(sorted(kept, key=lambda e: e.name))


def reaches_capacitor(elements: tuple[Element, ...], red: str, black: str) -> bool:
    """Whether a capacitor can take charge from the meter: it is in the measured block once
    capacitors conduct."""
    names = {c.name for c in _capacitors(elements)}
    return bool(names) and any(e.name in names for e in measured_block(elements, red, black, True))


@lru_cache(maxsize=8192)
def _capacitors(elements: tuple[Element, ...]) -> tuple[Capacitor, ...]:
    return tuple(e for e in elements if isinstance(e, Capacitor))


def is_linear(elements: tuple[Element, ...], red: str, black: str) -> bool:
    """Whether no junction carries the meter's current (the reading is the same on every range)."""
    return not any(isinstance(e, Junction) for e in measured_block(elements, red, black))


def operating_point(elements: tuple[Element, ...], red: str, black: str, source: MeterSource,
                    discharged: bool = False) -> OperatingPoint:
    """The operating point with ``source`` driving ``red`` against ``black``."""
    if red == black:
        return OperatingPoint(0.0, source.short_circuit_a, ((red, 0.0),))
    return _solve_block(measured_block(elements, red, black, discharged), red, black, source)


def _limit(v_new: np.ndarray, v_old: np.ndarray, slope: np.ndarray, critical: np.ndarray) -> np.ndarray:
    """SPICE's pnjlim: above the critical voltage, a step up is taken on the log of the current."""
    big = (v_new > critical) & (np.abs(v_new - v_old) > 2.0 * slope)
    if not big.any():
        return v_new
    up = big & (v_old > 0.0)
    arg = 1.0 + (v_new - v_old) / slope
    with np.errstate(invalid="ignore", divide="ignore"):
        from_old = v_old + slope * np.log(np.where(arg > 0.0, arg, 1.0))
        from_zero = slope * np.log(np.where(v_new > 0.0, v_new / slope, 1.0))
    limited = np.where(up, np.where(arg > 0.0, from_old, critical), v_new)
    return np.where(big & ~(v_old > 0.0), from_zero, limited)


@dataclass(frozen=True, eq=False)
class _Prepared:
    """A block's matrices that do not depend on the meter's range (built once per block)."""

    nodes: tuple[str, ...]
    red_at: int  # index of the red probe's node (black is the reference, not a row)
    linear: np.ndarray  # flattened conductance matrix of the resistive elements
    anode: np.ndarray  # per junction: node index, or -1 for the black probe
    cathode: np.ndarray
    saturation: np.ndarray
    slope: np.ndarray
    offset: np.ndarray
    critical: np.ndarray
    stamp: np.ndarray  # junction conductances -> flattened matrix
    inject: np.ndarray  # junction equivalent currents -> right-hand side


@lru_cache(maxsize=8192)
def _prepare(block: tuple[Element, ...], red: str, black: str) -> _Prepared:
    nodes = tuple(sorted({n for e in block for n in e.nodes} - {black}))
    size = len(nodes)
    index = {n: i for i, n in enumerate(nodes)}

    def at(node: str) -> int:
        return -1 if node == black else index[node]

    linear = np.zeros((size, size))

    def add(i: int, j: int, g: float) -> None:
        for r, c, sign in ((i, i, 1.0), (j, j, 1.0), (i, j, -1.0), (j, i, -1.0)):
            if r >= 0 and c >= 0:
                linear[r, c] += sign * g

    junctions = []
    for e in block:
        if isinstance(e, (Resistor, Winding)):
            add(at(e.a), at(e.b), 1.0 / e.ohm)
        elif isinstance(e, Junction):
            junctions.append(e)
    count = len(junctions)
    anode = np.array([at(j.anode) for j in junctions], dtype=int)
    cathode = np.array([at(j.cathode) for j in junctions], dtype=int)
    saturation = np.array([j.kind.saturation for j in junctions])
    slope = np.array([j.kind.slope_v for j in junctions])
    stamp = np.zeros((size * size, count))
    inject = np.zeros((size, count))
    for k, (a, c) in enumerate(zip(anode, cathode)):
        for r, col, sign in ((a, a, 1.0), (c, c, 1.0), (a, c, -1.0), (c, a, -1.0)):
            if r >= 0 and col >= 0:
                stamp[r * size + col, k] += sign
        if a >= 0:
            inject[a, k] -= 1.0
        if c >= 0:
            inject[c, k] += 1.0
    return _Prepared(nodes, at(red), linear.reshape(-1), anode, cathode, saturation, slope,
                     np.array([j.offset_v for j in junctions]),
                     slope * np.log(slope / (math.sqrt(2.0) * saturation)) if count else slope,
                     stamp, inject)


@lru_cache(maxsize=65536)
def _solve_block(block: tuple[Element, ...], red: str, black: str, source: MeterSource) -> OperatingPoint:
    if not block:  # nothing joins the probes: the open-circuit voltage appears across them
        return OperatingPoint(source.open_circuit_v, 0.0, ((red, source.open_circuit_v), (black, 0.0)))
    p = _prepare(block, red, black)
    size = len(p.nodes)
    g_source = 1.0 / source.source_ohm
    linear = p.linear.copy()
    linear[p.red_at * size + p.red_at] += g_source
    rhs = np.zeros(size)
    rhs[p.red_at] = source.open_circuit_v * g_source
    if not len(p.anode):  # a linear block: one solve
        volts = np.linalg.solve(linear.reshape(size, size), rhs)
        return _point(volts, p, red, black, source)

    volts = newton(p, linear, rhs, np.zeros(size), f"{red}-{black}")
    return _point(volts, p, red, black, source)


def newton(p: _Prepared, linear: np.ndarray, rhs: np.ndarray, start: np.ndarray, label: str) -> np.ndarray:
    """Node voltages with the junctions of ``p`` on top of the flattened ``linear`` matrix and
    ``rhs``, from the guess ``start``."""
    size = len(p.nodes)
    volts = np.zeros(size + 1)  # the last entry stands for the black probe at 0 V (index -1)
    volts[:size] = start
    v_junction = volts[p.anode] - volts[p.cathode] - p.offset
    shape = (size, size)
    for _ in range(MAX_ITERATIONS):
        v_try = volts[p.anode] - volts[p.cathode] - p.offset
        v_junction = _limit(v_try, v_junction, p.slope, p.critical)
        exp_term = np.exp(v_junction / p.slope)
        conductance = p.saturation * exp_term / p.slope + GMIN
        equivalent = p.saturation * (exp_term - 1.0) + GMIN * v_junction - conductance * (v_junction + p.offset)
        solved = np.linalg.solve((linear + p.stamp.dot(conductance)).reshape(shape), rhs + p.inject.dot(equivalent))
        step = np.abs(solved - volts[:size]).max()
        volts[:size] = solved
        if step <= VOLT_TOLERANCE + RELATIVE_TOLERANCE * np.abs(solved).max() and (v_junction == v_try).all():
            return solved
    raise ConvergenceError(f"no DC solution across {label} after {MAX_ITERATIONS} iterations")


def _point(volts: np.ndarray, p: _Prepared, red: str, black: str, source: MeterSource) -> OperatingPoint:
    v_red = float(volts[p.red_at])
    amps = (source.open_circuit_v - v_red) / source.source_ohm
    node_volts = tuple(zip(p.nodes, (float(v) for v in volts))) + ((black, 0.0),)
    return OperatingPoint(v_red, amps, node_volts)


def branch_currents(elements: tuple[Element, ...], point: OperatingPoint) -> dict[str, float]:
    """The current in each resistive element and junction of the measured block at ``point``
    (elements outside the block carry none)."""
    volts = dict(point.node_volts)
    currents = {}
    for e in elements:
        if e.nodes[0] not in volts or e.nodes[1] not in volts:
            continue
        across = volts[e.nodes[0]] - volts[e.nodes[1]]
        if isinstance(e, (Resistor, Winding)):
            currents[e.name] = across / e.ohm
        elif isinstance(e, Junction):
            currents[e.name] = e.kind.current(across - e.offset_v) + GMIN * (across - e.offset_v)
    return currents
