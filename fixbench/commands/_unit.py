"""Reading a family and ratings off the command line or a case file, with one-line errors."""

from __future__ import annotations


from fixbench.commands.usage import UsageError, near_matches, read_bounded
from fixbench.engine.fault_model import cached_fault_model
from fixbench.knowledge import Family, load_knowledge
from fixbench.knowledge.board import BoardError, BoardProfile, on_board, profile_from_data, profile_from_toml
from fixbench.physics.part_values import ratings_on_board
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
    add_board_argument(parser)


def add_board_argument(parser) -> None:
    parser.add_argument("--board", metavar="FILE.toml",
                        help="a board profile (the file the window exports): the board's own designators "
                             "and marked values, by the family's part ids, e.g. [parts.C1] value = \"10 uF\"")


MAX_BOARD_BYTES = 1_000_000  # a profile is a few kilobytes


def board_file(path_text: str | None) -> BoardProfile | None:
    """The board profile in that file, or a one-line error saying what is wrong with it."""
    if path_text is None:
        return None
    raw = read_bounded(path_text, MAX_BOARD_BYTES, "a board profile")
    try:
        return profile_from_toml(raw.decode("utf-8-sig"), path_text)
    except UnicodeDecodeError:
        raise UsageError(f"{path_text}: not text in UTF-8; save the file as UTF-8") from None
    except BoardError as err:
        raise UsageError(str(err)) from None


def board_data(data: object, source: str) -> BoardProfile:
    """A board profile carried in a case file ("board": the profile file's tables as JSON)."""
    try:
        return profile_from_data(data, source)
    except BoardError as err:
        raise UsageError(str(err)) from None


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


def family_and_ratings(family_id: object, ratings: object,
                       board: BoardProfile | None = None) -> tuple[Family, Ratings]:
    """The family (as the board has it, where a profile is given) and its parsed ratings, refused in
    one line unless the family's circuit can have them (its healthy readings are built here once,
    and cached for the command that follows)."""
    family = family_named(family_id)
    if not isinstance(ratings, dict) or not all(isinstance(v, str) for v in ratings.values()):
        raise UsageError("ratings must be an object of text values, e.g. {\"mains\": \"230 V\"}")
    try:
        if board is not None:
            family = on_board(family, board)
        parsed = ratings_on_board(family, parse_ratings(ratings))
        cached_fault_model(family, parsed)
    except (ReadingError, BoardError) as err:
        raise UsageError(str(err)) from None
    return family, parsed
