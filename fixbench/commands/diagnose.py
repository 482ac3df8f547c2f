"""`fixbench diagnose CASE.json`: replay a case's readings and say what is likely wrong and what to
measure next. A case file: {"family": ID, "ratings": {...}, "readings": [{"check": ID, "value": TEXT}]}.
"""

from __future__ import annotations

import json
from pathlib import Path

from fixbench.cli import UsageError
from fixbench.commands._output import print_json
from fixbench.commands._unit import family_and_ratings
from fixbench.engine import start_diagnosis
from fixbench.engine.report import state_as_dict
from fixbench.quantities import ReadingError

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
    family, ratings = family_and_ratings(case["family"], case["ratings"])
    state = start_diagnosis(family, ratings)
    for i, item in enumerate(case.get("readings", [])):
        if not isinstance(item, dict) or "check" not in item or "value" not in item:
            raise UsageError(f"{source}: readings[{i}] needs 'check' and 'value'")
        if not family.has_check(str(item["check"])):
            raise UsageError(f"{source}: readings[{i}]: unknown check '{item['check']}' for family '{family.id}'")
        try:
            state = state.with_reading(str(item["check"]), str(item["value"]))
        except ReadingError as err:
            raise UsageError(f"{source}: readings[{i}] ({item['check']}): {err}") from None
    return state


def run(args) -> int:
    case = load_case(args.case)
    state = replay(case, args.case)
    result = state_as_dict(state)
    if args.json:
        print_json(result)
        return 0
    from fixbench.engine.report import print_state

    print_state(state)
    return 0
