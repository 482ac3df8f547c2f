"""Reading a family and ratings off the command line or a case file, with one-line errors."""

from __future__ import annotations

from fixbench.commands.usage import UsageError
from fixbench.knowledge import Family, load_knowledge
from fixbench.physics.ratings import Ratings, parse_ratings
from fixbench.quantities import ReadingError


def add_unit_arguments(parser, family_required: bool = True) -> None:
    parser.add_argument("--family", required=family_required, help="supply family id (see `fixbench families`)")
    parser.add_argument("--mains", default="230 V", help="label mains: '230 V', '120 V' or 'universal' (default 230 V)")
    parser.add_argument("--bench-mains", help="mains on the bench for a universal unit (default 230 V)")
    parser.add_argument("--frequency", help="mains frequency (default 50 Hz, 60 Hz for 120 V)")
    parser.add_argument("--output", default="5 V", help="rated output voltage, e.g. 5V or 19 V")
    parser.add_argument("--current", default="1 A", help="rated output current, e.g. 2A")
    parser.add_argument("--bulk", help="bulk capacitance if read off the capacitor, e.g. 22uF")
    parser.add_argument("--switching", help="switching frequency if known, e.g. 65kHz")


def ratings_text(args) -> dict[str, str]:
    text = {"mains": args.mains, "output": args.output, "current": args.current}
    for key, value in (("bench_mains", args.bench_mains), ("frequency", args.frequency),
                       ("bulk", args.bulk), ("switching", args.switching)):
        if value:
            text[key] = value
    return text


def family_and_ratings(family_id: str, ratings: dict) -> tuple[Family, Ratings]:
    try:
        family = load_knowledge().family(family_id)
    except KeyError as err:
        raise UsageError(str(err).strip("'\"")) from None
    if not isinstance(ratings, dict) or not all(isinstance(v, str) for v in ratings.values()):
        raise UsageError("ratings must be an object of text values, e.g. {\"mains\": \"230 V\"}")
    try:
        return family, parse_ratings(ratings)
    except ReadingError as err:
        raise UsageError(str(err)) from None
