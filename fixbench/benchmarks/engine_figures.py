"""The engine benchmark: simulated faulty units drawn from the priors, diagnosed by the engine's own
choice of checks, with the figures the engine is held to.

- accuracy: the true root fault (or the group of faults no check can tell apart) ranked first, with
  exact readings and with 5 % of readings wrong and meter tolerance on the rest; top three with
  wrong readings;
- effort: mean minutes to the conclusion against a fixed input-to-output signal-tracing order, and
  against the exact optimal policy found by exhaustive search on a reduced model; the entropy lower
  bound on the number of checks;
- safety: proposals of plain mains while a primary short is plausible or before the lamp flashed
  and went dim or dark, of any power-up while an open clamp is plausible, of a cold primary check
  while the bulk may be charged (units arrive charged) without the discharge confirmation, of a
  no-load output reading without its over-voltage caution while an open loop is plausible (must
  be zero);
- speed: median time of one reading update plus the next-check choice on the largest family; a
  case file of 5,100 readings replayed to its next check.

The units are diagnosed by :func:`fixbench.engine.follow.follow_planner`, the same loop the demo
shop and practice use; the clock is read here, around the unit's measurements, so the engine
itself never reads one.
"""

from __future__ import annotations

import math
import random
import statistics
import time
from dataclasses import dataclass

import numpy as np

from fixbench.engine import cautions, planner, simulate_readings
from fixbench.engine.diagnosis import DiagnosisState, Proposal, start_diagnosis
from fixbench.engine.fault_model import cached_fault_model
from fixbench.engine.follow import follow_planner
from fixbench.engine.hypotheses import root_weights
from fixbench.engine.optimal import reduced_comparison
from fixbench.engine.replay import replay_readings
from fixbench.engine.simulate import simulated_unit
from fixbench.knowledge import KnowledgeBase, load_knowledge
from fixbench.knowledge.graph import power_order
from fixbench.physics.cold.probing import solved_readings
from fixbench.physics.part_values import rated_voltage
from fixbench.physics.ratings import parse_ratings

# One unit of each family the benchmark draws faults for.
BENCH_RATINGS = {
    "pwm_flyback": {"mains": "universal", "bench_mains": "230 V", "output": "19 V", "current": "3.4 A"},
    "primary_side": {"mains": "universal", "bench_mains": "120 V", "output": "5 V", "current": "2 A"},
    "self_oscillating": {"mains": "230 V", "output": "5 V", "current": "1 A"},
    "integrated_opto": {"mains": "universal", "bench_mains": "230 V", "output": "12 V", "current": "1 A"},
    "integrated_primary_side": {"mains": "universal", "bench_mains": "120 V", "output": "5 V", "current": "1 A"},
    "pwm_pfc": {"mains": "universal", "bench_mains": "230 V", "output": "19.5 V", "current": "4.62 A"},
}
DEFAULT_RATINGS = {"mains": "230 V", "output": "5 V", "current": "1 A"}
MAX_STEPS = 80
# A case file of 5,100 readings took 32 s when each reading was left out in turn by recomputing
# the whole posterior; a second is what a command line answer may take [practice].
REPLAYED_READINGS = 5100
REPLAY_TARGET_MS = 1000.0
WRONG_RATE = 0.05


@dataclass
class RunResult:
    correct_top1: bool
    correct_top3: bool
    minutes: float
    checks: int
    unsafe: int


def _true_group(state: DiagnosisState, root: str) -> tuple[str, ...]:
    return state.model.group_of(root)


