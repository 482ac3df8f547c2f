"""Board profiles kept by the shop: per unit model, the board's designators and markings by the
family's part ids, and photos of the board with the test points marked on them.

A profile is found by its model text, case-folded with spaces collapsed ("QX-5", "qx-5 " are one
model), so the next unit of that model arrives with it. Rows here are plain data; reading a marking
and applying it to a family is the knowledge layer's (:mod:`fixbench.knowledge.board`).
"""

from __future__ import annotations

import hashlib
from dataclasses import dataclass
from datetime import datetime

from sqlalchemy import delete, select

from fixbench.store.cases import utc_now
from fixbench.store.database import Store
from fixbench.store.errors import StoreInputError, checked_text
from fixbench.store.models import BoardPartRow, BoardPhotoMark, BoardPhotoRow, BoardProfileRow

PART_FIELDS = ("designator", "value", "rated", "package")
FIELD_MAX = 200  # characters in one field: a designator list or a marking is far shorter
PHOTO_MAX_BYTES = 8_000_000  # a photo scaled for the screen is a few hundred kilobytes


@dataclass(frozen=True)
class KeptPart:
    part_id: str
    designator: str = ""
    value: str = ""
    rated: str = ""
    package: str = ""


@dataclass(frozen=True)
class KeptProfile:
    id: int
    model: str
    family_id: str
    updated_at: datetime
    parts: tuple[KeptPart, ...]
    photo_ids: tuple[int, ...]


@dataclass(frozen=True)
class KeptPhoto:
    id: int
    title: str
    image: bytes
    marks: dict[str, tuple[float, float]]  # test point id -> (x, y) as fractions of the photo


def model_key(model: str) -> str:
    """How a model's text is matched: case-folded, spaces collapsed."""
    return " ".join(model.split()).casefold()


def profile_for_model(store: Store, model: str) -> KeptProfile | None:
    key = model_key(model)
    if not key:
        return None
    with store.reading() as session:
        row = session.scalar(select(BoardProfileRow).where(BoardProfileRow.model_key == key))
        return None if row is None else _kept(session, row)


def all_profiles(store: Store) -> list[tuple[str, str, int]]:
    """(model, family id, parts known) of every profile, by model."""
    with store.reading() as session:
        rows = session.scalars(select(BoardProfileRow).order_by(BoardProfileRow.model_key)).all()
        return [(r.model, r.family_id, len(_parts(session, r.id))) for r in rows]


def save_part(store: Store, model: str, family_id: str, part: KeptPart) -> KeptProfile:
    """Keep what the board's part is called and marked with (all fields blank: forget the part);
    the model's profile is made on its first part."""
    part = KeptPart(*(_field(getattr(part, name), name) if name != "part_id" else part.part_id
                      for name in ("part_id", *PART_FIELDS)))
    with store.session() as session:
        row = _profile_row(session, model, family_id)
        session.execute(delete(BoardPartRow).where(BoardPartRow.profile_id == row.id,
                                                   BoardPartRow.part_id == part.part_id))
        if any(getattr(part, name) for name in PART_FIELDS):
            session.add(BoardPartRow(profile_id=row.id, part_id=part.part_id,
                                     **{name: getattr(part, name) for name in PART_FIELDS}))
        row.updated_at = utc_now()
        session.flush()
        return _kept(session, row)


def replace_profile(store: Store, model: str, family_id: str, parts: list[KeptPart]) -> KeptProfile:
    """Keep a whole profile (an imported file), in place of what the model had; photos stay."""
    parts = [KeptPart(p.part_id, *(_field(getattr(p, name), name) for name in PART_FIELDS))
             for p in parts]
    with store.session() as session:
        row = _profile_row(session, model, family_id, refamily=True)
        session.execute(delete(BoardPartRow).where(BoardPartRow.profile_id == row.id))
        for part in parts:
            if any(getattr(part, name) for name in PART_FIELDS):
                session.add(BoardPartRow(profile_id=row.id, part_id=part.part_id,
                                         **{name: getattr(part, name) for name in PART_FIELDS}))
        row.updated_at = utc_now()
        session.flush()
        return _kept(session, row)


