"""The practice benchmark: is the score fair?

On simulated units of every family at every level, the engine's own path (its planner's checks,
then its careful checks before power-up) is played as a trainee would play it and scored like any
round. A fair score puts that play in the top band: `top_band_by_level`, target >= 0.95 at every
level, with the same share reported for the units that hide more than one failed part. A random
clicker (random checks, a random fault, random parts) must almost never reach the top band:
`random_top_band`, target <= 0.05. The clock is read here, for the run's seconds only.
"""

from __future__ import annotations

import random
import statistics
import time

from fixbench.knowledge import KnowledgeBase, load_knowledge
from fixbench.practice.levels import LEVELS
from fixbench.practice.play import engine_as_trainee, play_round
from fixbench.practice.scenario import draw_scenario
from fixbench.practice.scoring import READY

TARGET_TOP_BAND = 0.95
TARGET_RANDOM = 0.05
RANDOM_STREAM = 7  # offsets the random clicker's stream from the units'


def _share(hits: list[bool]) -> float | None:
    return sum(hits) / len(hits) if hits else None


def run_practice_benchmark(seed: int = 0, units_per_family: int = 70, random_units: int = 60,
                           kb: KnowledgeBase | None = None) -> dict:
    kb = kb or load_knowledge()
    families = sorted(kb.families.values(), key=lambda f: f.id)
    started = time.perf_counter()
    top, multi, right, par, slips, counts, multi_counts = {}, {}, {}, {}, {}, {}, {}
    for level in LEVELS.values():
        ready, ready_multi, faults_right, minutes, slipped = [], [], [], [], 0
        for family in families:
            for i in range(units_per_family):
                scenario = draw_scenario(family, level, seed * 100_000 + i)
                played = engine_as_trainee(family, scenario)
                score = played.debrief.score
                ready.append(score.band == READY)
                faults_right.append(score.fault_right)
                minutes.append(score.par)
                slipped += len(played.debrief.slips)
                if len(scenario.modes) > 1:
                    ready_multi.append(score.band == READY)
        top[level.id], multi[level.id] = _share(ready), _share(ready_multi)
        right[level.id], par[level.id] = _share(faults_right), statistics.fmean(minutes)
        slips[level.id], counts[level.id], multi_counts[level.id] = slipped, len(ready), len(ready_multi)
    rng = random.Random(seed + RANDOM_STREAM)
    clicker = []
    for i in range(random_units):
        family = families[i % len(families)]
        level = list(LEVELS.values())[i % len(LEVELS)]
        scenario = draw_scenario(family, level, seed * 100_000 + 50_000 + i)
        checks = [rng.choice(family.checks).id for _ in range(rng.randint(1, 15))]
        roots = ["no_fault"] + [f.id for f in family.faults]
        parts = rng.sample([p.id for p in family.parts], rng.randint(0, 3))
        played = play_round(family, scenario, checks, rng.choice(roots), parts)
        clicker.append(played.debrief.score.band == READY)
    return {
        "seed": seed, "units_by_level": counts, "multi_fault_units_by_level": multi_counts,
        "top_band_by_level": top, "top_band_multi_fault_by_level": multi,
        "engine_fault_right_by_level": right, "mean_par_minutes_by_level": par,
        "engine_slips_by_level": slips, "random_units": random_units, "random_top_band": _share(clicker),
        "target_top_band": TARGET_TOP_BAND, "target_random_top_band": TARGET_RANDOM,
        "seconds": round(time.perf_counter() - started, 1),
    }


def print_practice_report(result: dict) -> None:
    print(f"practice benchmark: the engine's own path played as a trainee, seed {result['seed']}")
    for level, share in result["top_band_by_level"].items():
        multi = result["top_band_multi_fault_by_level"][level]
        print(f"  {level:7} top band {share:.1%} of {result['units_by_level'][level]} units   "
              f"(target >= {TARGET_TOP_BAND:.0%}); with more than one failed part "
              f"{'-' if multi is None else f'{multi:.1%}'} of {result['multi_fault_units_by_level'][level]}; "
              f"fault right {result['engine_fault_right_by_level'][level]:.1%}; "
              f"mean par {result['mean_par_minutes_by_level'][level]:.1f} min; "
              f"slips {result['engine_slips_by_level'][level]}")
    print(f"  random clicker top band {result['random_top_band']:.1%} of {result['random_units']} rounds   "
          f"(target <= {TARGET_RANDOM:.0%})")
    print(f"  {result['seconds']} s")
