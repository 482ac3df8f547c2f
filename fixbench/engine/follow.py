"""Following the planner: take the check the engine proposes, measure it on a unit, read it, and go
on until the engine stops proposing.

The one loop behind the engine benchmark, the demo shop's cases played at the bench and the par of
a practice round. What the unit reads is the caller's (a simulated or a hidden unit), so the loop
itself stays pure: no clock, no randomness of its own.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from fixbench.engine.diagnosis import DiagnosisState, Proposal
from fixbench.engine.readings import Reading


@dataclass(frozen=True)
class FollowedStep:
    """One proposal taken: the state it was made in, what the meter showed, the state after."""

    before: DiagnosisState
    proposal: Proposal
    typed: str
    after: DiagnosisState

    @property
    def reading(self) -> Reading:
        return self.after.readings[-1]


@dataclass(frozen=True)
class FollowedPath:
    steps: tuple[FollowedStep, ...]
    final: DiagnosisState  # where the engine stopped (or the step bound cut it short)

    @property
    def minutes(self) -> float:
        return sum(step.proposal.minutes for step in self.steps)


def follow_planner(state: DiagnosisState, measure: Callable[[str], str],
                   max_steps: int) -> FollowedPath:
    """Take the engine's proposed check, ``measure(check_id)`` it and read the text, until the
    engine proposes nothing more or ``max_steps`` readings are taken."""
    steps: list[FollowedStep] = []
    while len(steps) < max_steps:
        proposal = state.next_check
        if proposal is None:
            break
        typed = measure(proposal.check.id)
        after = state.with_reading(proposal.check.id, typed)
        steps.append(FollowedStep(state, proposal, typed, after))
        state = after
    return FollowedPath(tuple(steps), state)
