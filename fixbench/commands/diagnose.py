"""`fixbench diagnose CASE.json`: replay a case's readings and say what is likely wrong and what to
measure next. A case file: {"family": ID, "ratings": {...}, "readings": [{"check": ID, "value": TEXT}]}.
"""

from __future__ import annotations

import json
from pathlib import Path

from fixbench.commands.usage import UsageError
from fixbench.commands._output import print_json
from fixbench.commands._unit import family_and_ratings
from fixbench.engine import start_diagnosis
from fixbench.engine.replay import replay_readings
from fixbench.engine.report import state_as_dict, state_text

HELP = "rank the likely faults of a case file and propose the next check"


def add_arguments(parser) -> None:
    parser.add_argument("case", help="case file (JSON), or - for standard input")
    parser.add_argument("--json", action="store_true", help="print suspects, next check and conclusion as JSON")


def load_case(path_text: str) -> dict:
    import sys

    try:
        text = sys.stdin.read() if path_text == "-" else Path(path_text).read_text(encoding="utf-8")
    except OSError as err:
        raise UsageError(f"cannot read {path_text}: {err.strerror}") from None
    try:
        case = json.loads(text)
    except json.JSONDecodeError as err:
        raise UsageError(f"{path_text}: not valid JSON (line {err.lineno}: {err.msg})") from None
    if not isinstance(case, dict):
        raise UsageError(f"{path_text}: a case file holds one JSON object")
    for key in ("family", "ratings"):
        if key not in case:
            raise UsageError(f"{path_text}: '{key}' is missing")
    if not isinstance(case.get("readings", []), list):
        raise UsageError(f"{path_text}: 'readings' must be a list")
    return case


def replay(case: dict, source: str = "case"):
    """The case file's readings taken in order; the first one this build cannot take is an error
    naming its place in the file."""
    family, ratings = family_and_ratings(case["family"], case["ratings"])
    readings = case.get("readings", [])
    for i, item in enumerate(readings):
        if not isinstance(item, dict) or "check" not in item or "value" not in item:
            raise UsageError(f"{source}: readings[{i}] needs 'check' and 'value'")
    replayed = replay_readings(start_diagnosis(family, ratings),
                               ((str(item["check"]), str(item["value"])) for item in readings))
    if replayed.refused:
        first = replayed.refused[0]
        where = (f"readings[{first.index}]" if first.unknown_check
                 else f"readings[{first.index}] ({first.check_id})")
        raise UsageError(f"{source}: {where}: {first.reason}")
    return replayed.state


def run(args) -> int:
    case = load_case(args.case)
    state = replay(case, args.case)
    if args.json:
        print_json(state_as_dict(state))
        return 0
    print(state_text(state))
    return 0
