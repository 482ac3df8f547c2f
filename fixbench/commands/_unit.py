"""Reading a family and ratings off the command line or a case file, with one-line errors."""

from __future__ import annotations

from fixbench.commands.usage import UsageError, near_matches
from fixbench.engine.fault_model import cached_fault_model
from fixbench.knowledge import Family, load_knowledge
from fixbench.physics.ratings import Ratings, parse_ratings
from fixbench.quantities import ReadingError

OPTIONAL_RATINGS = ("bench_mains", "frequency", "bulk", "switching")


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
    """The ratings typed on the command line; an option given with blank text is a slip, not a
    request for the default."""
    text = {"mains": args.mains, "output": args.output, "current": args.current}
    for key in OPTIONAL_RATINGS:
        value = getattr(args, key)
        if value is not None:
            text[key] = value
    for key, value in text.items():
        if not value.strip():
            option = "--" + key.replace("_", "-")
            raise UsageError(f"{option} is empty: give a value (see --help) or leave the option out")
    return text


def family_named(family_id: object) -> Family:
    """The family of that id, or a one-line error naming the ones close to it."""
    families = load_knowledge().families
    if not isinstance(family_id, str):
        raise UsageError(f"the family must be an id as text, such as pwm_flyback, not {family_id!r:.40}")
    if family_id not in families:
        raise UsageError(f"unknown supply family '{family_id}'{near_matches(family_id, families)}; "
                         "`fixbench families` lists them")
    return families[family_id]


def family_and_ratings(family_id: object, ratings: object) -> tuple[Family, Ratings]:
    """The family and its parsed ratings, refused in one line unless the family's circuit can have
    them (its healthy readings are built here once, and cached for the command that follows)."""
    family = family_named(family_id)
    if not isinstance(ratings, dict) or not all(isinstance(v, str) for v in ratings.values()):
        raise UsageError("ratings must be an object of text values, e.g. {\"mains\": \"230 V\"}")
    try:
        parsed = parse_ratings(ratings)
        cached_fault_model(family, parsed)
    except ReadingError as err:
        raise UsageError(str(err)) from None
    return family, parsed
