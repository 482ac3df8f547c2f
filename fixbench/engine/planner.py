"""Choosing the next check: the most information about the root fault per minute of bench time,
among the checks that are safe now.

Safety comes before information:

- While any hypothesis that shorts the primary (bridge, bulk capacitor or switch shorted) keeps more
  than SHORT_THRESHOLD of the posterior, plain mains is never proposed: only cold checks and the
  series-lamp power-up.
- Plain mains always waits for a series-lamp power-up that flashed and went dim or dark: a unit whose
  short left the fuse intact can look healthy to every cold check the planner chose, and only the
  lamp shows it without blowing the fuse. A lamp that never flashed had no path through it (an open
  fuse, thermistor or lead): it proves nothing about a short behind the open part, so it does not
  count [practice; trade primer, section 8].
- While an open clamp (clamp diode or resistor) keeps more than CLAMP_THRESHOLD of the posterior, the
  unit is not powered at all, not even through the lamp: without the clamp the leakage spike
  avalanches the switch on the first cycles [practice]. The clamp is read cold first.
- Units arrive charged: before the first hand on the primary of every case, and after every
  power-up, a cold check that touches the primary is preceded by confirming the bulk capacitor is
  discharged.

A conclusion must not hang on one reading: before stopping, the posterior is recomputed with each
reading left out in turn; if the leading fault then falls below FRAGILE_BELOW, the search goes on
(a reading may be a misread or a bad probe contact): with another check that tells the leader from
the rest if there is one (a lifted leg, another instrument), otherwise with the check that was left
out taken again.

The rule is greedy information gain per cost, the test-selection rule of GDE [src: de Kleer &
Williams, Diagnosing multiple faults, Artificial Intelligence 32, 1987: choose the measurement that
minimises expected entropy], weighted by minutes so cheap checks go first.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from fixbench.engine.fault_model import FaultModel
from fixbench.knowledge.model import Check
from fixbench.engine.inference import information_about_root, log_likelihood, root_posterior
from fixbench.physics.series_lamp import FLASH

SHORT_THRESHOLD = 0.02  # posterior of a primary short above which plain mains is not proposed
CLAMP_THRESHOLD = 0.02  # posterior of an open clamp above which the unit is not powered at all
CLEAR_ROOT = 0.95  # a root fault (or group) this likely ends the search
MIN_INFORMATION = 0.03  # bits: below this a check is not worth its minutes
FRAGILE_BELOW = 0.5  # leading fault's share without one reading, under which the conclusion is fragile
COST_FLOOR = 0.5  # minutes added to every check's cost: even a question takes a moment
DISCHARGE_CHECK = "bulk_discharged"
LAMP_CHECK = "series_lamp"


@dataclass(frozen=True)
class PlanState:
    """What the planner must know beyond the posterior."""

    done: frozenset[int]  # check indices read or skipped
    bulk_may_be_charged: bool  # no discharge confirmed since the unit came in or was last powered
    evidence: tuple[tuple[int, int], ...] = ()  # readings so far, for the fragility test
    skipped: frozenset[int] = frozenset()


def primary_short_chance(model: FaultModel, posterior: np.ndarray) -> float:
    return float(posterior[model.primary_short].sum())


def group_chances(model: FaultModel, posterior: np.ndarray) -> list[tuple[tuple[str, ...], float]]:
    """Groups of indistinguishable root faults with their posterior, most likely first."""
    roots = root_posterior(model, posterior)
    index = {root: i for i, root in enumerate(model.roots)}
    chances = [(group, float(sum(roots[index[r]] for r in group))) for group in model.groups]
    return sorted(chances, key=lambda item: -item[1])


def open_clamp_chance(model: FaultModel, posterior: np.ndarray) -> float:
    return float(posterior[model.clamp_open].sum())


def lamp_cleared(model: FaultModel, evidence: tuple[tuple[int, int], ...]) -> bool:
    """Whether a series-lamp power-up has flashed and gone dim or dark (a path, and no short across
    it). Steady bright is a short; no flash at all is no path, which proves nothing about a short
    behind it. A family without the lamp check relies on the posterior alone."""
    if not model.family.has_check(LAMP_CHECK):
        return True
    lamp = model.check_index(LAMP_CHECK)
    names = model.checks[lamp].classes.names
    return any(i == lamp and names[k] == FLASH for i, k in evidence)


def power_up_allowed(model: FaultModel, posterior: np.ndarray) -> bool:
    """Whether the unit may be powered at all (lamp or mains): not while an open clamp is plausible."""
    return open_clamp_chance(model, posterior) <= CLAMP_THRESHOLD


def live_allowed(model: FaultModel, posterior: np.ndarray, evidence: tuple[tuple[int, int], ...]) -> bool:
    """Whether plain mains may be applied now."""
    return (power_up_allowed(model, posterior) and primary_short_chance(model, posterior) <= SHORT_THRESHOLD
            and lamp_cleared(model, evidence))


def is_allowed(model: FaultModel, posterior: np.ndarray, check_index: int,
               evidence: tuple[tuple[int, int], ...] = ()) -> bool:
    """Whether proposing this check now is safe: no power while an open clamp is plausible; plain
    mains only once a short on the primary is implausible and the series lamp has shown none."""
    check = model.checks[check_index].check
    if check.power == "live":
        return live_allowed(model, posterior, evidence)
    if check.power == "lamp":
        return power_up_allowed(model, posterior)
    return True


def finished(model: FaultModel, posterior: np.ndarray) -> bool:
    return group_chances(model, posterior)[0][1] >= CLEAR_ROOT


def fragile_readings(model: FaultModel, posterior: np.ndarray, evidence: tuple[tuple[int, int], ...]) -> list[int]:
    """Check indices whose single reading the leading fault depends on.

    Leaving one reading out divides its likelihood back out of the product, so each distinct
    (check, outcome) pair is tried once from the sum of log-likelihoods: the work grows with the
    number of readings, not its square (a replayed case file may hold thousands)."""
    if not evidence:
        return []
    group, _ = group_chances(model, posterior)[0]
    log_all = log_likelihood(model, evidence)
    log_prior = np.log(model.prior)
    dropped: dict[tuple[int, int], bool] = {}
    fragile = []
    for check_index, class_index in evidence:
        pair = (check_index, class_index)
        if pair not in dropped:
            log_p = log_prior + log_all - np.log(model.checks[check_index].table[:, class_index])
            p = np.exp(log_p - log_p.max())
            share = dict(group_chances(model, p / p.sum())).get(group, 0.0)
            dropped[pair] = share < FRAGILE_BELOW
        if dropped[pair]:
            fragile.append(check_index)
    return fragile


def scored_candidates(model: FaultModel, posterior: np.ndarray, state: PlanState,
                      again: frozenset[int] = frozenset()) -> list[tuple[float, float, int]]:
    """(score, bits, check index) for every allowed, informative check not yet done (or allowed
    ``again``), best first."""
    scored = []
    for i, check_model in enumerate(model.checks):
        if ((i in state.done and i not in again) or not check_model.informative
                or not is_allowed(model, posterior, i, state.evidence)):
            continue
        bits = information_about_root(model, posterior, i)
        scored.append((bits / (check_model.check.minutes + COST_FLOOR), bits, i))
    scored.sort(key=lambda item: (-item[0], item[2]))
    return scored


def _confirmations(model: FaultModel, posterior: np.ndarray, state: PlanState) -> list[tuple[float, float, int]]:
    """Checks that would confirm a leader resting on one reading: another check that separates it
    from the rest (a lifted leg, another instrument), or, when there is none, the doubtful reading
    taken again. A reading taken again guards against a misread, not against what the meter cannot
    tell in circuit, so an independent check comes first."""
    fragile = fragile_readings(model, posterior, state.evidence)
    if not fragile:
        return []
    independent = [c for c in scored_candidates(model, posterior, state) if c[1] >= MIN_INFORMATION]
    if independent:
        return independent
    again = frozenset(fragile) - state.skipped
    repeats = sum(1 for i, _ in state.evidence if i in again)
    if repeats >= 2 * len(again):
        again = frozenset()  # each doubtful check has been taken twice: do not loop on it
    return [c for c in scored_candidates(model, posterior, state, again) if c[1] > 0.0]


def choose(model: FaultModel, posterior: np.ndarray, state: PlanState) -> int | None:
    """Index of the next check, or None when the search should stop."""
    if finished(model, posterior):
        candidates = _confirmations(model, posterior, state)
    else:
        candidates = ([c for c in scored_candidates(model, posterior, state) if c[1] >= MIN_INFORMATION]
                      or _confirmations(model, posterior, state))
    if not candidates:
        return None
    if model.family.has_check(DISCHARGE_CHECK) and model.check_index(DISCHARGE_CHECK) in state.skipped:
        # The discharge confirmation was skipped: go on with checks that keep hands off the primary,
        # and ask for it again only when none is left.
        clear = [c for c in candidates if not discharge_first(model, state, model.checks[c[2]].check)]
        candidates = clear or candidates
    best = candidates[0][2]
    if discharge_first(model, state, model.checks[best].check):
        return model.check_index(DISCHARGE_CHECK)
    return best


def discharge_first(model: FaultModel, state: PlanState, check: Check) -> bool:
    """Whether a hand on ``check`` now must wait for the bulk capacitor's discharge to be confirmed.
    The one statement of the rule: the planner follows it, and practice judges a trainee by it."""
    return (state.bulk_may_be_charged and check.power == "cold" and check.id != DISCHARGE_CHECK
            and model.family.touches_primary(check) and model.family.has_check(DISCHARGE_CHECK))
