"""ngspice decks for the cold network: the same board and meter, solved by ngspice instead of by
fixbench's own solver.

Every element joined to the probes by some path goes into the deck, not only the block fixbench
solves, so its topology reduction is checked too; parts with no galvanic path to either probe (the
other side of the isolation slot) are left out, since ngspice can only pin such an island to ground
through its node shunts, which leaves its matrix too ill-conditioned to solve. Resistors and winding
resistances are R cards, capacitors C cards (open in an operating point), junctions D cards with
their own .model (IS, N; RS = 0), a junction with an offset is a D card in series with a DC source,
and the meter is its open-circuit voltage behind its source resistance with the black probe on
ground. ``.option rshunt`` puts 1e14 ohm from every node to ground so nodes reached only through
capacitors have a DC path (1e12 ohm in the transients); on a board of tens of nodes it shifts a
reading of tens of megohms by a few parts per million. Several probe set-ups run in one deck as
copies of the board that share only the ground node, so each copy carries only its own meter's
current.
"""

from __future__ import annotations

import re
import subprocess
from dataclasses import dataclass
from pathlib import Path

import networkx as nx

from fixbench.physics.cold.meter import MeterSource
from fixbench.physics.cold.elements import Capacitor, Junction, Resistor, Winding
from fixbench.physics.cold.netlist import ColdNetlist
from tests.support.ngspice import ngspice_binary

RESULT_TAG = "FIXBENCH_COLD"
_RESULT_LINE = re.compile(RESULT_TAG + r"[ \t]+(\d+)[ \t]+(\S+)")


@dataclass(frozen=True)
class Probe:
    """One set-up: the board, where the red and black probes go, and the meter's range."""

    netlist: ColdNetlist
    red: str
    black: str
    source: MeterSource


def _copy_lines(k: int, probe: Probe, models: dict[tuple[float, float], str],
                with_esr: bool = False) -> tuple[list[str], str]:
    names: dict[str, str] = {probe.black: "0"}

    def node(name: str) -> str:
        if name not in names:
            names[name] = f"c{k}n{len(names)}"
        return names[name]

    lines = [f"* copy {k}: red on {probe.red}, black on {probe.black}, {probe.source.label}"]
    graph = nx.Graph([e.nodes for e in probe.netlist.elements])
    graph.add_nodes_from((probe.red, probe.black))
    joined = nx.node_connected_component(graph, probe.red) | nx.node_connected_component(graph, probe.black)
    for i, e in enumerate(probe.netlist.elements):
        if e.nodes[0] not in joined:
            continue
        card = f"{k}x{i}"
        if isinstance(e, (Resistor, Winding)):
            lines.append(f"R{card} {node(e.a)} {node(e.b)} {e.ohm!r}")
        elif isinstance(e, Capacitor) and with_esr:
            inner = f"c{k}e{i}"
            lines.append(f"R{card}esr {node(e.plus)} {inner} {max(e.esr_ohm, 1e-3)!r}")
            lines.append(f"C{card} {inner} {node(e.minus)} {e.farad!r} IC=0")
        elif isinstance(e, Capacitor):
            lines.append(f"C{card} {node(e.plus)} {node(e.minus)} {e.farad!r}")
        elif isinstance(e, Junction):
            key = (e.kind.saturation, e.kind.emission)
            model = models.setdefault(key, f"DJ{len(models)}")
            if e.offset_v:
                inner = f"c{k}j{i}"
                lines.append(f"V{card} {node(e.anode)} {inner} DC {e.offset_v!r}")
                lines.append(f"D{card} {inner} {node(e.cathode)} {model}")
            else:
                lines.append(f"D{card} {node(e.anode)} {node(e.cathode)} {model}")
    lines.append(f"VM{k} c{k}meter 0 DC {probe.source.open_circuit_v!r}")
    lines.append(f"RM{k} c{k}meter {node(probe.red)} {probe.source.source_ohm!r}")
    return lines, node(probe.red)


