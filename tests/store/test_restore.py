"""Restoring a backup: the owner's decision, a file proven to be a fixbench shop, the counts before
and after, a safety copy that is never taken for the next restore, and other benches that neither
lose a write to the restore nor have the shop pulled from under them."""

from __future__ import annotations

import re
import sqlite3
import threading
import time

import pytest
from sqlalchemy import func, select, text

from fixbench.store import OwnerRequired, StoreInputError, open_store
from fixbench.store.backup import backup_database, backup_server
from fixbench.store.digest import content_digest
from fixbench.store.errors import NewerSchema, ShopInUse
from fixbench.store.location import backup_kind
from fixbench.store.migrate import upgrade
from fixbench.store.models import Case
from fixbench.store.owner import set_owner_passphrase
from fixbench.store.people import add_device, add_technician
from fixbench.store.restore import newest_restorable, plan_restore, restore
from tests.store.conftest import RATINGS, START, record_case

OWNER = "owner-passphrase-1"


def _shop(url, cases=3, passphrase=OWNER, ticket="R"):
    store = open_store(url)
    if passphrase:
        set_owner_passphrase(store, passphrase)
    tech = add_technician(store, "Nell")
    device = add_device(store, make="Pellamor", model="PM-20", kind="laptop adapter",
                        label_ratings=RATINGS)
    for i in range(cases):
        record_case(store, tech, device, ticket=f"{ticket}-{i}", opened=START)
    return store, tech, device


def _count(url) -> int:
    store = open_store(url)
    try:
        with store.reading() as session:
            return session.scalar(select(func.count()).select_from(Case))
    finally:
        store.close()


def _add_cases(url, n, ticket):
    store = open_store(url)
    try:
        for i in range(n):
            record_case(store, 1, 1, ticket=f"{ticket}-{i}", opened=START)
    finally:
        store.close()


def test_restore_says_the_counts_puts_the_backup_back_and_keeps_what_was_there(tmp_path):
    path = tmp_path / "shop.sqlite"
    store, *_ = _shop(path, cases=2)
    store.close()
    backup = backup_database(path).path
    _add_cases(path, 1, "after-backup")
    plan = plan_restore(str(path), backup)
    assert (plan.cases_now, plan.cases_after, plan.needs_passphrase) == (3, 2, True)
    assert not plan.others_open
    done = restore(plan, OWNER)
    assert _count(path) == 2
    assert backup_kind(done.previous_backup) == "before-restore" and _count(done.previous_backup) == 3
    assert backup_kind(done.after_backup) == "" and _count(done.after_backup) == 2


def test_restore_without_the_owners_passphrase_changes_nothing(tmp_path):
    path = tmp_path / "shop.sqlite"
    store, *_ = _shop(path, cases=2)
    store.close()
    backup = backup_database(path).path
    _add_cases(path, 1, "kept")
    for guess in (None, "", "not-the-owner"):
        with pytest.raises(OwnerRequired):
            restore(plan_restore(str(path), backup), guess)
    assert _count(path) == 3


def test_a_shop_with_no_owner_passphrase_cannot_be_replaced(tmp_path):
    path = tmp_path / "shop.sqlite"
    store, *_ = _shop(path, cases=2, passphrase=None)
    store.close()
    backup = backup_database(path).path
    with pytest.raises(OwnerRequired, match="must set one first"):
        restore(plan_restore(str(path), backup), "anything-at-all")
    assert _count(path) == 2


def _no_tables(path):
    sqlite3.connect(path).close()
    path.write_bytes(b"")  # SQLite leaves a new file empty until a table is made
    with sqlite3.connect(path) as connection:
        connection.execute("PRAGMA user_version=1")


def _other_schema(path):
    with sqlite3.connect(path) as connection:
        connection.execute("CREATE TABLE soup (name TEXT)")


@pytest.mark.parametrize("make, refusal", [
    (lambda p: p.write_bytes(b""), "is empty (0 bytes), not a fixbench shop"),
    (_no_tables, "holds no tables, not a fixbench shop"),
    (_other_schema, "another program's SQLite file"),
    (lambda p: p.write_bytes(b"SQLite format 3\x00" + b"\x00" * 200), "is damaged"),
])
def test_a_file_that_is_not_a_fixbench_shop_is_refused_and_the_shop_kept(tmp_path, make, refusal):
    # `restore empty.sqlite && backup --keep 1` used to leave no case anywhere.
    path = tmp_path / "shop.sqlite"
    store, *_ = _shop(path, cases=2)
    store.close()
    other = tmp_path / "other.sqlite"
    make(other)
    with pytest.raises(StoreInputError, match=re.escape(refusal)):
        plan_restore(str(path), other)
    assert _count(path) == 2


def test_a_backup_from_a_newer_fixbench_is_refused(tmp_path):
    path = tmp_path / "shop.sqlite"
    store, *_ = _shop(path, cases=1)
    store.close()
    newer = backup_database(path).path
    with sqlite3.connect(newer) as connection:
        connection.execute("UPDATE alembic_version SET version_num = '0099'")
    with pytest.raises(NewerSchema, match="newer fixbench"):
        plan_restore(str(path), newer)


