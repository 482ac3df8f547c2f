"""What a reading told and why a check was worth taking, in the words a trainee reads.

The engine weighs checks by how much they narrow the root fault; a person is told instead which
suspects a reading raised or cleared, what a healthy unit reads there, which two suspects a check
tells apart and what each would read. Every figure here comes from the engine's own state: the
suspects' chances, the prediction tables and the healthy bands. Nothing in these words is in bits.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from fixbench.engine import planner
from fixbench.engine.diagnosis import DiagnosisState
from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.inference import root_posterior
from fixbench.knowledge.model import Family
from fixbench.quantities import format_band, format_quantity

NO_FAULT_TITLE = "No fault in the supply (device or its cable)"
RAISED_TO = 0.10  # a suspect that rose to at least this share, and doubled or gained RAISED_BY, was raised
RAISED_BY = 0.20
CLEARED_BELOW = 0.01  # a suspect that held at least CONSIDERED before and fell under this is ruled out
CONSIDERED = 0.05  # a suspect this likely is one the trainee should have in mind
LOWERED_BY = 3.0  # a suspect that fell by this factor (and was considered) is made less likely
CLASS_WORDS = {"zero": "about zero", "low": "low", "ok": "healthy", "high": "high", "open": "open (OL)",
               "short": "a short"}


@dataclass(frozen=True)
class Told:
    raised: tuple[str, ...]  # titles, most likely first, each with its chance after
    cleared: tuple[str, ...]  # ruled out
    lowered: tuple[str, ...]  # made less likely but not ruled out
    leader: str  # the leading suspect after, with its chance

    def words(self) -> str:
        parts = []
        if self.raised:
            parts.append("raised " + "; ".join(self.raised))
        if self.cleared:
            parts.append("ruled out " + "; ".join(self.cleared))
        if self.lowered:
            parts.append("made less likely " + "; ".join(self.lowered))
        if not parts:
            return f"moved no suspect much (leading: {self.leader})"
        text = ". ".join(p[0].upper() + p[1:] for p in parts)
        return f"{text}. Leading now: {self.leader}"


def fault_title(family: Family, fault_id: str) -> str:
    return NO_FAULT_TITLE if fault_id == NO_FAULT else family.fault(fault_id).title


def root_chances(state: DiagnosisState) -> np.ndarray:
    return root_posterior(state.model, state.posterior)


def _percent(p: float) -> str:
    return "under 1 %" if p < 0.01 else f"{p:.0%}"


def what_it_told(before: DiagnosisState, after: DiagnosisState) -> Told:
    family, roots = before.family, before.model.roots
    was, now = root_chances(before), root_chances(after)
    raised, cleared, lowered = [], [], []
    for r in np.argsort(-now, kind="stable"):
        title = fault_title(family, roots[r])
        if now[r] >= RAISED_TO and (now[r] >= 2 * was[r] or now[r] - was[r] >= RAISED_BY):
            raised.append(f"{title} (to {_percent(now[r])})")
        elif was[r] >= CONSIDERED and now[r] < CLEARED_BELOW:
            cleared.append(title)
        elif was[r] >= CONSIDERED and now[r] * LOWERED_BY <= was[r]:
            lowered.append(f"{title} (to {_percent(now[r])})")
    top = int(np.argmax(now))
    return Told(tuple(raised), tuple(cleared), tuple(lowered),
                f"{fault_title(family, roots[top])} ({_percent(now[top])})")


def healthy_words(state: DiagnosisState, check_id: str) -> str:
    """What a healthy unit reads on this check: '50 mohm (0 ohm to 1 ohm)', 'dim'."""
    model = state.model.checks[state.model.check_index(check_id)]
    e = model.healthy
    if e is not None:
        band = format_band(e.low, e.high, e.unit)
        return f"{format_quantity(e.nominal, e.unit)} ({band})" if e.nominal is not None else band
    return model.healthy_outcome or "-"


def _representative(state: DiagnosisState, root: str, weights: np.ndarray) -> int:
    """The hypothesis of this root fault that the weights favour (its likeliest set of parts)."""
    members = np.flatnonzero(state.model.root_of == state.model.roots.index(root))
    return int(members[np.argmax(weights[members])])


def predicted_words(state: DiagnosisState, check_id: str, root: str, weights: np.ndarray | None = None) -> str:
    """What the check would read if ``root`` were the fault: 'about 301 mohm', 'bright'."""
    model = state.model.checks[state.model.check_index(check_id)]
    h = _representative(state, root, state.model.prior if weights is None else weights)
    value = model.values[h]
    if value is not None and model.healthy is not None:
        return "OL" if np.isinf(value) else f"about {format_quantity(value, model.healthy.unit)}"
    k = int(np.argmax(model.predicted[h]))
    name = model.classes.names[k]
    return CLASS_WORDS.get(name, name) if model.classes.numeric else name


def _predicted_class(state: DiagnosisState, check_index: int, root_index: int) -> int:
    model = state.model
    members = model.root_of == root_index
    weights = state.posterior * members
    if weights.sum() <= 0:
        weights = model.prior * members
    return int(np.argmax(weights @ model.checks[check_index].predicted))


def separation_words(state: DiagnosisState, check_id: str) -> str:
    """Which suspects the check tells apart, and what each would read."""
    family, model = state.family, state.model
    i = model.check_index(check_id)
    chances = root_chances(state)
    order = [int(r) for r in np.argsort(-chances, kind="stable") if chances[r] > 0]
    classes = {r: _predicted_class(state, i, r) for r in order}
    first = order[0]
    other = next((r for r in order[1:] if classes[r] != classes[first]), None)
    if other is None:
        return "no suspect left reads differently here: it tells nothing new"
    a, b = model.roots[first], model.roots[other]
    read_a = predicted_words(state, check_id, a, state.posterior)
    read_b = predicted_words(state, check_id, b, state.posterior)
    if chances[other] < CONSIDERED:
        return (f"it checks the less likely suspects: {fault_title(family, b)} would read {read_b}, "
                f"while the leading suspect, {fault_title(family, a)}, would read {read_a}")
    return (f"it tells {fault_title(family, a)} (would read {read_a}) "
            f"from {fault_title(family, b)} (would read {read_b})")


def why_engine_chose(state: DiagnosisState, check_id: str) -> str:
    """Why the engine takes ``check_id`` next from ``state``, in plain words."""
    check = state.family.check(check_id)
    if check.procedure:
        return "it confirms the bulk capacitor is discharged before any hand goes on the primary"
    if any(r.check == check_id for r in state.readings):
        return ("the leading suspect rested on this one reading: it takes it again in case that was a "
                "misread or a poor probe contact")
    words = separation_words(state, check_id)
    if planner.finished(state.model, state.posterior):
        words = "the leading suspect rested on one reading; " + words
    elif check.power == "lamp" and not state.live_allowed:
        words = "plain mains waits until a short is ruled out, and the series lamp shows one safely; " + words
    return f"{words}; {check.minutes:g} min"


def careful_check_words(family: Family, part_id: str, confirming: bool) -> str:
    title = family.part(part_id).title
    if confirming:
        return f"before replacing it, it confirms {part_id} ({title}) itself with its own reading"
    return f"before power-up, it tests {part_id} ({title}), often damaged along with this fault"


def complaint_words(family: Family, answers: tuple[tuple[str, str], ...]) -> str:
    """The customer's complaint as the round opens: what they reported, then what they did not."""
    said = [family.check(c).title for c, a in answers if a == "yes"]
    denied = [family.check(c).title.lower() for c, a in answers if a != "yes"]
    text = "; ".join(said) if said else "Nothing specific reported"
    return f"{text}. Not reported: {'; '.join(denied)}." if denied else f"{text}."