def breaks_safety_rule(state: DiagnosisState, proposal: Proposal) -> int:
    """Independent check of the safety rules on a proposal made in ``state``: plain mains while a
    primary short is plausible or before a lamp power-up that flashed and went dim or dark (a lamp
    that never flashed proves nothing); any power-up while an open clamp is plausible; a hand on
    the primary while the bulk may hold a charge (units arrive charged; again after any power-up);
    a no-load output reading without the over-voltage caution while an output over its
    capacitor's rating is plausible."""
    model, post, family = state.model, state.posterior, state.family
    check = proposal.check
    if check.power in ("live", "lamp") and float(post[model.clamp_open].sum()) > planner.CLAMP_THRESHOLD:
        return 1
    if check.power == "live":
        lamp = model.check_index(planner.LAMP_CHECK) if family.has_check(planner.LAMP_CHECK) else None
        flashed = lamp is None or any(i == lamp and model.checks[i].classes.names[k] == "flash"
                                      for i, k in state.evidence)
        if float(post[model.primary_short].sum()) > planner.SHORT_THRESHOLD or not flashed:
            return 1
    charged = True
    for reading in state.readings:
        power = family.check(reading.check).power
        charged = True if power in ("live", "lamp") else False if reading.check == planner.DISCHARGE_CHECK else charged
    if check.power == "cold" and charged and family.touches_primary(check) and check.id != planner.DISCHARGE_CHECK:
        return 1
    if check.power == "live" and check.target_kind == "signal" and check.target_id == "output_voltage":
        caps = family.parts_with_role("output_capacitor")
        rated = rated_voltage(caps[0], model.ratings, family.design) if caps else math.inf
        over = np.array([op.values.get("output_voltage", 0.0) > rated for op in model.operations])
        if float(post[over].sum()) > cautions.OVERVOLTAGE_PLAUSIBLE and not any(
                c.startswith(cautions.OVERVOLTAGE) and "load on the output" in c for c in proposal.cautions):
            return 1
    return 0


def run_engine(state: DiagnosisState, unit, root: str, timings: list[float] | None = None) -> RunResult:
    """The engine's own order of checks on ``unit``; with ``timings``, the time of each reading
    update plus the next-check choice after it is appended (the unit's measuring left out)."""
    measure = unit.measure if timings is None else _UpdateTimer(unit.measure, timings)
    path = follow_planner(state, measure, MAX_STEPS)
    if timings is not None:
        measure.stop()
    unsafe = sum(breaks_safety_rule(step.before, step.proposal) for step in path.steps)
    return _score(path.final, root, path.minutes, len(path.steps), unsafe)


class _UpdateTimer:
    """Wraps a unit's ``measure``: the time from the end of one measurement to the start of the
    next is the engine taking the reading and choosing its next check."""

    def __init__(self, measure, timings: list[float]) -> None:
        self.measure, self.timings, self.since = measure, timings, None

    def __call__(self, check_id: str) -> str:
        self.stop()
        text = self.measure(check_id)
        self.since = time.perf_counter()
        return text

    def stop(self) -> None:
        if self.since is not None:
            self.timings.append(time.perf_counter() - self.since)
            self.since = None


def _score(state: DiagnosisState, root: str, minutes: float, steps: int, unsafe: int) -> RunResult:
    truth = set(_true_group(state, root))
    ranked = planner.group_chances(state.model, state.posterior)
    top = [set(g) for g, _ in ranked[:3]]
    return RunResult(bool(truth & top[0]), any(truth & g for g in top), minutes, steps, unsafe)


def fixed_order(state: DiagnosisState) -> list[str]:
    """Signal tracing: stage by stage from the mains input to the output; within a stage, questions
    and looks first, then cold checks, then the lamp, then live checks (file order otherwise)."""
    family = state.family
    rank = {stage: i for i, stage in enumerate(power_order(family))}
    power_rank = {"none": 0, "cold": 1, "lamp": 2, "live": 3}

    def key(i_check):
        i, check = i_check
        stage = family.test_point(check.points[0]).stage if check.points else power_order(family)[0]
        return (0 if check.power == "none" else 1, rank[stage], power_rank[check.power], i)

    ordered = sorted(enumerate(family.checks), key=key)
    return [c.id for _, c in ordered if not c.procedure]


def run_fixed(state: DiagnosisState, unit, root: str) -> RunResult:
    """The fixed order, taking only checks that are safe at the time, until the same stop rule."""
    minutes, steps = 0.0, 0
    pending = fixed_order(state)
    while pending and not planner.finished(state.model, state.posterior):
        allowed = [c for c in pending
                   if planner.is_allowed(state.model, state.posterior, state.model.check_index(c), state.evidence)]
        if not allowed:
            break
        check_id = allowed[0]
        pending.remove(check_id)
        if (state.bulk_may_be_charged and state.family.check(check_id).power == "cold"
                and state.family.touches_primary(state.family.check(check_id))):
            state = state.with_reading(planner.DISCHARGE_CHECK, unit.measure(planner.DISCHARGE_CHECK))
            minutes += state.family.check(planner.DISCHARGE_CHECK).minutes
        state = state.with_reading(check_id, unit.measure(check_id))
        minutes += state.family.check(check_id).minutes
        steps += 1
    return _score(state, root, minutes, steps, 0)


