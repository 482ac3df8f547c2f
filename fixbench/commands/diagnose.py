"""`fixbench diagnose CASE.json`: replay a case's readings and say what is likely wrong and what to
measure next. A case file: {"family": ID, "ratings": {...}, "readings": [{"check": ID, "value": TEXT}]}, and
optionally "board": a board profile's tables (model, family, parts) as JSON.
"""

from __future__ import annotations

import json

from fixbench.commands.usage import UsageError, near_matches, read_bounded
from fixbench.commands._output import print_json
from fixbench.commands._unit import add_board_argument, board_data, board_file, family_and_ratings
from fixbench.engine import start_diagnosis
from fixbench.engine.replay import replay_readings
from fixbench.engine.report import state_as_dict, state_text

HELP = "rank the likely faults of a case file and propose the next check"

# A case at the bench takes tens of readings, a hard one with re-takes perhaps two hundred; an
# exported case with its whole record is a few kilobytes per reading [practice]. Far past that a
# file is not a case, and is refused before the engine spends time on it.
MAX_READINGS = 2000
MAX_FILE_BYTES = 8_000_000


def add_arguments(parser) -> None:
    parser.add_argument("case", help="case file (JSON), or - for standard input")
    parser.add_argument("--json", action="store_true", help="print suspects, next check and conclusion as JSON")
    add_board_argument(parser)


def load_case(path_text: str) -> dict:
    """The case file as a dict, or a one-line error saying what is wrong with it."""
    raw = _case_bytes(path_text)
    try:
        # Bytes, so json picks the encoding: UTF-8 with or without a byte-order mark, and the
        # UTF-16 some Windows shells write when output is redirected (RFC 8259 section 8.1).
        case = json.loads(raw)
    except UnicodeDecodeError as err:
        raise UsageError(f"{path_text}: not text in UTF-8 (byte {raw[err.start]:#04x} at position "
                         f"{err.start}); save the file as UTF-8") from None
    except json.JSONDecodeError as err:
        raise UsageError(f"{path_text}: not valid JSON (line {err.lineno}: {err.msg})") from None
    except RecursionError:
        raise UsageError(f"{path_text}: nested too deeply to be a case file") from None
    if not isinstance(case, dict):
        raise UsageError(f"{path_text}: a case file holds one JSON object")
    for key in ("family", "ratings"):
        if key not in case:
            raise UsageError(f"{path_text}: '{key}' is missing")
    readings = case.get("readings", [])
    if not isinstance(readings, list):
        raise UsageError(f"{path_text}: 'readings' must be a list")
    if len(readings) > MAX_READINGS:
        raise UsageError(f"{path_text}: {len(readings)} readings; a case file holds at most "
                         f"{MAX_READINGS}")
    return case


def _case_bytes(path_text: str) -> bytes:
    return read_bounded(path_text, MAX_FILE_BYTES, "a case file", stdin=True)


def replay(case: dict, source: str = "case", board=None):
    """The case file's readings taken in order, on the board profile given (or the case file's own
    "board", as `simulate --board` writes it); the first reading this build cannot take is an error
    naming its place in the file."""
    if board is None and "board" in case:
        board = board_data(case["board"], f"{source}: board")
    family, ratings = family_and_ratings(case["family"], case["ratings"], board)
    readings = case.get("readings", [])
    for i, item in enumerate(readings):
        if not isinstance(item, dict) or "check" not in item or "value" not in item:
            raise UsageError(f"{source}: readings[{i}] needs 'check' and 'value'")
        if not isinstance(item["check"], str) or not isinstance(item["value"], str | int | float):
            raise UsageError(f"{source}: readings[{i}]: 'check' is an id and 'value' the text typed, "
                             "such as {\"check\": \"bulk_voltage\", \"value\": \"325 V\"}")
    replayed = replay_readings(start_diagnosis(family, ratings),
                               ((str(item["check"]), str(item["value"])) for item in readings))
    if replayed.refused:
        first = replayed.refused[0]
        where = (f"readings[{first.index}]" if first.unknown_check
                 else f"readings[{first.index}] ({first.check_id})")
        hint = near_matches(first.check_id, (c.id for c in family.checks)) if first.unknown_check else ""
        raise UsageError(f"{source}: {where}: {first.reason}{hint}")
    return replayed.state


def run(args) -> int:
    case = load_case(args.case)
    state = replay(case, args.case, board_file(args.board))
    if args.json:
        print_json(state_as_dict(state))
        return 0
    print(state_text(state))
    return 0
