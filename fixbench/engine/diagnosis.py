"""A diagnosis in progress: the unit, the readings so far, and what follows from them.

Immutable: every reading, skip or undo returns a new state, so the GUI can hand states between
threads and the store can save each one as it happens. The expensive part (the fault model) is
built once per unit and shared by all states of the same case.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field, replace
from functools import cached_property

import numpy as np

from fixbench.knowledge.model import Check, Family
from fixbench.physics.expectation import Expectation
from fixbench.physics.ratings import Ratings
from fixbench.physics.series_lamp import lamp_how

from fixbench.engine import planner
from fixbench.engine.cautions import OPEN_CLAMP, cautions_for, hazard_class, output_overvoltage
from fixbench.engine.conclusion import Conclusion, conclude
from fixbench.engine.fault_model import FaultModel, cached_fault_model
from fixbench.engine.hypotheses import NO_FAULT
from fixbench.engine.inference import posterior, root_posterior
from fixbench.engine.readings import Reading, read

SHOWN_SUSPECTS = 12


@dataclass(frozen=True)
class Suspect:
    fault: str
    title: str
    part: str | None
    stage: str | None
    probability: float
    group: tuple[str, ...]  # root faults no check can tell from this one (itself included)
    label: str = ""  # the part as the board names it (its designator where a board profile gives one)


@dataclass(frozen=True)
class Proposal:
    check: Check
    title: str
    power: str
    expected: Expectation | None
    expected_outcome: str | None
    minutes: float
    information: float  # bits about the root fault
    hazard: str
    cautions: tuple[str, ...]
    reason: str
    how: str  # the check's instructions for this unit (the series lamp named from its ratings)


@dataclass(frozen=True)
class DiagnosisState:
    model: FaultModel
    readings: tuple[Reading, ...] = ()
    skipped: tuple[str, ...] = ()
    _evidence: tuple[tuple[int, int], ...] = field(default=(), repr=False)

    @property
    def family(self) -> Family:
        return self.model.family

    @property
    def evidence(self) -> tuple[tuple[int, int], ...]:
        """The readings as (check index, outcome class index) pairs, in order."""
        return self._evidence

    def proposal_for(self, check_id: str) -> Proposal:
        """The step card for any check of the family (the technician may pick one off the list)."""
        i = self.model.check_index(check_id)
        return self._proposal(i, 0.0, "chosen by the technician")

    def with_reading(self, check_id: str, text: str) -> "DiagnosisState":
        i = self.model.check_index(check_id)
        reading = read(self.model.checks[i], text)
        k = self.model.checks[i].classes.names.index(reading.outcome)
        return replace(self, readings=self.readings + (reading,), _evidence=self._evidence + ((i, k),))

    def with_readings(self, readings: Sequence[Reading]) -> "DiagnosisState":
        """Readings already read against their checks (:func:`fixbench.engine.readings.read`), taken
        in order at once: a replay of thousands builds one state, not one per reading."""
        evidence = []
        for reading in readings:
            i = self.model.check_index(reading.check)
            evidence.append((i, self.model.checks[i].classes.names.index(reading.outcome)))
        return replace(self, readings=self.readings + tuple(readings),
                       _evidence=self._evidence + tuple(evidence))

    def skip(self, check_id: str) -> "DiagnosisState":
        self.model.check_index(check_id)
        return replace(self, skipped=self.skipped + (check_id,))

    def undo(self) -> "DiagnosisState":
        if not self.readings:
            return self
        return replace(self, readings=self.readings[:-1], _evidence=self._evidence[:-1])

    @cached_property
    def posterior(self) -> np.ndarray:
        return posterior(self.model, self._evidence)

    @cached_property
    def suspects(self) -> tuple[Suspect, ...]:
        roots = root_posterior(self.model, self.posterior)
        order = np.argsort(-roots, kind="stable")[:SHOWN_SUSPECTS]
        family = self.family
        out = []
        for r in order:
            root = self.model.roots[r]
            if root == NO_FAULT:
                out.append(Suspect(root, "No fault in the supply (device or its cable)", None, None,
                                   float(roots[r]), self.model.group_of(root)))
                continue
            fault = family.fault(root)
            part = family.part(fault.part)
            out.append(Suspect(root, fault.title, fault.part, part.stage, float(roots[r]),
                               self.model.group_of(root), part.label))
        return tuple(out)

    @cached_property
    def stage_chances(self) -> dict[str, float]:
        """Chance that each stage holds the root fault: what the stage picture is shaded by."""
        roots = root_posterior(self.model, self.posterior)
        chances = {s.id: 0.0 for s in self.family.stages}
        for r, root in enumerate(self.model.roots):
            if root != NO_FAULT:
                chances[self.family.part(self.family.fault(root).part).stage] += float(roots[r])
        return chances

    @property
    def bulk_may_be_charged(self) -> bool:
        """Whether the bulk capacitor may hold a charge now: a unit arrives charged (it was
        unplugged from the wall, not discharged), so until a reading confirms the discharge, and
        again after every power-up."""
        charged = True
        for reading in self.readings:
            check = self.family.check(reading.check)
            if check.power in ("live", "lamp"):
                charged = True
            elif check.id == planner.DISCHARGE_CHECK:
                charged = False
        return charged

    def _plan_state(self) -> planner.PlanState:
        skipped = frozenset(self.model.check_index(c) for c in self.skipped)
        done = {i for i, _ in self._evidence} | skipped
        return planner.PlanState(frozenset(done), self.bulk_may_be_charged, self._evidence, skipped)

    @cached_property
    def next_check(self) -> Proposal | None:
        state = self._plan_state()
        i = planner.choose(self.model, self.posterior, state)
        if i is None:
            return None
        check = self.model.checks[i].check
        if check.id == planner.DISCHARGE_CHECK and state.bulk_may_be_charged:
            why = ("the unit was powered" if self.powered else "units arrive charged")
            return self._proposal(i, 0.0, f"{why}: confirm the bulk capacitor is discharged before a hand "
                                          f"goes on the primary")
        bits = planner.information_about_root(self.model, self.posterior, i)
        if any(r.check == check.id for r in self.readings):
            return self._proposal(i, bits, "take it again: the leading fault rests on this one reading, "
                                           "which may have been a misread or a poor probe contact")
        if planner.finished(self.model, self.posterior):
            return self._proposal(i, bits, "confirms the leading fault, which so far rests on one reading")
        return self._proposal(i, bits, f"tells {bits:.2f} bits about the fault in {check.minutes:g} min")

    @property
    def powered(self) -> bool:
        """Whether the unit has been powered (lamp or mains) in this case."""
        return any(self.family.check(r.check).power in ("live", "lamp") for r in self.readings)

    def _proposal(self, i: int, bits: float, reason: str) -> Proposal:
        check_model = self.model.checks[i]
        check = check_model.check
        notes = cautions_for(self.family, check)
        overvoltage = output_overvoltage(self.model, self.posterior, check)
        if overvoltage:
            notes = (overvoltage,) + notes
        if check.power in ("live", "lamp") and not self.power_up_allowed:
            notes = (OPEN_CLAMP,) + notes
        how = lamp_how(self.model.ratings) if check.id == planner.LAMP_CHECK else check.how
        return Proposal(check, check.title, check.power, check_model.healthy, check_model.healthy_outcome,
                        check.minutes, bits, hazard_class(self.family, check, self.model.ratings.output_v),
                        notes, reason, how)

    def discharge_needed_before(self, check_id: str) -> bool:
        """Whether the bulk capacitor's discharge must be confirmed before this check (the
        planner's rule, so the bench and practice judge a hand on the primary alike)."""
        return planner.discharge_first(self.model, self._plan_state(), self.family.check(check_id))

    @property
    def live_allowed(self) -> bool:
        """Whether plain mains may be applied now: no plausible short, a lamp power-up that flashed
        and went dim or dark, and no plausible open clamp (the planner's rule)."""
        return planner.live_allowed(self.model, self.posterior, self._evidence)

    @property
    def power_up_allowed(self) -> bool:
        """Whether the unit may be powered at all, even through the series lamp: not while an open
        clamp is plausible (the switch would avalanche on the first cycles)."""
        return planner.power_up_allowed(self.model, self.posterior)

    @cached_property
    def conclusion(self) -> Conclusion | None:
        if self.next_check is not None:
            return None
        return conclude(self.model, self.posterior)

    def final_conclusion(self) -> Conclusion:
        """The conclusion as it stands now, even if the planner would measure further."""
        return conclude(self.model, self.posterior)


def start_diagnosis(family: Family, ratings: Ratings, prior_counts: dict[str, int] | None = None) -> DiagnosisState:
    counts = tuple(sorted((prior_counts or {}).items()))
    return DiagnosisState(cached_fault_model(family, ratings, counts))
