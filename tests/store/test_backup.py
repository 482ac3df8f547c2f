"""Backups: online copies proven readable before they count, rolling without ever losing the last
good one, and damaged or foreign files never overwritten."""

from __future__ import annotations

import os
import shutil
import sqlite3

import pytest
from sqlalchemy import func, select

from fixbench.cli import main
from fixbench.store import StoreFileError, open_store
from fixbench.store.backup import backup_database, backup_if_due, backup_server
from fixbench.store.amendments import delete_case
from fixbench.store.digest import content_digest
from fixbench.store.health import newest_good_backup, prove
from fixbench.store.location import backup_anchor, backup_kind, list_backups, newest_backup
from fixbench.store.models import Case
from fixbench.store.owner import set_owner_passphrase
from fixbench.store.people import add_device, add_technician
from tests.store.conftest import RATINGS, START, record_case

OWNER = "owner-passphrase-1"


def _shop(path, cases=3):
    store = open_store(path)
    tech = add_technician(store, "Nell")
    device = add_device(store, make="Pellamor", model="PM-20", kind="laptop adapter",
                        label_ratings=RATINGS)
    for i in range(cases):
        record_case(store, tech, device, ticket=f"B-{i}", opened=START)
    return store


@pytest.fixture(scope="module")
def filled_shop(tmp_path_factory):
    """A closed single-file shop of 60 cases, built once and copied by the tests that damage one."""
    path = tmp_path_factory.mktemp("filled") / "shop.sqlite"
    _shop(path, cases=60).close()
    return path


def _copy_of(filled_shop, tmp_path):
    path = tmp_path / "shop.sqlite"
    shutil.copyfile(filled_shop, path)
    return path


def _count(path) -> int:
    store = open_store(path)
    with store.session() as session:
        n = session.scalar(select(func.count()).select_from(Case))
    store.close()
    return n


def _damage_one_page(path, page=None):
    """Overwrite one page inside the file (not the header page) with bytes SQLite cannot read."""
    connection = sqlite3.connect(path)
    connection.execute("PRAGMA wal_checkpoint(TRUNCATE)")
    page_size = connection.execute("PRAGMA page_size").fetchone()[0]
    pages = connection.execute("PRAGMA page_count").fetchone()[0]
    connection.close()
    page = page or pages // 2
    with open(path, "r+b") as handle:
        handle.seek((page - 1) * page_size)
        handle.write(b"\xab" * page_size)


def test_backup_while_open_holds_every_committed_case(tmp_path):
    path = tmp_path / "shop.sqlite"
    store = _shop(path)  # left open: its WAL file still holds the commits
    assert (tmp_path / "shop.sqlite-wal").exists()
    made = backup_database(path)
    store.close()
    assert made.path.parent == tmp_path / "shop-backups"
    assert made.good and made.cases == 3 and _count(made.path) == 3


def test_rolling_backups_keep_only_the_newest(tmp_path):
    path = tmp_path / "shop.sqlite"
    _shop(path, cases=1).close()
    made = [backup_database(path, keep=3).path for _ in range(5)]
    assert list_backups(path) == made[-3:]
    assert newest_backup(path) == made[-1]


def test_damage_inside_a_page_makes_no_backup_and_prunes_none_of_the_good_ones(filled_shop, tmp_path, capsys):
    # The reproduction: three healthy backups, one page of the shop overwritten, then
    # `fixbench backup --keep 3` three times. Each run copied the damage and pruned a healthy
    # backup, until none was left.
    path = _copy_of(filled_shop, tmp_path)
    healthy = [backup_database(path, keep=3).path for _ in range(3)]
    _damage_one_page(path)
    for _ in range(3):
        assert main(["--db", str(path), "backup", "--keep", "3"]) == 2
        err = capsys.readouterr().err
        assert "is damaged" in err and "no backup was made" in err and len(err.strip().splitlines()) == 1
        assert f"fixbench restore {healthy[-1]}" in err
    assert list_backups(path) == healthy
    assert all(prove(b, thorough=True).good for b in healthy)


def test_the_daily_backup_follows_the_same_rule(filled_shop, tmp_path):
    path = _copy_of(filled_shop, tmp_path)
    first = backup_if_due(path)
    day_old = first.path.stat().st_mtime - 25 * 3600
    os.utime(first.path, (day_old, day_old))
    _damage_one_page(path)
    with pytest.raises(StoreFileError, match="no backup was made") as err:
        backup_if_due(path)
    assert err.value.newest_backup == first.path
    assert list_backups(path) == [first.path]


