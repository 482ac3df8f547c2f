"""The shop's board profiles: found again by the model typed any way, refused across families,
replaced whole by an import, photos kept with a checksum; and revision 0008 on a shop of 0007."""

from __future__ import annotations

import pytest
from sqlalchemy import text

from fixbench.store import StoreInputError, open_store
from fixbench.store import board_profiles as kept
from fixbench.store.board_profiles import KeptPart
from fixbench.store.migrate import current_revision, head_revision, upgrade


def test_a_part_kept_for_a_model_is_found_by_the_model_typed_any_way(store):
    kept.save_part(store, "QX-5  rev B", "primary_side", KeptPart("R1", "R3 + R4", "2 x 2.2 Mohm"))
    kept.save_part(store, "qx-5 REV b", "primary_side", KeptPart("C1", "C5", " 10 uF ", "400 V"))
    profile = kept.profile_for_model(store, " Qx-5 rev b")
    assert profile.model == "QX-5 rev B" and profile.family_id == "primary_side"
    assert profile.parts == (KeptPart("C1", "C5", "10 uF", "400 V"), KeptPart("R1", "R3 + R4", "2 x 2.2 Mohm"))
    # All fields blank: the part is forgotten.
    profile = kept.save_part(store, "QX-5 rev B", "primary_side", KeptPart("C1"))
    assert [p.part_id for p in profile.parts] == ["R1"]
    assert kept.all_profiles(store) == [("QX-5 rev B", "primary_side", 1)]
    assert kept.profile_for_model(store, "QX-6") is None and kept.profile_for_model(store, "  ") is None


def test_a_model_keeps_one_family_unless_a_whole_profile_replaces_it(store):
    kept.save_part(store, "QX-5", "primary_side", KeptPart("R1", "R3"))
    with pytest.raises(StoreInputError, match="names parts of the family 'primary_side'"):
        kept.save_part(store, "QX-5", "pwm_flyback", KeptPart("R1", "R9"))
    photo_id = kept.add_photo(store, "QX-5", "primary_side", b"image bytes")
    profile = kept.replace_profile(store, "QX-5", "pwm_flyback", [KeptPart("C3", "C12", "680 uF")])
    assert profile.family_id == "pwm_flyback" and profile.parts == (KeptPart("C3", "C12", "680 uF"),)
    assert profile.photo_ids == (photo_id,)  # photos stay with the model's board
    with pytest.raises(StoreInputError, match="type the model first"):
        kept.save_part(store, " ", "primary_side", KeptPart("R1", "R3"))
    with pytest.raises(StoreInputError, match="NUL"):
        kept.save_part(store, "QX-5", "pwm_flyback", KeptPart("R1", "R3\x00"))


def test_a_photo_is_kept_whole_and_a_damaged_one_is_an_error(store):
    image = bytes(range(256)) * 40
    photo_id = kept.add_photo(store, "QX-5", "primary_side", image, "solder side")
    kept.mark_point(store, photo_id, "bulk_plus", 0.5, 0.25)
    photo = kept.photo(store, photo_id)
    assert photo.image == image and photo.marks == {"bulk_plus": (0.5, 0.25)} and photo.title == "solder side"
    with store.engine.begin() as connection:
        connection.execute(text("UPDATE board_photos SET image = :b WHERE id = :i"),
                           {"b": b"changed", "i": photo_id})
    with pytest.raises(StoreInputError, match="damaged"):
        kept.photo(store, photo_id)
    with pytest.raises(StoreInputError, match="1 byte to"):
        kept.add_photo(store, "QX-5", "primary_side", b"")


def test_revision_0008_adds_the_profile_tables_to_a_shop_of_0007(store_url):
    store = open_store(store_url, migrate=False)
    upgrade(store, "0007")
    with store.engine.begin() as connection:
        connection.execute(text("INSERT INTO devices (id, make, model, kind, label_ratings) "
                                "VALUES (1, 'Quillon', 'QX-5', 'phone charger', '{}')"))
    upgrade(store, "head")
    with store.engine.connect() as connection:
        assert current_revision(connection) == head_revision()
        assert connection.execute(text("SELECT count(*) FROM devices")).scalar() == 1
    kept.save_part(store, "QX-5", "primary_side", KeptPart("R1", "R3 + R4", "2 x 2.2 Mohm"))
    assert kept.profile_for_model(store, "QX-5").parts[0].designator == "R3 + R4"
    store.close()
