"""Safety slips in a practice round, and why each is dangerous.

Three slips, judged at the moment the check is taken, from what the trainee knew then:

- plain mains on a shorted primary: the unit really is shorted, the fuse blows again;
- plain mains while a short is still possible: the trainee's own readings leave a primary short
  above the engine's threshold; nothing blew this time, but the habit is what blows units and
  throws molten copper;
- touching the primary cold after a power-up without confirming the bulk capacitor discharged.

The explanations reuse the engine's caution texts, so practice and bench say the same thing.
"""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.engine import cautions, planner
from fixbench.engine.diagnosis import DiagnosisState
from fixbench.knowledge.model import Check

MAINS_ON_SHORT = "mains_on_short"
MAINS_UNPROVEN = "mains_unproven"
UNDISCHARGED = "undischarged"

WHAT = {
    MAINS_ON_SHORT: "Plain mains on a unit with a shorted primary: the fuse blew again.",
    MAINS_UNPROVEN: "Plain mains while a short on the primary was still possible.",
    UNDISCHARGED: "Touched the primary after a power-up without confirming the bulk capacitor was discharged.",
}
WHY = {
    MAINS_ON_SHORT: ("A short across the rectified mains draws a current limited only by the wiring: the "
                     "fuse opens with an arc, a shorted switch can split open, and any replacement part "
                     "fitted in a hurry dies the same way. " + cautions.LAMP),
    MAINS_UNPROVEN: ("Nothing blew this time, but the readings taken so far did not rule out a short on "
                     "the primary. " + cautions.LAMP),
    UNDISCHARGED: cautions.BULK,
}


@dataclass(frozen=True)
class Slip:
    kind: str
    step: int  # the number of the step it happened at, from 1
    check_id: str
    what: str
    why: str

    @property
    def blew_fuse(self) -> bool:
        return self.kind == MAINS_ON_SHORT


def slip_before(state: DiagnosisState, check: Check, unit_is_shorted: bool, step: int) -> Slip | None:
    """The slip that taking ``check`` now would be, from the state before its reading, if any."""
    family = state.family
    kind = None
    if check.power == "live":
        if unit_is_shorted:
            kind = MAINS_ON_SHORT
        elif planner.primary_short_chance(state.model, state.posterior) > planner.SHORT_THRESHOLD:
            kind = MAINS_UNPROVEN
    elif (check.power == "cold" and family.touches_primary(check) and check.id != planner.DISCHARGE_CHECK
          and state.powered_since_discharge):
        kind = UNDISCHARGED
    if kind is None:
        return None
    return Slip(kind, step, check.id, WHAT[kind], WHY[kind] + " " + cautions.DEFER)