def test_the_start_up_message_recommends_a_good_backup_only(filled_shop, tmp_path):
    # Backups made before they were proven may hold damage; the message used to name the newest
    # file in the folder, which restore then refused.
    path = _copy_of(filled_shop, tmp_path)
    good = backup_database(path).path
    unproven = backup_database(path).path
    _damage_one_page(unproven)
    path.write_bytes(os.urandom(8192))
    with pytest.raises(StoreFileError) as err:
        open_store(path)
    assert err.value.newest_backup == good and str(unproven) not in str(err.value)
    assert newest_good_backup(path) == good


@pytest.mark.parametrize("damage", ["truncate", "random"])
def test_damaged_file_gets_a_clear_message_with_newest_backup_and_is_untouched(tmp_path, damage):
    path = tmp_path / "shop.sqlite"
    _shop(path, cases=40).close()
    backup = backup_database(path).path
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


def _empty_the_shop(store):
    set_owner_passphrase(store, OWNER)
    with store.session() as session:
        ids = list(session.scalars(select(Case.id)))
    for case_id in ids:
        delete_case(store, case_id, passphrase=OWNER)


def test_a_copy_whose_cases_collapsed_is_kept_but_never_lets_the_last_good_one_go(tmp_path):
    path = tmp_path / "shop.sqlite"
    store = _shop(path, cases=10)
    good = backup_database(path, keep=1)
    _empty_the_shop(store)
    store.close()
    emptied = [backup_database(path, keep=1) for _ in range(3)]
    assert not any(e.good for e in emptied)
    assert all(backup_kind(e.path) == "fewer-cases" for e in emptied)
    assert "0 cases, under half of the 10" in emptied[-1].note()
    assert list_backups(path) == [good.path, emptied[-1].path]  # --keep 1, and the good one
    assert newest_good_backup(path) == good.path


def test_the_owner_confirms_a_smaller_shop_and_the_old_good_one_rolls_away(tmp_path):
    path = tmp_path / "shop.sqlite"
    store = _shop(path, cases=10)
    good = backup_database(path, keep=1)
    _empty_the_shop(store)
    store.close()
    confirmed = backup_database(path, keep=1, accept_fewer=True)
    assert confirmed.good and backup_kind(confirmed.path) == ""
    assert list_backups(path) == [confirmed.path] and good.path not in list_backups(path)


def test_backup_at_start_is_made_when_due_and_skipped_when_recent(tmp_path):
    path = tmp_path / "shop.sqlite"
    _shop(path, cases=1).close()
    first = backup_if_due(path)
    assert first is not None and list_backups(path) == [first.path]
    assert backup_if_due(path) is None  # one a day is enough
    day_old = first.path.stat().st_mtime - 25 * 3600
    os.utime(first.path, (day_old, day_old))
    second = backup_if_due(path)
    assert second is not None and list_backups(path) == [first.path, second.path]
    assert _count(second.path) == 1


def test_backup_at_start_does_nothing_for_a_server_or_a_new_shop(tmp_path):
    assert backup_if_due(None) is None
    assert backup_if_due(tmp_path / "not-yet.sqlite") is None
    assert not (tmp_path / "not-yet-backups").exists()


@pytest.mark.postgres
def test_a_server_shop_backs_up_into_one_sqlite_file_holding_every_record(pg_database_url, tmp_path,
                                                                          monkeypatch):
    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path / "data"))
    store = _shop(pg_database_url, cases=5)
    try:
        made = backup_server(store)
        expected = content_digest(store)
    finally:
        store.close()
    assert made.good and made.cases == 5
    assert made.path.parent.parent.name == "server-backups"
    assert sorted(p.name for p in made.path.parent.iterdir()) == [made.path.name]  # no WAL, no partial
    assert prove(made.path, thorough=True).good
    copy = open_store(made.path)
    try:
        assert content_digest(copy) == expected
    finally:
        copy.close()
    assert newest_good_backup(backup_anchor(pg_database_url)) == made.path


@pytest.mark.postgres
def test_a_server_shop_emptied_keeps_its_last_good_backup(pg_database_url, tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path / "data"))
    store = _shop(pg_database_url, cases=6)
    try:
        good = backup_server(store, keep=1)
        _empty_the_shop(store)
        emptied = backup_server(store, keep=1)
    finally:
        store.close()
    assert good.good and not emptied.good
    assert list_backups(backup_anchor(pg_database_url)) == [good.path, emptied.path]
