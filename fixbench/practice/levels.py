"""How hard a practice round is: what the hidden unit hides and how honestly it answers.

- easy: the root fault with only the damage that nearly always goes with it, exact readings;
- normal: collateral damage drawn with the knowledge base's chances, and meter tolerance;
- hard: as normal, plus customers who report what they did not see, a meter reading that is
  occasionally off (a misread or bad probe contact), and faults that come and go (away, now and
  then, while the unit is powered: a dried capacitor or a broken lead still reads as it is cold).

Each level says in plain words what it changes (`Level.changes`), for the pick screen.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Level:
    id: str
    title: str
    summary: str
    collateral: bool  # draw the collateral damage by its chances (else only the near-certain part)
    exact: bool  # readings without meter tolerance
    wrong_rate: float  # chance that any reading is of another class
    report_wrong_rate: float  # chance that the customer's complaint has one answer wrong
    intermittent_boost: float  # how much likelier faults that come and go are drawn
    intermittent_away: float  # chance that such a fault is absent while a reading is taken
    changes: tuple[str, ...] = ()  # what the level changes, in the words the pick screen shows


EASY = Level("easy", "Easy", "One clear fault, exact readings.",
             collateral=False, exact=True, wrong_rate=0.0, report_wrong_rate=0.0,
             intermittent_boost=1.0, intermittent_away=0.0,
             changes=("Damage: the failed part, and only the damage that nearly always goes with it "
                      "(a short takes the fuse).",
                      "Readings: exactly what the unit gives.",
                      "The customer's complaint: exactly what the unit does."))
NORMAL = Level("normal", "Normal", "Collateral damage, readings within meter tolerance.",
               collateral=True, exact=False, wrong_rate=0.0, report_wrong_rate=0.0,
               intermittent_boost=1.0, intermittent_away=0.0,
               changes=("Damage: parts that often fail with the fault may be hidden too; test them "
                        "before powering up.",
                        "Readings: within the meter's and the parts' tolerance.",
                        "The customer's complaint: as customers tell it; now and then a detail is off."))
# The hard figures are judgement, not measurement [practice]: one complaint in four misleads, one
# meter reading in twenty is off, and a fault that comes and goes is away for one reading in three.
HARD = Level("hard", "Hard", "Misleading customer reports, an occasional reading that is off, "
             "faults that come and go.",
             collateral=True, exact=False, wrong_rate=0.05, report_wrong_rate=0.25,
             intermittent_boost=3.0, intermittent_away=0.35,
             changes=("Damage: as Normal, hidden parts that failed with the fault.",
                      "Readings: one in twenty is off (a misread or a poor probe contact); faults "
                      "that come and go may be away while the unit is powered.",
                      "The customer's complaint: as on Normal, and one in four has a detail plainly wrong."))

LEVELS: dict[str, Level] = {level.id: level for level in (EASY, NORMAL, HARD)}


def level(level_id: str) -> Level:
    try:
        return LEVELS[level_id]
    except KeyError:
        raise KeyError(f"unknown practice level '{level_id}' (known: {', '.join(LEVELS)})") from None
