"""Run the live decks of tests/support/live_deck.py in ngspice, read what they show, and class it.

A run writes its traces (bulk, Vcc, drain, board output, primary current, drive) at every time
step; :func:`features` boils the second half of the run down to bins of 20 switching periods: the
mean bulk, Vcc and output of each, and two activity strings (did the drive switch, did current flow
in the primary), with the drain's highest value over the whole run. Those features
are what the cache keeps, keyed by the SHA-256 of the deck text, in tests/engine/data/live_spice.json:
a deck that has not changed is not run again, and any change to a family's figures, a part value or
the deck builder changes the text and so runs it afresh. :func:`simulated_classes` turns features
into the classes the operating model is compared on; :func:`model_classes` does the same for an
``Operation``.
"""

from __future__ import annotations

import fcntl
import hashlib
import json
import os
import subprocess
import tempfile
from concurrent.futures import ThreadPoolExecutor
from pathlib import Path

import numpy as np

from fixbench.knowledge.model import Family
from fixbench.physics.outputs import output_window
from fixbench.physics.ratings import Ratings
from tests.support.live_deck import TRACES, UVLO_SCALE
from tests.support.ngspice import ngspice_binary

CACHE_FILE = Path(__file__).resolve().parent.parent / "engine" / "data" / "live_spice.json"
BIN_PERIODS = 20  # switching periods per activity bin
LATE_FROM = 0.5  # classes read from this fraction of the run on (after the first start)
ACTIVE_CURRENT_A = 0.02  # primary current that carries energy to the transformer
ACTIVE_DRIVE_V = 2.0  # a drive pin above this is switching
VCC_ZERO_V = 1.0
VCC_CYCLING_V = 2.0  # swing of Vcc over the late window that counts as cycling
OUTPUT_ZERO_FRACTION = 0.1  # of the rated output


def deck_key(text: str) -> str:
    return hashlib.sha256(text.encode()).hexdigest()


def run_deck(text: str, timeout_s: float = 600.0) -> np.ndarray:
    """Run ``text`` in ngspice and return its traces: time, then ``TRACES`` in order."""
    binary = ngspice_binary()
    if binary is None:
        raise RuntimeError("ngspice is not installed (Debian package 'ngspice')")
    with tempfile.TemporaryDirectory(prefix="fixbench-live-") as work:
        (Path(work) / "live.cir").write_text(text)
        done = subprocess.run([binary, "-b", "live.cir"], cwd=work, capture_output=True, text=True,
                              timeout=timeout_s)
        output = done.stdout + "\n" + done.stderr
        data = Path(work) / "live.data"
        if done.returncode != 0 or not data.exists() or "aborted" in output:
            raise RuntimeError(f"ngspice failed ({done.returncode}):\n{output[-3000:]}")
        raw = np.loadtxt(data)
    # wrdata writes a time column before every trace.
    return np.column_stack([raw[:, 0]] + [raw[:, 2 * k + 1] for k in range(len(TRACES))])


def _bin_edges(t: np.ndarray, switching_hz: float) -> list[np.ndarray]:
    stop = float(t[-1])
    edges = np.arange(LATE_FROM * stop, stop + 1e-12, BIN_PERIODS / switching_hz)
    return [(t >= lo) & (t < hi) for lo, hi in zip(edges[:-1], edges[1:])]


def features(traces: np.ndarray, switching_hz: float) -> dict[str, object]:
    """The numbers a run is classed on (see the module docstring): per bin of the late window the
    mean bulk, Vcc and output, and whether the drive switched and the primary carried current."""
    t = traces[:, 0]
    cols = dict(zip(TRACES, traces[:, 1:].T))
    bins = _bin_edges(t, switching_hz)

    def means(name: str) -> list[float]:
        return [round(float(cols[name][b].mean()), 4) for b in bins]

    def active(values: np.ndarray) -> str:
        return "".join("1" if values[b].any() else "0" for b in bins)

    return {
        "stop_s": float(t[-1]), "drain_max": round(float(cols["switch"].max()), 2),
        "bulk_bins": means("bulk"), "vcc_bins": means("vcc"), "out_bins": means("out"),
        "drive_bins": active(cols["drive"] > ACTIVE_DRIVE_V),
        "energy_bins": active(np.abs(cols["iprimary"]) > ACTIVE_CURRENT_A),
    }


def load_cache() -> dict[str, dict]:
    return json.loads(CACHE_FILE.read_text()) if CACHE_FILE.exists() else {}


def save_cache(cache: dict[str, dict]) -> None:
    CACHE_FILE.parent.mkdir(parents=True, exist_ok=True)
    CACHE_FILE.write_text(json.dumps(dict(sorted(cache.items())), indent=1) + "\n")


