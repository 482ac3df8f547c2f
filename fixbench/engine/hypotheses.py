"""Hypotheses: a root fault together with the collateral damage it took with it, and their priors.

A shorted MOSFET usually opens the fuse and often the sense resistor, gate resistor and controller:
each collateral part fails with its own probability, so a root fault stands for several sets
(root alone, root + fuse, root + fuse + sense resistor, ...). The likeliest sets are kept as separate
hypotheses; the root's prior is shared among them in proportion to their chance.

Priors come from the knowledge base's weights (handbook base rates as a weak prior, bench experience)
and are pulled toward a shop's own confirmed repairs by a Dirichlet-style update: with prior
strength a and counts n_i out of N, the weight of fault i becomes (a * w_i + n_i) / (a + N)
[src: the conjugate Dirichlet-multinomial posterior mean, any Bayesian statistics text].
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass

from fixbench.knowledge.model import Family

NO_FAULT = "no_fault"
# Share of bench units in which the supply itself is fine (device or its cable to blame) [practice].
NO_FAULT_WEIGHT = 5.0
PRIOR_STRENGTH = 30.0  # pseudo-counts behind the knowledge-base weights
MIN_SET_SHARE = 0.005  # collateral sets rarer than this within their root are left out
MAX_SETS_PER_ROOT = 10


@dataclass(frozen=True)
class Hypothesis:
    id: str
    root: str  # fault id, or NO_FAULT
    modes: tuple[tuple[str, str], ...]  # (part id, mode) of every failed part, root first
    prior: float

    @property
    def parts(self) -> tuple[str, ...]:
        return tuple(part for part, _ in self.modes)


def root_weights(family: Family, prior_counts: dict[str, int] | None = None) -> dict[str, float]:
    """Normalised prior of each root fault (and of no fault), updated by a shop's counts."""
    weights = {f.id: f.weight for f in family.faults}
    weights[NO_FAULT] = NO_FAULT_WEIGHT
    total = sum(weights.values())
    base = {k: v / total for k, v in weights.items()}
    counts = {k: n for k, n in (prior_counts or {}).items() if k in base and n > 0}
    n_total = sum(counts.values())
    return {k: (PRIOR_STRENGTH * p + counts.get(k, 0)) / (PRIOR_STRENGTH + n_total) for k, p in base.items()}


def build_hypotheses(family: Family, prior_counts: dict[str, int] | None = None) -> tuple[Hypothesis, ...]:
    weights = root_weights(family, prior_counts)
    hypotheses = [Hypothesis(NO_FAULT, NO_FAULT, (), weights[NO_FAULT])]
    for fault in family.faults:
        sets = []
        for chosen in itertools.product((False, True), repeat=len(fault.collateral)):
            chance = 1.0
            for taken, item in zip(chosen, fault.collateral):
                chance *= item.probability if taken else 1.0 - item.probability
            extra = tuple((c.part, c.mode) for taken, c in zip(chosen, fault.collateral) if taken)
            sets.append((chance, extra))
        sets.sort(key=lambda s: -s[0])
        kept = [s for s in sets if s[0] >= MIN_SET_SHARE][:MAX_SETS_PER_ROOT] or sets[:1]
        share = sum(chance for chance, _ in kept)
        for chance, extra in kept:
            modes = ((fault.part, fault.mode),) + tuple(m for m in extra if m[0] != fault.part)
            name = "+".join([fault.id] + [f"{p}.{m}" for p, m in modes[1:]])
            hypotheses.append(Hypothesis(name, fault.id, modes, weights[fault.id] * chance / share))
    return tuple(hypotheses)