def entropy_bound(state: DiagnosisState) -> float:
    """Lower bound on the expected number of checks: the prior entropy of the fault groups over the
    most a single check can tell, log2 of its number of outcomes [src: Shannon's source-coding
    bound; Cover & Thomas, ch. 5]."""
    chances = np.array([p for _, p in planner.group_chances(state.model, state.model.prior)])
    entropy = float(-(chances[chances > 0] * np.log2(chances[chances > 0])).sum())
    widest = max(len(c.classes.names) for c in state.model.checks if c.informative)
    return entropy / math.log2(widest)


def _replay_ms(family, readings: int) -> float:
    """A case file of ``readings`` readings (one unit's readings over and over) replayed to its
    suspects and next check, in ms: the work must grow with the readings, not their square."""
    ratings = parse_ratings(BENCH_RATINGS.get(family.id, DEFAULT_RATINGS))
    start = start_diagnosis(family, ratings)
    assert start.next_check is not None  # the model and the first proposal are not what is timed
    root = next(iter(root_weights(family)))
    typed = list(simulate_readings(family, ratings, root, seed=0, noise=True).items())
    pairs = (typed * (readings // len(typed) + 1))[:readings]
    started = time.perf_counter()
    state = replay_readings(start, pairs).state
    assert state.suspects and (state.next_check is not None or state.conclusion is not None)
    return 1000 * (time.perf_counter() - started)


def run_benchmark(seed: int = 0, units_per_family: int = 150, kb: KnowledgeBase | None = None) -> dict:
    kb = kb or load_knowledge()
    rng = random.Random(seed)
    exact, noisy, engine_min, fixed_min, bounds, unsafe = [], [], [], [], [], 0
    runs: dict[str, tuple[list[RunResult], list[RunResult]]] = {}
    timings: list[float] = []
    # Each family's model built once, timed: the operating model of every hypothesis and every cold
    # reading solved on the family's board (the first build in the process; later ones are cached).
    build_ms = {}
    for family in kb.families.values():
        started = time.perf_counter()
        cached_fault_model(family, parse_ratings(BENCH_RATINGS.get(family.id, DEFAULT_RATINGS)))
        build_ms[family.id] = 1000 * (time.perf_counter() - started)
    largest = max(kb.families.values(), key=lambda f: len(cached_fault_model(
        f, parse_ratings(BENCH_RATINGS.get(f.id, DEFAULT_RATINGS))).hypotheses))
    sizes = {}
    for family in kb.families.values():
        ratings = parse_ratings(BENCH_RATINGS.get(family.id, DEFAULT_RATINGS))
        start = start_diagnosis(family, ratings)
        sizes[family.id] = (len(start.model.hypotheses), len(start.model.checks))
        weights = root_weights(family)
        roots, chances = list(weights), list(weights.values())
        bounds.append(entropy_bound(start))
        family_exact, family_noisy = runs.setdefault(family.id, ([], []))
        for _ in range(units_per_family):
            root = rng.choices(roots, weights=chances)[0]
            unit_seed = rng.randrange(1 << 30)
            result = run_engine(start, simulated_unit(family, ratings, root, unit_seed, exact=True), root)
            exact.append(result)
            engine_min.append(result.minutes)
            fixed = run_fixed(start, simulated_unit(family, ratings, root, unit_seed, exact=True), root)
            fixed_min.append(fixed.minutes)
            noisy_unit = simulated_unit(family, ratings, root, unit_seed, exact=False, wrong_rate=WRONG_RATE)
            noisy.append(run_engine(start, noisy_unit, root, timings if family is largest else None))
            unsafe += exact[-1].unsafe + noisy[-1].unsafe
            family_exact.append(exact[-1])
            family_noisy.append(noisy[-1])
    optimal = reduced_comparison(largest, parse_ratings(BENCH_RATINGS.get(largest.id, DEFAULT_RATINGS)))
    replay_ms = _replay_ms(largest, REPLAYED_READINGS)
    return {
        "units": len(exact),
        "families": {fid: {"hypotheses": h, "checks": c, "model_build_ms": build_ms[fid]}
                     for fid, (h, c) in sizes.items()},
        "cold_readings_solved": solved_readings(),
        "top1_exact": sum(r.correct_top1 for r in exact) / len(exact),
        "top1_noisy": sum(r.correct_top1 for r in noisy) / len(noisy),
        "top3_noisy": sum(r.correct_top3 for r in noisy) / len(noisy),
        "mean_minutes_engine": statistics.fmean(engine_min),
        "mean_minutes_fixed_order": statistics.fmean(fixed_min),
        "minutes_vs_fixed_order": statistics.fmean(engine_min) / statistics.fmean(fixed_min),
        "minutes_vs_optimal": optimal["ratio"],
        "optimal_model": optimal,
        "mean_checks_engine": statistics.fmean(r.checks for r in exact),
        "entropy_bound_checks": statistics.fmean(bounds),
        "unsafe_proposals": unsafe,
        "per_family": {fid: _accuracy(e, n) for fid, (e, n) in runs.items()},
        "step_ms_median": 1000 * statistics.median(timings) if timings else None,
        "replayed_readings": REPLAYED_READINGS,
        "replay_ms": replay_ms,
        "largest_family": largest.id,
        "hypotheses": sizes[largest.id][0],
        "checks": sizes[largest.id][1],
        "seed": seed,
    }


def _accuracy(exact: list[RunResult], noisy: list[RunResult]) -> dict:
    """One family's share of units found, and its unsafe proposals: every family is held to the
    overall targets, so a family that is hard for the engine cannot hide behind the easy ones."""
    return {
        "units": len(exact),
        "top1_exact": sum(r.correct_top1 for r in exact) / len(exact),
        "top1_noisy": sum(r.correct_top1 for r in noisy) / len(noisy),
        "top3_noisy": sum(r.correct_top3 for r in noisy) / len(noisy),
        "unsafe_proposals": sum(r.unsafe for r in exact) + sum(r.unsafe for r in noisy),
    }


def print_report(result: dict) -> None:
    print(f"engine benchmark: {result['units']} simulated units, seed {result['seed']}")
    for fid, size in result["families"].items():
        print(f"  {fid}: {size['hypotheses']} hypotheses, {size['checks']} checks, model built in "
              f"{size['model_build_ms']:.0f} ms")
    print(f"  cold network: {result['cold_readings_solved']} distinct in-circuit readings solved")
    print(f"  top-1, exact readings          {result['top1_exact']:.1%}   (target >= 97 %)")
    print(f"  top-1, 5 % wrong + tolerance   {result['top1_noisy']:.1%}   (target >= 90 %)")
    print(f"  top-3, 5 % wrong + tolerance   {result['top3_noisy']:.1%}   (target >= 98 %)")
    print(f"  minutes: engine {result['mean_minutes_engine']:.1f}, fixed order {result['mean_minutes_fixed_order']:.1f}"
          f"  ratio {result['minutes_vs_fixed_order']:.2f}   (target <= 0.60)")
    o = result["optimal_model"]
    print(f"  vs exact optimum on a reduced model ({o['faults']} faults, {o['checks']} checks): "
          f"engine {o['greedy_minutes']:.2f} min, optimum {o['optimal_minutes']:.2f} min, ratio {o['ratio']:.3f}"
          f"   (target <= 1.10)")
    print(f"  checks per unit: engine {result['mean_checks_engine']:.1f}, entropy bound {result['entropy_bound_checks']:.2f}")
    print(f"  unsafe proposals               {result['unsafe_proposals']}   (target 0)")
    print("  per family (same targets):     top-1 exact  top-1 noisy  top-3 noisy  unsafe")
    for fid, figures in result["per_family"].items():
        print(f"    {fid:<28} {figures['top1_exact']:>9.1%}  {figures['top1_noisy']:>11.1%}"
              f"  {figures['top3_noisy']:>11.1%}  {figures['unsafe_proposals']:>6}")
    print(f"  update + next check, median    {result['step_ms_median']:.2f} ms on {result['largest_family']} "
          f"({result['hypotheses']} hypotheses, {result['checks']} checks)   (target <= 50 ms)")
    print(f"  replay of {result['replayed_readings']:,} readings to the next check  {result['replay_ms']:.0f} ms   "
          f"(target <= {REPLAY_TARGET_MS:g} ms)")
