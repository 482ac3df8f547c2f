"""Backups and restores: online copies, rolling, and damaged or foreign files never overwritten."""

from __future__ import annotations

import os
import sqlite3

import pytest
from sqlalchemy import func, select

from fixbench.store import StoreFileError, open_store
from fixbench.store.backup import (backup_database, backup_if_due, list_backups, newest_backup,
                                   restore_backup)
from fixbench.store.models import Case
from fixbench.store.people import add_device, add_technician
from tests.store.conftest import RATINGS, START, record_case


def _shop(path, cases=3):
    store = open_store(path)
    tech = add_technician(store, "Nell")
    device = add_device(store, make="Pellamor", model="PM-20", kind="laptop adapter",
                        label_ratings=RATINGS)
    for i in range(cases):
        record_case(store, tech, device, ticket=f"B-{i}", opened=START)
    return store


def _count(path) -> int:
    store = open_store(path)
    with store.session() as session:
        n = session.scalar(select(func.count()).select_from(Case))
    store.close()
    return n


def test_backup_while_open_holds_every_committed_case(tmp_path):
    path = tmp_path / "shop.sqlite"
    store = _shop(path)  # left open: its WAL file still holds the commits
    assert (tmp_path / "shop.sqlite-wal").exists()
    copy = backup_database(path)
    store.close()
    assert copy.parent == tmp_path / "shop-backups"
    assert _count(copy) == 3


def test_rolling_backups_keep_only_the_newest(tmp_path):
    path = tmp_path / "shop.sqlite"
    _shop(path, cases=1).close()
    made = [backup_database(path, keep=3) for _ in range(5)]
    assert list_backups(path) == made[-3:]
    assert newest_backup(path) == made[-1]


@pytest.mark.parametrize("damage", ["truncate", "random"])
def test_damaged_file_gets_a_clear_message_with_newest_backup_and_is_untouched(tmp_path, damage):
    path = tmp_path / "shop.sqlite"
    _shop(path, cases=40).close()
    backup = backup_database(path)
    raw = path.read_bytes()
    broken = raw[: len(raw) // 2] if damage == "truncate" else os.urandom(len(raw))
    path.write_bytes(broken)
    with pytest.raises(StoreFileError) as err:
        open_store(path)
    assert "has not been changed" in str(err.value)
    assert str(backup) in str(err.value) and err.value.newest_backup == backup
    assert path.read_bytes() == broken


def test_another_programs_sqlite_file_is_refused_and_left_alone(tmp_path):
    path = tmp_path / "recipes.sqlite"
    with sqlite3.connect(path) as connection:
        connection.execute("CREATE TABLE soup (name TEXT)")
    before = path.read_bytes()
    with pytest.raises(StoreFileError, match="another program's SQLite file"):
        open_store(path)
    assert path.read_bytes() == before


def test_restore_puts_back_the_backup_and_backs_up_the_current_state_first(tmp_path):
    path = tmp_path / "shop.sqlite"
    _shop(path, cases=2).close()
    backup = backup_database(path)
    store = open_store(path)
    record_case(store, 1, 1, ticket="after-backup", opened=START)
    store.close()
    result = restore_backup(backup, path)
    assert _count(path) == 2
    assert result.previous_backup is not None and _count(result.previous_backup) == 3


def test_restore_over_a_damaged_file_sets_it_aside_instead_of_overwriting(tmp_path):
    path = tmp_path / "shop.sqlite"
    _shop(path, cases=2).close()
    backup = backup_database(path)
    path.write_bytes(b"not a database at all" * 100)
    result = restore_backup(backup, path)
    assert result.set_aside is not None
    assert result.set_aside.read_bytes() == b"not a database at all" * 100
    assert _count(path) == 2


def test_restoring_from_a_damaged_backup_is_refused(tmp_path):
    path = tmp_path / "shop.sqlite"
    _shop(path, cases=1).close()
    bad = tmp_path / "bad.sqlite"
    bad.write_bytes(os.urandom(8192))
    with pytest.raises(StoreFileError):
        restore_backup(bad, path)
    assert _count(path) == 1


def test_backup_at_start_is_made_when_due_and_skipped_when_recent(tmp_path):
    path = tmp_path / "shop.sqlite"
    _shop(path, cases=1).close()
    first = backup_if_due(path)
    assert first is not None and list_backups(path) == [first]
    assert backup_if_due(path) is None  # one a day is enough
    day_old = first.stat().st_mtime - 25 * 3600
    os.utime(first, (day_old, day_old))
    second = backup_if_due(path)
    assert second is not None and list_backups(path) == [first, second]
    assert _count(second) == 1


def test_backup_at_start_does_nothing_for_a_server_or_a_new_shop(tmp_path):
    assert backup_if_due(None) is None
    assert backup_if_due(tmp_path / "not-yet.sqlite") is None
    assert not (tmp_path / "not-yet-backups").exists()
