"""The exact optimal check policy on a reduced model, to measure how far the greedy planner is from it.

Reduced model: the most likely root faults of a family, each with its likeliest collateral set, and
the meter checks that tell most about them; readings are exact (each fault gives one
outcome per check). A state is then the set of faults still consistent with the readings, and the
optimal expected minutes to a conclusion follow from exhaustive search with memoisation over those
sets [src: the dynamic-programming formulation of sequential diagnosis, e.g. Pattipati & Alexandridis,
Application of heuristic search and information theory to sequential fault diagnosis, IEEE SMC 20(4),
1990]. Both policies stop on the same rule: one fault at 95 % or more, or no check left that tells
MIN_INFORMATION bits.
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np

from fixbench.engine import planner
from fixbench.engine.fault_model import cached_fault_model
from fixbench.knowledge.model import Family
from fixbench.physics.ratings import Ratings

REDUCED_FAULTS = 12
REDUCED_CHECKS = 14


def _entropy(p: np.ndarray) -> float:
    p = p[p > 0]
    return float(-(p * np.log2(p)).sum())


def reduced_comparison(family: Family, ratings: Ratings) -> dict:
    model = cached_fault_model(family, ratings)
    # One hypothesis per root: its likeliest set. The most likely roots.
    best_of_root = {}
    for h, p in enumerate(model.prior):
        r = model.root_of[h]
        if r not in best_of_root or p > model.prior[best_of_root[r]]:
            best_of_root[r] = h
    roots = sorted(best_of_root, key=lambda r: -model.prior[best_of_root[r]])[:REDUCED_FAULTS]
    rows = [best_of_root[r] for r in roots]
    prior = np.array([model.prior[h] for h in rows])
    prior = prior / prior.sum()
    # Candidate checks: meter checks, cold and powered (questions cost nothing and would make the
    # search trivial; the reduced model leaves the safety rule aside for both policies alike),
    # most informative at the prior first.
    candidates = []
    for i, cm in enumerate(model.checks):
        if cm.check.power == "none" or not cm.informative or cm.check.procedure:
            continue
        outcome = np.argmax(cm.predicted[rows], axis=1)
        split = np.zeros((len(rows), cm.predicted.shape[1]))
        split[np.arange(len(rows)), outcome] = 1.0
        p_out = prior @ split
        candidates.append((_entropy(p_out), i, tuple(outcome)))
    candidates.sort(key=lambda c: -c[0])
    chosen = candidates[:REDUCED_CHECKS]
    minutes = [model.checks[i].check.minutes for _, i, _ in chosen]
    outcomes = [o for _, _, o in chosen]
    n = len(rows)

    def share(subset: frozenset) -> np.ndarray:
        p = np.array([prior[k] for k in sorted(subset)])
        return p / p.sum()

    def information(subset: frozenset, c: int) -> float:
        p = share(subset)
        groups: dict[int, float] = {}
        for weight, k in zip(p, sorted(subset)):
            groups[outcomes[c][k]] = groups.get(outcomes[c][k], 0.0) + weight
        return _entropy(np.array(list(groups.values())))  # deterministic: I = H(outcome)

    def terminal(subset: frozenset) -> bool:
        if share(subset).max() >= planner.CLEAR_ROOT:
            return True
        return all(information(subset, c) < planner.MIN_INFORMATION for c in range(len(chosen)))

    def branches(subset: frozenset, c: int) -> list[tuple[float, frozenset]]:
        total = sum(prior[k] for k in subset)
        by_outcome: dict[int, set] = {}
        for k in subset:
            by_outcome.setdefault(outcomes[c][k], set()).add(k)
        return [(sum(prior[k] for k in ks) / total, frozenset(ks)) for ks in by_outcome.values()]

    @lru_cache(maxsize=None)
    def optimal(subset: frozenset) -> float:
        if terminal(subset):
            return 0.0
        best = np.inf
        for c in range(len(chosen)):
            parts = branches(subset, c)
            if len(parts) < 2:
                continue
            best = min(best, minutes[c] + sum(p * optimal(s) for p, s in parts))
        return best

    @lru_cache(maxsize=None)
    def greedy(subset: frozenset) -> float:
        if terminal(subset):
            return 0.0
        scored = [(information(subset, c) / (minutes[c] + planner.COST_FLOOR), -chosen[c][1], c)
                  for c in range(len(chosen)) if information(subset, c) >= planner.MIN_INFORMATION]
        _, _, c = max(scored)
        return minutes[c] + sum(p * greedy(s) for p, s in branches(subset, c))

    everything = frozenset(range(n))
    best, planned = optimal(everything), greedy(everything)
    return {"faults": n, "checks": len(chosen), "optimal_minutes": best, "greedy_minutes": planned,
            "ratio": planned / best if best > 0 else 1.0,
            "check_ids": [model.checks[i].check.id for _, i, _ in chosen],
            "fault_ids": [model.roots[r] for r in roots]}