def op_deck(probes: list[Probe]) -> tuple[str, list[str]]:
    """The deck text and, per probe set-up, the ngspice node of its red probe."""
    models: dict[tuple[float, float], str] = {}
    body: list[str] = []
    reds: list[str] = []
    for k, probe in enumerate(probes):
        lines, red = _copy_lines(k, probe, models)
        body += lines
        reds.append(red)
    model_lines = [f".model {name} D(IS={saturation!r} N={emission!r} RS=0)"
                   for (saturation, emission), name in models.items()]
    control = [".control", "set numdgt=12", "op"] + [f'echo "{RESULT_TAG} {k} $&v({red})"' for k, red in enumerate(reds)]
    deck = ["* fixbench cold network operating points",
            ".options rshunt=1e14 reltol=1e-6 vntol=1e-10 abstol=1e-15 gmin=1e-12",
            *model_lines, *body, *control, "quit", ".endc", ".end", ""]
    return "\n".join(deck), reds


def run_op(probes: list[Probe], workdir: Path, timeout_s: float = 60.0) -> list[float]:
    """The red probe's voltage (black is 0 V) of every set-up, from one ngspice run."""
    binary = ngspice_binary()
    if binary is None:
        raise RuntimeError("ngspice is not installed (Debian package 'ngspice')")
    text, _ = op_deck(probes)
    deck = workdir / "cold.cir"
    deck.write_text(text)
    completed = subprocess.run([binary, "-b", str(deck)], capture_output=True, text=True,
                               timeout=timeout_s, cwd=workdir)
    output = completed.stdout + "\n" + completed.stderr
    if completed.returncode != 0:
        raise RuntimeError(f"ngspice exited with {completed.returncode}:\n{output}")
    found = {int(m.group(1)): float(m.group(2)) for m in _RESULT_LINE.finditer(output)}
    if sorted(found) != list(range(len(probes))):
        raise RuntimeError(f"ngspice printed {len(found)} of {len(probes)} {RESULT_TAG} lines:\n{output}")
    return [found[k] for k in range(len(probes))]


def run_transient(probe: Probe, times: list[float], workdir: Path, timeout_s: float = 120.0) -> list[float]:
    """The red probe's voltage at ``times`` after the probes touch a discharged board (UIC: every
    capacitor starts at 0 V; the ESR of each is a series resistor)."""
    binary = ngspice_binary()
    if binary is None:
        raise RuntimeError("ngspice is not installed (Debian package 'ngspice')")
    models: dict[tuple[float, float], str] = {}
    lines, red = _copy_lines(0, probe, models, with_esr=True)
    stop = max(times) * 1.01
    measures = [f"meas tran t{k} FIND v({red}) AT={t!r}" for k, t in enumerate(times)]
    echoes = [f'echo "{RESULT_TAG} {k} $&t{k}"' for k in range(len(times))]
    deck = ["* fixbench cold network transient from discharged capacitors",
            ".options rshunt=1e12 reltol=1e-5 abstol=1e-14 gmin=1e-12",
            *[f".model {name} D(IS={s!r} N={n!r} RS=0)" for (s, n), name in models.items()],
            *lines, ".control", "set numdgt=12", f"tran {min(times) / 20!r} {stop!r} 0 {stop / 2000!r} uic",
            *measures, *echoes, "quit", ".endc", ".end", ""]
    path = workdir / "creep.cir"
    path.write_text("\n".join(deck))
    completed = subprocess.run([binary, "-b", str(path)], capture_output=True, text=True,
                               timeout=timeout_s, cwd=workdir)
    output = completed.stdout + "\n" + completed.stderr
    found = {int(m.group(1)): float(m.group(2)) for m in _RESULT_LINE.finditer(output)}
    if completed.returncode != 0 or sorted(found) != list(range(len(times))):
        raise RuntimeError(f"ngspice transient failed ({completed.returncode}):\n{output}")
    return [found[k] for k in range(len(times))]