def add_photo(store: Store, model: str, family_id: str, image: bytes, title: str = "") -> int:
    """Keep a photo of the model's board; its id."""
    if not image or len(image) > PHOTO_MAX_BYTES:
        raise StoreInputError(f"a board photo is 1 byte to {PHOTO_MAX_BYTES // 1_000_000} MB")
    with store.session() as session:
        row = _profile_row(session, model, family_id)
        photo = BoardPhotoRow(profile_id=row.id, title=_field(title, "title"), image=bytes(image),
                              sha256=hashlib.sha256(image).hexdigest(), added_at=utc_now())
        session.add(photo)
        session.flush()
        return photo.id


def photo(store: Store, photo_id: int) -> KeptPhoto | None:
    """A photo with its marks; None if it is gone. Its bytes are checked against the checksum
    kept with them, so a damaged photo is an error, not a wrong picture."""
    with store.reading() as session:
        row = session.get(BoardPhotoRow, photo_id)
        if row is None:
            return None
        if hashlib.sha256(row.image).hexdigest() != row.sha256:
            raise StoreInputError(f"board photo {photo_id} is damaged (its checksum does not match)")
        marks = session.scalars(select(BoardPhotoMark).where(BoardPhotoMark.photo_id == photo_id)).all()
        return KeptPhoto(row.id, row.title, bytes(row.image), {m.point_id: (m.x, m.y) for m in marks})


def mark_point(store: Store, photo_id: int, point_id: str, x: float, y: float) -> None:
    """Mark where a test point is on a photo (fractions of its width and height); again moves it."""
    if not (0.0 <= x <= 1.0 and 0.0 <= y <= 1.0):
        raise StoreInputError("a mark lies on the photo: x and y from 0 to 1")
    with store.session() as session:
        if session.get(BoardPhotoRow, photo_id) is None:
            raise StoreInputError(f"no board photo {photo_id}")
        mark = session.get(BoardPhotoMark, (photo_id, point_id))
        if mark is None:
            session.add(BoardPhotoMark(photo_id=photo_id, point_id=point_id, x=x, y=y))
        else:
            mark.x, mark.y = x, y


def _profile_row(session, model: str, family_id: str, refamily: bool = False) -> BoardProfileRow:
    model = " ".join(checked_text(model, "model").split())
    key = model_key(model)
    if not key:
        raise StoreInputError("a board profile belongs to a unit model: type the model first")
    if len(model) > FIELD_MAX:
        raise StoreInputError(f"a model is at most {FIELD_MAX} characters")
    row = session.scalar(select(BoardProfileRow).where(BoardProfileRow.model_key == key))
    if row is None:
        row = BoardProfileRow(model=model, model_key=key, family_id=family_id, updated_at=utc_now())
        session.add(row)
        session.flush()
    elif row.family_id != family_id and refamily:
        row.family_id = family_id
    elif row.family_id != family_id:
        raise StoreInputError(f"the board profile of {row.model} names parts of the family "
                              f"'{row.family_id}', not '{family_id}'")
    return row


def _field(text: str, name: str) -> str:
    text = " ".join(checked_text(text or "", name).split())
    if len(text) > FIELD_MAX:
        raise StoreInputError(f"a part's {name} is at most {FIELD_MAX} characters")
    return text


def _parts(session, profile_id: int) -> list[BoardPartRow]:
    return list(session.scalars(select(BoardPartRow).where(BoardPartRow.profile_id == profile_id)
                                .order_by(BoardPartRow.part_id)).all())


def _kept(session, row: BoardProfileRow) -> KeptProfile:
    parts = tuple(KeptPart(p.part_id, p.designator, p.value, p.rated, p.package)
                  for p in _parts(session, row.id))
    photos = tuple(session.scalars(select(BoardPhotoRow.id).where(BoardPhotoRow.profile_id == row.id)
                                   .order_by(BoardPhotoRow.id)).all())
    return KeptProfile(row.id, row.model, row.family_id, row.updated_at, parts, photos)