def test_a_backup_of_an_older_schema_is_brought_up_to_date_on_a_copy(tmp_path):
    path = tmp_path / "shop.sqlite"
    store, *_ = _shop(path, cases=2)
    store.close()
    old = tmp_path / "old.sqlite"
    store = open_store(old, migrate=False)
    upgrade(store, "0001")
    with store.engine.begin() as connection:
        connection.execute(text("INSERT INTO technicians (id, name, role, active) VALUES (1, 'Old', 'technician', 1)"))
    store.close()
    before = old.read_bytes()
    done = restore(plan_restore(str(path), old), OWNER)
    assert old.read_bytes() == before  # the backup itself is never migrated
    assert _count(path) == 0 and done.previous_backup is not None


def test_running_restore_twice_does_not_undo_the_first(tmp_path):
    path = tmp_path / "shop.sqlite"
    store, *_ = _shop(path, cases=2)
    store.close()
    first = backup_database(path).path
    _add_cases(path, 3, "later")
    assert newest_restorable(str(path)) == first
    restore(plan_restore(str(path), newest_restorable(str(path))), OWNER)
    assert _count(path) == 2
    # The safety copy (5 cases) is newer, but restore takes the newest good backup.
    again = newest_restorable(str(path))
    assert backup_kind(again) == "" and _count(again) == 2
    restore(plan_restore(str(path), again), OWNER)
    assert _count(path) == 2


def test_restore_over_a_damaged_file_sets_it_aside_instead_of_overwriting(tmp_path):
    path = tmp_path / "shop.sqlite"
    store, *_ = _shop(path, cases=2)
    store.close()
    backup = backup_database(path).path
    path.write_bytes(b"not a database at all" * 100)
    plan = plan_restore(str(path), backup)
    assert plan.cases_now is None and "not a fixbench database" in plan.problem_now
    with pytest.raises(OwnerRequired):
        restore(plan, "wrong")  # the backup has a passphrase: it is asked
    done = restore(plan, OWNER)
    assert done.set_aside.read_bytes() == b"not a database at all" * 100
    assert _count(path) == 2


def test_restore_into_a_missing_shop_needs_no_passphrase_when_the_backup_has_none(tmp_path):
    path = tmp_path / "shop.sqlite"
    store, *_ = _shop(path, cases=2, passphrase=None)
    store.close()
    backup = backup_database(path).path
    path.unlink()
    plan = plan_restore(str(path), backup)
    assert not plan.needs_passphrase
    restore(plan, None)
    assert _count(path) == 2


def test_restore_waits_for_a_bench_mid_write_and_loses_none_of_its_writes(tmp_path):
    # Restore while another bench wrote used to succeed silently between that bench's writes.
    path = tmp_path / "shop.sqlite"
    store, tech, device = _shop(path, cases=2)
    backup = backup_database(path).path
    plan = plan_restore(str(path), backup)
    assert plan.others_open  # `store` is the other bench: told before the owner is asked
    bench = sqlite3.connect(path, isolation_level=None)
    bench.execute("BEGIN IMMEDIATE")  # a bench in the middle of writing a reading
    bench.execute("UPDATE cases SET notes = 'written mid-restore' WHERE ticket_ref = 'R-0'")
    told = []
    finished = threading.Event()

    def run():
        try:
            told.append(restore(plan, OWNER, on_wait=told.append))
        finally:
            finished.set()

    worker = threading.Thread(target=run)
    worker.start()
    deadline = time.monotonic() + 10
    while not told and time.monotonic() < deadline:
        time.sleep(0.05)
    assert told and "another bench is writing" in told[0]
    assert not finished.is_set()
    bench.execute("COMMIT")
    bench.close()
    worker.join(timeout=60)
    done = told[-1]
    assert done.waited
    # The bench's write is in the safety copy taken under the restore's lock, not lost between.
    kept = sqlite3.connect(done.previous_backup)
    assert kept.execute("SELECT notes FROM cases WHERE ticket_ref = 'R-0'").fetchone() == ("written mid-restore",)
    kept.close()
    # The bench that stayed open sees the restored shop and writes to it.
    record_case(store, tech, device, ticket="after-restore", opened=START)
    store.close()
    assert _count(path) == 3


@pytest.mark.postgres
def test_a_server_shop_is_restored_from_its_backup_as_it_was(pg_database_url, tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path / "data"))
    store, *_ = _shop(pg_database_url, cases=3)
    backup = backup_server(store).path
    expected = content_digest(store)
    record_case(store, 1, 1, ticket="after-backup", opened=START)
    store.close()
    plan = plan_restore(pg_database_url, backup)
    assert (plan.cases_now, plan.cases_after) == (4, 3)
    with pytest.raises(OwnerRequired):
        restore(plan, "not-the-owner")
    done = restore(plan, OWNER)
    store = open_store(pg_database_url)
    try:
        assert content_digest(store) == expected
        record_case(store, 1, 1, ticket="new-after-restore", opened=START)  # ids follow the restored ones
    finally:
        store.close()
    assert _count(done.previous_backup) == 4 and _count(done.after_backup) == 3


@pytest.mark.postgres
def test_a_server_shop_is_not_restored_while_another_bench_is_connected(pg_database_url, tmp_path,
                                                                         monkeypatch):
    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path / "data"))
    store, *_ = _shop(pg_database_url, cases=2)
    backup = backup_server(store).path
    record_case(store, 1, 1, ticket="other-bench", opened=START)
    store.close()
    other_bench = open_store(pg_database_url)
    with other_bench.engine.connect():
        with pytest.raises(ShopInUse, match="1 other session is connected"):
            restore(plan_restore(pg_database_url, backup), OWNER)
    other_bench.close()
    assert _count(pg_database_url) == 3
