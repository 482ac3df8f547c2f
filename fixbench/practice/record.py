"""A kept round as plain data, and the round played again from it.

The record holds the scenario in full (a replayed case's ratings and the customer's answers are in
no scenario id), every action in order (checks reached for, the stopped ones included, and looks
at the coach), the diagnosis committed and the readings seen. Playing the actions again on the same
scenario gives the same readings, since the hidden unit's random streams are seeded; if the
knowledge or the engine changed since, the readings may differ, and the reopened debrief says so.
"""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.knowledge.model import Family
from fixbench.practice.play import PlayedRound, play_round
from fixbench.practice.round import PracticeRound
from fixbench.practice.scenario import Scenario

VERSION = 1


class RecordError(ValueError):
    """A kept record this build cannot read (another version, or a family it no longer has)."""


@dataclass(frozen=True)
class ReopenedRound:
    played: PlayedRound
    same_readings: bool  # the readings came out as the trainee saw them


def round_record(practice: PracticeRound) -> dict:
    s = practice.scenario
    return {
        "version": VERSION,
        "scenario": {"family": s.family_id, "ratings": [list(r) for r in s.ratings], "fault": s.fault_id,
                     "modes": [list(m) for m in s.modes], "level": s.level_id, "seed": s.seed,
                     "intermittent": s.intermittent, "source": s.source, "closed": s.closed,
                     "told": [list(t) for t in s.told]},
        "actions": [list(a) for a in practice.actions],
        "commit": None if practice.commitment is None else {
            "fault": practice.commitment.fault_id, "parts": sorted(practice.commitment.parts)},
        "readings": [[step.check_id, step.reading] for step in practice.steps],
    }


def scenario_of(record: dict) -> Scenario:
    if record.get("version") != VERSION:
        raise RecordError(f"a practice record of version {record.get('version')!r} cannot be read here")
    s = record["scenario"]
    return Scenario(s["family"], tuple(tuple(r) for r in s["ratings"]), s["fault"],
                    tuple(tuple(m) for m in s["modes"]), s["level"], int(s["seed"]), bool(s["intermittent"]),
                    s["source"], s["closed"], tuple(tuple(t) for t in s["told"]))


def reopen(family: Family, record: dict) -> ReopenedRound:
    """The kept round played again and debriefed."""
    scenario = scenario_of(record)
    if scenario.family_id != family.id:
        raise RecordError(f"the record is of family '{scenario.family_id}', not '{family.id}'")
    commit = record["commit"]
    if commit is None:
        raise RecordError("the kept round has no diagnosis committed")
    try:
        played = play_round(family, scenario, [tuple(a) for a in record["actions"]], commit["fault"], commit["parts"])
    except KeyError as err:
        raise RecordError(f"the kept round names {err} that this build does not know") from None
    seen = [[step.check_id, step.reading] for step in played.practice.steps]
    return ReopenedRound(played, seen == record["readings"])