def simulate_all(decks: dict[str, tuple[str, float]], workers: int | None = None) -> dict[str, dict]:
    """Features of every deck (label -> (text, switching Hz)), from the cache where the text is
    there, else run in parallel ngspice processes and added to the cache file."""
    # One process runs the missing decks while others (pytest-xdist workers) wait, then read them.
    with open(Path(tempfile.gettempdir()) / "fixbench-live-spice.lock", "w") as lock:
        fcntl.flock(lock, fcntl.LOCK_EX)
        return _simulate_missing(decks, workers)


def _simulate_missing(decks: dict[str, tuple[str, float]], workers: int | None) -> dict[str, dict]:
    cache = load_cache()
    missing = {label: deck for label, deck in decks.items() if deck_key(deck[0]) not in cache}
    if missing:
        def one(item):
            label, (text, hz) = item
            return deck_key(text), features(run_deck(text), hz)
        with ThreadPoolExecutor(max_workers=workers or min(2, os.cpu_count() or 1)) as pool:
            for key, found in pool.map(one, missing.items()):
                cache[key] = found
        # Keep only the decks asked for now: the file holds the current table, nothing stale.
        save_cache({deck_key(text): cache[deck_key(text)] for text, _ in decks.values()})
    return {label: cache[deck_key(text)] for label, (text, _) in decks.items()}


def _bursts(bins: str) -> bool:
    """Activity that stops and starts again: on, off, on (a burst, a gap, another burst)."""
    stripped = bins.strip("0")
    return "0" in stripped


def simulated_classes(family: Family, ratings: Ratings, found: dict) -> dict[str, str]:
    """Classes of one run: operating state, Vcc, loaded output, audible bursts.

    Read as a meter and an ear would once the unit has settled: a bulk below 30 % of the crest
    over the last fifth of the run means the input is open (a fuse that opened, or never had
    mains), and what the bulk's leftover charge ran before that is not counted. A controller's
    hiccup spends UVLO_SCALE times longer off on the bench than in the deck, so its output is the
    deck's output while driving times the duty the bench would have."""
    design = family.design
    crest = 2 ** 0.5 * ratings.bench_mains
    controller = design.drive == "controller"
    bulk, vcc_bins, out_bins = found["bulk_bins"], found["vcc_bins"], found["out_bins"]
    tail = bulk[-max(1, len(bulk) // 5):]
    if sum(tail) / len(tail) < 0.3 * crest:
        classes = {"state": "no_power", "output": "zero", "ticking": "no"}
        if controller:
            classes["vcc"] = "zero"
        return classes
    vcc = ("zero" if max(vcc_bins) < VCC_ZERO_V else
           "cycling" if max(vcc_bins) - min(vcc_bins) > VCC_CYCLING_V else "steady")
    # The switch is switching where current flows in the primary: a gate that toggles a switch
    # that is open, or a base held half on through its bias resistor, moves no energy.
    drive = found["energy_bins"]
    driving = "1" in drive
    if found["drain_max"] > design.switch_rating_v:
        state = "switch_fails"
    elif controller and vcc == "cycling":
        state = "hiccup"
    elif not driving:
        state = "no_start"
    elif _bursts(drive):
        state = "hiccup"
    else:
        state = "running"
    out = sum(out_bins) / len(out_bins)
    on = drive.count("1")
    if controller and driving and on < len(drive):
        off_on_bench = (len(drive) - on) * UVLO_SCALE
        out = sum(v for v, d in zip(out_bins, drive) if d == "1") / on * on / (on + off_on_bench)
    classes = {"state": state, "output": output_class(out, ratings),
               "ticking": "yes" if _bursts(found["energy_bins"]) else "no"}
    if controller:
        classes["vcc"] = vcc
    return classes


def output_class(volts: float, ratings: Ratings) -> str:
    low, high = output_window(ratings.output_v)
    if volts < OUTPUT_ZERO_FRACTION * ratings.output_v:
        return "zero"
    return "low" if volts < low else "high" if volts > high else "in_range"


def model_classes(family: Family, ratings: Ratings, operation) -> dict[str, str]:
    """The same classes from the operating model's ``Operation``."""
    state = "running" if operation.state.startswith("running") or operation.state == "excessive_ripple" \
        else operation.state
    switches = {part.id for part in family.parts_with_role("switch")}
    if any(part in switches and mode == "short" for part, mode in getattr(operation, "damage", ())):
        state = "switch_fails"  # the model destroys the switch, then runs what the unit becomes
    classes = {"state": state, "output": output_class(operation.values["output_loaded"], ratings),
               "ticking": "yes" if operation.outcomes["ticking"]["yes"] >= 0.5 else "no"}
    if family.design.drive == "controller":
        behaviour = operation.outcomes["vcc_behaviour"]
        classes["vcc"] = max(behaviour, key=behaviour.get)
    return classes
