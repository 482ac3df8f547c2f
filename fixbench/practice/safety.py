"""Safety slips in a practice round, why each is dangerous, and when a colleague would shout.

A slip is judged at the moment the trainee reaches for a check, from what the trainee knew then,
by the engine's own rules (so a change to the planner's safety gate changes practice too):

- plain mains on a shorted primary: the unit really is shorted and the fuse blows again (nobody
  is quick enough to stop it: the bang is the warning);
- plain mains while the planner would not allow it: a short on the primary still plausible from
  the trainee's readings, or no series-lamp power-up yet that did not glow bright; a colleague
  stops the plug before it goes in;
- a hand on the primary while the planner would first confirm the bulk capacitor discharged (today
  after any power-up; whatever the planner's rule becomes, this follows it); a colleague stops the
  hand.

A slip stops the round at once. It costs once per mistake: reaching for the same thing again
before anything was done to put it right (before another power-up, for the discharge) is the same
mistake, shouted again but not counted again.

The explanations reuse the engine's caution texts, so practice and bench say the same thing.
"""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.engine import cautions
from fixbench.engine.diagnosis import DiagnosisState
from fixbench.knowledge.model import Check

MAINS_ON_SHORT = "mains_on_short"
MAINS_UNPROVEN = "mains_unproven"
UNDISCHARGED = "undischarged"
KINDS = (MAINS_ON_SHORT, MAINS_UNPROVEN, UNDISCHARGED)

WHAT = {
    MAINS_ON_SHORT: "Plain mains on a unit with a shorted primary: the fuse blew again.",
    MAINS_UNPROVEN: "Reached for plain mains before the series lamp had shown there was no short.",
    UNDISCHARGED: "Reached for the primary without confirming the bulk capacitor was discharged.",
}
NAMES = {  # short names, for the owner's table of slips by kind
    MAINS_ON_SHORT: "plain mains on a short",
    MAINS_UNPROVEN: "plain mains before the lamp",
    UNDISCHARGED: "primary touched before the discharge check",
}
SHOUT = {
    MAINS_ON_SHORT: "Bang! The fuse has blown: plain mains went onto a shorted primary. Unplug it.",
    MAINS_UNPROVEN: "Stop! Not on plain mains yet: nothing has shown there is no short on the primary. "
                    "Power it up through the series lamp first.",
    UNDISCHARGED: "Stop! Hands off the primary: nobody has confirmed the bulk capacitor is discharged. "
                  "Measure it first.",
}
WHY = {
    MAINS_ON_SHORT: ("A short across the rectified mains draws a current limited only by the wiring: the "
                     "fuse opens with an arc, a shorted switch can split open, and any replacement part "
                     "fitted in a hurry dies the same way. " + cautions.LAMP),
    MAINS_UNPROVEN: ("Nothing blew this time, but the readings taken so far did not rule out a short on "
                     "the primary. " + cautions.LAMP),
    UNDISCHARGED: cautions.BULK,
}
# Slips a colleague stops before they happen: the reading is not taken.
STOPPED_BEFORE = (MAINS_UNPROVEN, UNDISCHARGED)


@dataclass(frozen=True)
class Slip:
    kind: str
    step: int  # the step it happened at (for a stopped one, the step it would have been), from 1
    check_id: str
    what: str
    why: str

    @property
    def blew_fuse(self) -> bool:
        return self.kind == MAINS_ON_SHORT

    @property
    def shout(self) -> str:
        return SHOUT[self.kind]

    @property
    def stopped(self) -> bool:
        """The colleague stopped it: the check was not taken."""
        return self.kind in STOPPED_BEFORE


def slip_before(state: DiagnosisState, check: Check, unit_is_shorted: bool, step: int) -> Slip | None:
    """The slip that taking ``check`` now would be, from the state before its reading, if any."""
    kind = None
    if check.power == "live" and not state.live_allowed:
        kind = MAINS_ON_SHORT if unit_is_shorted else MAINS_UNPROVEN
    elif state.discharge_needed_before(check.id):
        kind = UNDISCHARGED
    if kind is None:
        return None
    return Slip(kind, step, check.id, WHAT[kind], WHY[kind] + " " + cautions.DEFER)


def mistake_key(state: DiagnosisState, slip: Slip) -> tuple[str, int]:
    """What makes two slips one mistake: the same kind with no power-up between them."""
    powered = sum(state.family.check(r.check).power in ("lamp", "live") for r in state.readings)
    return slip.kind, powered
