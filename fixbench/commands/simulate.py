"""`fixbench simulate`: the readings a unit with a given fault would give, as a case file that
`fixbench diagnose` reads."""

from __future__ import annotations

from fixbench.commands.usage import UsageError, near_matches
from fixbench.commands._output import print_json
from fixbench.commands._unit import add_unit_arguments, board_file, family_and_ratings, ratings_text
from fixbench.knowledge.board import profile_as_data
from fixbench.physics.ratings import parse_ratings
from fixbench.engine import simulate_readings
from fixbench.engine.hypotheses import NO_FAULT

HELP = "print the readings a unit with a given fault would give (a case file for `diagnose`)"


def add_arguments(parser) -> None:
    add_unit_arguments(parser)
    parser.add_argument("--fault", required=True, help=f"fault id (e.g. C2.dried) or '{NO_FAULT}'")
    parser.add_argument("--seed", type=int, default=0, help="random seed for collateral damage and meter noise")
    parser.add_argument("--exact", action="store_true", help="exact readings: no meter tolerance")
    parser.add_argument("--wrong-rate", type=float, default=0.0, help="share of readings that are misread (0-1)")
    parser.add_argument("--json", action="store_true", help="print the case file as JSON")


def run(args) -> int:
    text = ratings_text(args)
    board = board_file(args.board)
    family, ratings = family_and_ratings(args.family, text, board)
    if args.fault != NO_FAULT and args.fault not in {f.id for f in family.faults}:
        known = [f.id for f in family.faults]
        raise UsageError(f"unknown fault '{args.fault}' for family '{family.id}'"
                         f"{near_matches(args.fault, known)}; `fixbench families --faults "
                         f"{family.id}` lists them")
    if not 0.0 <= args.wrong_rate <= 1.0:
        raise UsageError("--wrong-rate must be between 0 and 1")
    readings = simulate_readings(family, ratings, args.fault, seed=args.seed, noise=not args.exact,
                                 wrong_rate=args.wrong_rate)
    case = {"family": family.id, "ratings": parse_ratings(text).as_text(),
            "readings": [{"check": c, "value": v} for c, v in readings.items()]}
    if board is not None:
        case["board"] = profile_as_data(board)  # diagnose reads the readings on the same board
    if args.json:
        print_json(case)
    else:
        for item in case["readings"]:
            print(f"{item['check']:28s} {item['value']}")
    return 0

