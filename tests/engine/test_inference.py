"""Inference against an independent Bayesian-network library, and its robustness to a bad reading."""

from __future__ import annotations

import random

import numpy as np
import pyagrum as gum
import pytest

from fixbench.engine.inference import information_about_root, posterior, root_posterior

SEEDS = range(30)


def _network(model) -> gum.BayesNet:
    """H (the hypothesis) with a deterministic child R (its root fault) and one child per check."""
    bn = gum.BayesNet("fault_model")
    bn.add(gum.LabelizedVariable("H", "hypothesis", [h.id for h in model.hypotheses]))
    bn.add(gum.LabelizedVariable("R", "root fault", list(model.roots)))
    bn.addArc("H", "R")
    bn.cpt("H").fillWith(model.prior.tolist())
    for h, hypothesis in enumerate(model.hypotheses):
        row = [0.0] * len(model.roots)
        row[model.root_of[h]] = 1.0
        bn.cpt("R")[{"H": hypothesis.id}] = row
    for check_model in model.checks:
        name = check_model.check.id
        bn.add(gum.LabelizedVariable(name, name, list(check_model.classes.names)))
        bn.addArc("H", name)
        for h, hypothesis in enumerate(model.hypotheses):
            bn.cpt(name)[{"H": hypothesis.id}] = check_model.table[h].tolist()
    return bn


@pytest.fixture(scope="module")
def network(model):
    return _network(model)


def _random_evidence(model, seed: int) -> tuple[tuple[int, int], ...]:
    """1 to 8 readings on distinct checks, each class drawn uniformly (unlikely ones included)."""
    rng = random.Random(seed)
    checks = rng.sample(range(len(model.checks)), rng.randint(1, 8))
    return tuple((i, rng.randrange(len(model.checks[i].classes.names))) for i in checks)


def _gum_evidence(model, evidence) -> dict[str, str]:
    return {model.checks[i].check.id: model.checks[i].classes.names[k] for i, k in evidence}


@pytest.mark.parametrize("seed", SEEDS)
def test_hypothesis_posterior_matches_pyagrum(model, network, seed):
    evidence = _random_evidence(model, seed)
    engine = gum.LazyPropagation(network)
    engine.setEvidence(_gum_evidence(model, evidence))
    engine.makeInference()
    reference = np.array(engine.posterior("H").tolist())
    ours = posterior(model, evidence)
    # [src: pyAgrum LazyPropagation / InformationTheory, an independent Bayesian-network library]
    assert np.max(np.abs(ours - reference)) < 1e-9


@pytest.mark.parametrize("seed", SEEDS)
def test_root_posterior_matches_pyagrum(model, network, seed):
    evidence = _random_evidence(model, seed)
    engine = gum.LazyPropagation(network)
    engine.setEvidence(_gum_evidence(model, evidence))
    engine.makeInference()
    reference = np.array(engine.posterior("R").tolist())
    ours = root_posterior(model, posterior(model, evidence))
    # [src: pyAgrum LazyPropagation / InformationTheory, an independent Bayesian-network library]
    assert np.max(np.abs(ours - reference)) < 1e-9


@pytest.mark.parametrize("seed", SEEDS)
def test_information_about_root_matches_pyagrum_mutual_information(model, network, seed):
    evidence = _random_evidence(model, seed)
    engine = gum.LazyPropagation(network)
    engine.setEvidence(_gum_evidence(model, evidence))
    hypothesis_posterior = posterior(model, evidence)
    read = {i for i, _ in evidence}
    rng = random.Random(1000 + seed)
    unread = [i for i in range(len(model.checks)) if i not in read]
    for i in rng.sample(unread, 6):
        theory = gum.InformationTheory(engine, ["R"], [model.checks[i].check.id])
        reference = theory.mutualInformationXY()  # bits, given the evidence set on the engine
        ours = information_about_root(model, hypothesis_posterior, i)
        # [src: pyAgrum LazyPropagation / InformationTheory, an independent Bayesian-network library]
        assert ours == pytest.approx(reference, abs=1e-9), model.checks[i].check.id


def test_information_at_start_matches_pyagrum_for_every_check(model, network):
    engine = gum.LazyPropagation(network)
    for i, check_model in enumerate(model.checks):
        theory = gum.InformationTheory(engine, ["R"], [check_model.check.id])
        # [src: pyAgrum LazyPropagation / InformationTheory, an independent Bayesian-network library]
        assert information_about_root(model, model.prior, i) == pytest.approx(
            theory.mutualInformationXY(), abs=1e-9), check_model.check.id


def test_one_wrong_reading_never_rules_out_the_true_fault(model, family, ratings):
    """Every root, every check: after the unit's own exact readings on the planner's path, the
    reading the true fault makes least likely still leaves it a chance."""
    from fixbench.engine import simulate_readings, start_diagnosis

    start = start_diagnosis(family, ratings)
    for r, root in enumerate(model.roots):
        readings = simulate_readings(family, ratings, root, seed=0, noise=False)
        state = start
        while state.next_check is not None:
            state = state.with_reading(state.next_check.check.id, readings[state.next_check.check.id])
        evidence = tuple((model.check_index(r.check), model.checks[model.check_index(r.check)].classes.names.index(r.outcome))
                         for r in state.readings)
        mine = model.root_of == r
        for i, check_model in enumerate(model.checks):
            worst = int(np.argmin(state.posterior[mine] @ check_model.table[mine]))
            after = root_posterior(model, posterior(model, evidence + ((i, worst),)))
            # a misread is always possible, so it may weaken but never exclude the truth [practice]
            assert after[r] > 1e-6, (root, check_model.check.id, check_model.classes.names[worst])


def test_posterior_is_a_distribution_whatever_the_readings(model):
    rng = random.Random(7)
    for _ in range(50):
        evidence = tuple((i, rng.randrange(len(model.checks[i].classes.names)))
                         for i in rng.choices(range(len(model.checks)), k=20))
        p = posterior(model, evidence)
        assert np.all(p > 0) and p.sum() == pytest.approx(1.0, abs=1e-12)
