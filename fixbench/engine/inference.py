"""Bayesian inference over hypotheses: the posterior after a set of readings, the chance of each
root fault, and the information a further check is expected to give.

Readings are conditionally independent given the hypothesis (each is a child of the hypothesis node
in a two-level Bayesian network), so the posterior is the prior times the product of the reading
likelihoods, normalised; it is computed in log space. Expected information is the mutual information
between the root fault and the check's outcome, I(R; O) = H(R) - H(R | O), in bits
[src: Cover & Thomas, Elements of Information Theory, ch. 2].
"""

from __future__ import annotations

import numpy as np

from fixbench.engine.fault_model import FaultModel

Evidence = tuple[tuple[int, int], ...]  # (check index, class index) pairs


def posterior(model: FaultModel, evidence: Evidence, prior: np.ndarray | None = None) -> np.ndarray:
    log_p = np.log(model.prior if prior is None else prior)
    for check_index, class_index in evidence:
        log_p = log_p + np.log(model.checks[check_index].table[:, class_index])
    log_p -= log_p.max()
    p = np.exp(log_p)
    return p / p.sum()


def log_likelihood(model: FaultModel, evidence: Evidence) -> np.ndarray:
    """Sum over the readings of log P(reading | hypothesis), one entry per hypothesis; each distinct
    (check, outcome) pair is looked up once and weighted by how often it was read."""
    total = np.zeros(len(model.prior))
    if not evidence:
        return total
    pairs, counts = np.unique(np.asarray(evidence, dtype=np.int64), axis=0, return_counts=True)
    for (check_index, class_index), count in zip(pairs, counts):
        total += count * np.log(model.checks[check_index].table[:, class_index])
    return total


def root_posterior(model: FaultModel, hypothesis_posterior: np.ndarray) -> np.ndarray:
    return np.bincount(model.root_of, weights=hypothesis_posterior, minlength=len(model.roots))


def entropy_bits(p: np.ndarray) -> float:
    p = p[p > 0]
    return float(-(p * np.log2(p)).sum())


def information_about_root(model: FaultModel, hypothesis_posterior: np.ndarray, check_index: int) -> float:
    """Expected reduction of the root fault's entropy from reading the check, in bits."""
    table = model.checks[check_index].table
    joint_h = hypothesis_posterior[:, None] * table  # P(h, o)
    joint = np.zeros((len(model.roots), table.shape[1]))
    np.add.at(joint, model.root_of, joint_h)  # P(r, o)
    p_root = joint.sum(axis=1)
    p_out = joint.sum(axis=0)
    nz = joint > 0
    outer = p_root[:, None] * p_out[None, :]
    return float((joint[nz] * np.log2(joint[nz] / outer[nz])).sum())


def information_all(model: FaultModel, hypothesis_posterior: np.ndarray, indices: list[int]) -> np.ndarray:
    return np.array([information_about_root(model, hypothesis_posterior, i) for i in indices])
