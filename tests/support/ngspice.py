"""Build, run and read an ngspice transient of a mains bridge rectifier feeding a bulk capacitor.

The tests use ngspice (the Debian package) as an independent reference for the bulk-rail physics:
a floating sine source through a series resistance (fuse, NTC and wiring), four 1N4007 diodes, the
bulk capacitor and either a resistive or a constant-power load. The deck's ``.control`` block runs
the transient and measures the capacitor voltage over the last few mains cycles, after the
capacitor has settled, and prints one line the parser reads back.
"""

from __future__ import annotations

import math
import re
import shutil
import subprocess
from dataclasses import dataclass
from pathlib import Path

# A commonly published SPICE model of the 1N4007 [memory: vendor/community model widely reproduced].
D1N4007_MODEL = (
    ".model D1N4007 D(IS=7.02767n RS=0.0341512 N=1.80803 EG=1.05743 XTI=5 BV=1000 IBV=5e-08 "
    "CJO=1e-11 VJ=0.7 M=0.5 FC=0.5 TT=1e-07)"
)

RESULT_TAG = "FIXBENCH_RESULT"
_RESULT_LINE = re.compile(RESULT_TAG + r"\s+(\S+)\s+(\S+)\s+(\S+)")


@dataclass(frozen=True)
class BridgeCase:
    """One bridge-rectifier simulation: mains, capacitor and load (exactly one of the two loads)."""

    v_rms: float
    mains_hz: float
    capacitance: float
    source_ohm: float = 10.0
    load_ohm: float | None = None
    load_w: float | None = None
    settle_cycles: int = 20
    measure_cycles: int = 4

    @property
    def load_floor_v(self) -> float:
        """Below this rail voltage a constant-power load draws no more current than at it: a
        switch-mode supply stays off until its start threshold, so a discharged capacitor at
        power-up does not meet an infinite current demand (which latches the simulation at 0 V)."""
        return 0.5 * math.sqrt(2.0) * self.v_rms

    def __post_init__(self) -> None:
        if (self.load_ohm is None) == (self.load_w is None):
            raise ValueError("give exactly one of load_ohm or load_w")

    def label(self) -> str:
        load = f"{self.load_ohm:g} ohm" if self.load_ohm is not None else f"{self.load_w:g} W const-P"
        return f"{self.v_rms:g} V/{self.mains_hz:g} Hz, {self.capacitance * 1e6:g} uF, {load}"


@dataclass(frozen=True)
class BridgeResult:
    """Capacitor voltage over the measured cycles: maximum, minimum and mean (V)."""

    v_max: float
    v_min: float
    v_avg: float

    @property
    def ripple(self) -> float:
        return self.v_max - self.v_min


def ngspice_binary() -> str | None:
    return shutil.which("ngspice")


def bridge_deck(case: BridgeCase) -> str:
    """The netlist text of ``case``: source a-b, bridge to pos/0, capacitor and load on pos."""
    period = 1.0 / case.mains_hz
    stop = (case.settle_cycles + case.measure_cycles) * period
    start_measure = case.settle_cycles * period
    step = period / 4000.0
    peak = math.sqrt(2.0) * case.v_rms
    if case.load_ohm is not None:
        load = f"RLOAD pos 0 {case.load_ohm:g}"
    else:
        # A switch-mode supply draws constant power from the bulk rail; above the floor this is
        # exactly P/V, and the tests check the measured minimum stays above the floor.
        load = f"BLOAD pos 0 I = {case.load_w:g} / max(V(pos), {case.load_floor_v:.6g})"
    return "\n".join([
        f"* fixbench bridge rectifier: {case.label()}",
        D1N4007_MODEL,
        f"VMAINS a_src b 0 SIN(0 {peak:.6g} {case.mains_hz:g})",
        f"RSRC a_src a {case.source_ohm:g}",
        "D1 a pos D1N4007",
        "D2 b pos D1N4007",
        "D3 0 a D1N4007",
        "D4 0 b D1N4007",
        # Leakage paths so the floating mains has a DC reference; far too large to load anything.
        "RLEAKA a 0 100Meg",
        "RLEAKB b 0 100Meg",
        f"CBULK pos 0 {case.capacitance:g}",
        load,
        ".control",
        f"tran {step:.6g} {stop:.6g} 0 {step:.6g}",
        f"meas tran vmax MAX v(pos) from={start_measure:.6g} to={stop:.6g}",
        f"meas tran vmin MIN v(pos) from={start_measure:.6g} to={stop:.6g}",
        f"meas tran vavg AVG v(pos) from={start_measure:.6g} to={stop:.6g}",
        f"echo \"{RESULT_TAG} $&vmax $&vmin $&vavg\"",
        "quit",
        ".endc",
        ".end",
        "",
    ])


def parse_result(output: str) -> BridgeResult:
    """Read the result line the deck echoes; fail loudly with ngspice's output if it is missing."""
    match = _RESULT_LINE.search(output)
    if not match:
        raise RuntimeError(f"ngspice printed no {RESULT_TAG} line; its output was:\n{output}")
    v_max, v_min, v_avg = (float(group) for group in match.groups())
    return BridgeResult(v_max=v_max, v_min=v_min, v_avg=v_avg)


def run_bridge(case: BridgeCase, workdir: Path, timeout_s: float = 120.0) -> BridgeResult:
    """Write the deck into ``workdir``, run ``ngspice -b`` on it and return the measurements."""
    binary = ngspice_binary()
    if binary is None:
        raise RuntimeError("ngspice is not installed (Debian package 'ngspice')")
    deck = workdir / "bridge.cir"
    deck.write_text(bridge_deck(case))
    completed = subprocess.run(
        [binary, "-b", str(deck)], capture_output=True, text=True, timeout=timeout_s, cwd=workdir,
    )
    output = completed.stdout + "\n" + completed.stderr
    if completed.returncode != 0:
        raise RuntimeError(f"ngspice exited with {completed.returncode}:\n{output}")
    return parse_result(output)
