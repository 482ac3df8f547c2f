"""Board profiles at the bench: the family as the board of a case's model has it, a marking kept
from a step ("this board's part is marked ..."), the profile editor's save, and the TOML file a
shop shares.

A marking is read (and refused with a message) before anything is kept: the whole profile with the
new entry must apply to the family (:func:`fixbench.knowledge.board.on_board`).
"""

from __future__ import annotations

from fixbench.knowledge import Family
from fixbench.knowledge.model import KIND_VALUE_UNITS, Part
from fixbench.knowledge.board import (BoardError, BoardProfile, PartEntry, on_board, profile_from_toml,
                                      profile_to_toml)
from fixbench.physics.part_values import ratings_on_board, value_of
from fixbench.physics.ratings import Ratings
from fixbench.quantities import format_quantity
from fixbench.store import StoreInputError, board_profiles
from fixbench.store.board_profiles import KeptPart, KeptPhoto, KeptProfile
from fixbench.store.database import Store

__all__ = ["BoardError", "BoardProfile", "KeptPhoto", "PartEntry", "add_photo", "board_of_model",
           "board_photos", "export_profile", "family_on_board", "import_profile", "keep_entry",
           "keep_profile", "mark_point", "named_on_board", "part_words", "photo_around", "photo_for_point", "step_part"]


def _profile(kept: KeptProfile | None, family_id: str) -> BoardProfile | None:
    if kept is None or kept.family_id != family_id:
        return None
    return BoardProfile(kept.model, kept.family_id,
                        tuple(PartEntry(p.part_id, p.designator, p.value, p.rated, p.package)
                              for p in kept.parts))


def board_of_model(store: Store, model: str, family_id: str) -> BoardProfile | None:
    """The shop's profile of this model's board, where it names parts of this family."""
    return _profile(board_profiles.profile_for_model(store, model), family_id)


def family_on_board(family: Family, ratings: Ratings, board: BoardProfile | None) -> tuple[Family, Ratings]:
    """The family and ratings as the board has them (unchanged without a profile). A profile that
    no longer applies (the knowledge base lost a part) is left out rather than stopping the case."""
    if board is None or not board.parts:
        return family, ratings
    try:
        on = on_board(family, board)
    except BoardError:
        return family, ratings
    return on, ratings_on_board(on, ratings)


def keep_entry(store: Store, family: Family, model: str, entry: PartEntry) -> BoardProfile:
    """Keep one part's designator and marking for the model's board, once the profile with it
    applies to the family; BoardError (the message for the technician) otherwise."""
    board = board_of_model(store, model, family.id) or BoardProfile(model, family.id)
    board = board.with_entry(entry)
    on_board(family, board)  # BoardError before anything is kept
    try:
        kept = board_profiles.save_part(store, model, family.id,
                                        KeptPart(entry.part, entry.designator, entry.value, entry.rated,
                                                 entry.package))
    except StoreInputError as err:
        raise BoardError(str(err)) from None
    return _profile(kept, family.id) or board


def keep_profile(store: Store, family: Family, model: str, entries: list[PartEntry]) -> BoardProfile:
    """Keep a whole profile from the editor or a file, once it applies to the family."""
    board = BoardProfile(" ".join(model.split()), family.id,
                         tuple(sorted((e for e in entries if not e.blank), key=lambda e: e.part)))
    on_board(family, board)
    try:
        kept = board_profiles.replace_profile(
            store, model, family.id,
            [KeptPart(e.part, e.designator, e.value, e.rated, e.package) for e in board.parts])
    except StoreInputError as err:
        raise BoardError(str(err)) from None
    return _profile(kept, family.id) or board


def export_profile(store: Store, model: str, family_id: str) -> str:
    board = board_of_model(store, model, family_id) or BoardProfile(model, family_id)
    return profile_to_toml(board)


def import_profile(store: Store, family: Family, model: str, text: str) -> BoardProfile:
    """A shared profile file kept as this model's board (the model typed at intake wins over the
    file's); BoardError if it does not read or does not fit the family."""
    board = profile_from_toml(text, "profile file")
    if board.family and board.family != family.id:
        raise BoardError(f"the file names parts of the family '{board.family}', and this unit is "
                         f"'{family.id}'")
    return keep_profile(store, family, model or board.model, list(board.parts))


def board_photos(store: Store, model: str, family_id: str) -> tuple[KeptPhoto, ...]:
    """Every photo of the model's board, with its marked test points."""
    kept = board_profiles.profile_for_model(store, model)
    if kept is None or kept.family_id != family_id:
        return ()
    return tuple(p for p in (board_profiles.photo(store, i) for i in kept.photo_ids) if p is not None)


def photo_around(photos: tuple[KeptPhoto, ...], point_ids: tuple[str, ...]) -> tuple[KeptPhoto, str] | None:
    """The first photo with one of these test points marked, and that point."""
    for photo in photos:
        for point in point_ids:
            if point in photo.marks:
                return photo, point
    return None


def add_photo(store: Store, family: Family, model: str, image: bytes, title: str = "") -> int:
    try:
        return board_profiles.add_photo(store, model, family.id, image, title)
    except StoreInputError as err:
        raise BoardError(str(err)) from None


def mark_point(store: Store, family: Family, photo_id: int, point_id: str, x: float, y: float) -> None:
    """Mark where one of the family's test points is on a photo of the board."""
    family.test_point(point_id)  # KeyError: a programmer's slip, not the technician's
    board_profiles.mark_point(store, photo_id, point_id, x, y)


def part_words(part, typical: str) -> str:
    """The part a step reads, as the board names it: 'Start-up resistor R3 + R4, marked 2 x 2.2
    Mohm'; a part the profile does not mark is said to be the family's typical one."""
    name = f"{part.title} {part.label}"
    if part.marked:
        return f"{name}, marked {part.marking}" + (f" ({part.package})" if part.package else "")
    return f"{name}, typical {typical}" if typical else name


def named_on_board(title: str, part_id: str | None, board: BoardProfile | None) -> str:
    """A part's name in the record and the customer's report: its title, with the board's own
    designator where the profile gives one ("Start-up resistor (R3 + R4)")."""
    entry = board.entry(part_id) if board is not None and part_id else None
    if entry is None or not entry.designator.strip():
        return title
    return f"{title} ({' '.join(entry.designator.split())})"


def step_part(state, check) -> tuple[Part | None, str]:
    """The part a step reads (None where it reads no single part) and what to say of it."""
    if check.target_kind != "part":
        return None, ""
    part = state.family.part(check.target_id)
    unit = KIND_VALUE_UNITS.get(part.kind)
    typical = ""
    if unit and part.value is not None:
        typical = format_quantity(value_of(part, state.model.ratings, state.family.design), unit)
    return part, part_words(part, typical)


def photo_for_point(store: Store, model: str, family_id: str, point_ids: tuple[str, ...]
                    ) -> tuple[KeptPhoto, str] | None:
    """The first photo of the model's board with one of these test points marked, and the point."""
    return photo_around(board_photos(store, model, family_id), point_ids)
