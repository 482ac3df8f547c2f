"""Putting a backup back in place of the shop: the owner's decision, and one that can be undone.

- The backup must be proven a fixbench shop (``PRAGMA integrity_check``, its tables, a schema this
  fixbench knows): an empty file, a file with no tables, another program's database or one from a
  newer fixbench is refused. An older one is migrated on a staged copy, never in place.
- A readable shop is replaced only with its owner's passphrase. Where the shop is missing or damaged
  (a damaged file is moved aside and kept) nothing is lost, and the backup's own passphrase is asked
  if it has one.
- The plan says how many cases the shop has now and will have after.
- The shop as it was is kept as a ``before-restore`` backup first, and the restored shop is backed
  up after as a good backup: ``restore`` without a file takes the newest good backup, never the
  safety copy, so running it twice does not undo the first.
- Other benches: on SQLite the restore holds the write lock from the safety copy to the last row, so
  no bench's write falls between them or is lost half-way (their writes queue; the caller is told
  when one was writing). Benches that stay open see the restored records. On a server the restore is
  refused while any other session is connected, and the tables are locked while it copies.
"""

from __future__ import annotations

import os
import sqlite3
from collections.abc import Callable
from dataclasses import dataclass
from datetime import UTC, datetime
from pathlib import Path

from sqlalchemy import func, select, text

from fixbench.store.backup import BUSY_TIMEOUT_S, backup_database, backup_server, copy_database
from fixbench.store.database import open_store
from fixbench.store.errors import ShopInUse, StoreError, StoreFileError, StoreInputError
from fixbench.store.health import check_sqlite_file, newest_good_backup, prove, refuse_newer
from fixbench.store.location import (backup_anchor, backup_folder, file_status, make_private_folder,
                                     resolve_url, sqlite_path)
from fixbench.store.models import Case
from fixbench.store.owner import has_owner_passphrase, require_owner
from fixbench.store.shop_copy import clear_rows, copy_rows, reset_sequences, shop_tables


@dataclass(frozen=True)
class RestorePlan:
    url: str
    source: Path
    cases_after: int
    cases_now: int | None  # None: no readable shop there now
    problem_now: str | None  # why there is none ("is damaged (...)", "does not exist yet")
    needs_passphrase: bool
    others_open: bool = False  # another bench has the SQLite shop open (see _open_elsewhere)


@dataclass(frozen=True)
class Restored:
    plan: RestorePlan
    previous_backup: Path | None  # the shop as it was (kind before-restore)
    set_aside: Path | None  # a damaged file moved out of the way, kept
    after_backup: Path | None  # the restored shop, as a good backup
    waited: bool  # another bench was writing; the restore waited for its write to end


def newest_restorable(url: str) -> Path | None:
    """The newest good backup of the shop at ``url`` (never a before-restore safety copy)."""
    return newest_good_backup(backup_anchor(resolve_url(url)))


def plan_restore(url: str, source: Path) -> RestorePlan:
    """Check ``source`` and the shop at ``url`` (a URL or a SQLite file); nothing is changed."""
    url = resolve_url(url)
    proof = prove(source, thorough=True)
    if not proof.good:
        raise StoreInputError(f"{source} {proof.problem}; nothing was restored")
    refuse_newer(str(source), proof.revision)
    path = sqlite_path(url)
    if path is not None and file_status(path) is not None and source.resolve() == path.resolve():
        raise StoreInputError(f"{source} is the shop's database itself; name a backup of it")
    cases_now, problem = _current(url, path)
    needs = cases_now is not None or _has_passphrase(source)
    others = path is not None and cases_now is not None and _open_elsewhere(path)
    return RestorePlan(url, source, proof.cases, cases_now, problem, needs, others)


def restore(plan: RestorePlan, passphrase: str | None,
            on_wait: Callable[[str], None] | None = None) -> Restored:
    """Carry out ``plan`` (see the module's docstring); the owner's passphrase is checked first."""
    anchor = backup_anchor(plan.url)
    path = sqlite_path(plan.url)
    staged = _stage(anchor, plan.source)
    try:
        _require_owner(plan, staged, passphrase)
        if path is None:
            previous, set_aside, waited = _onto_server(plan.url, staged), None, False
        elif plan.cases_now is None:
            previous, set_aside, waited = None, _replace_file(path, staged), False
        else:
            previous, waited = _onto_sqlite(path, staged, on_wait)
            set_aside = None
    finally:
        _remove(staged)
    if path is None:
        store = open_store(plan.url)
        try:
            after = backup_server(store, accept_fewer=True).path
        finally:
            store.close()
    else:
        after = backup_database(path, accept_fewer=True).path
    return Restored(plan, previous, set_aside, after, waited)


def _current(url: str, path: Path | None) -> tuple[int | None, str | None]:
    if path is not None:
        status = file_status(path)
        if status is None or status.st_size == 0:
            return None, "does not exist yet"
        try:
            check_sqlite_file(path)
        except StoreFileError as err:
            return None, err.problem
    store = open_store(url, create=False)
    try:
        with store.reading() as session:
            return session.scalar(select(func.count()).select_from(Case)), None
    finally:
        store.close()


def _open_elsewhere(database: Path) -> bool:
    """Whether another connection has the SQLite shop open. A WAL database leaves WAL only when no
    other connection has it open (each holds a shared lock while open; sqlite.org/wal.html,
    "Persistence of WAL mode" and the locking it describes), so leaving WAL without waiting fails
    exactly then; when it succeeds the shop is put straight back in WAL, its records unchanged."""
    connection = sqlite3.connect(database, timeout=0, isolation_level=None)
    try:
        if connection.execute("PRAGMA journal_mode").fetchone()[0] != "wal":
            return False
        left = connection.execute("PRAGMA journal_mode=DELETE").fetchone()[0]
        if left == "wal":
            return True  # SQLite kept WAL: it could not have the file to itself
        connection.execute("PRAGMA journal_mode=WAL")
        return False
    except sqlite3.OperationalError as err:
        if "locked" in str(err) or "busy" in str(err):
            return True
        raise
    finally:
        connection.close()


def _has_passphrase(source: Path) -> bool:
    connection = sqlite3.connect(f"{source.resolve().as_uri()}?mode=ro", uri=True)
    try:
        return connection.execute("SELECT count(*) FROM owner_secret").fetchone()[0] > 0
    except sqlite3.DatabaseError:
        return False  # a schema from before the owner's passphrase
    finally:
        connection.close()


def _require_owner(plan: RestorePlan, staged: Path, passphrase: str | None) -> None:
    if not plan.needs_passphrase:
        return
    store = open_store(plan.url if plan.cases_now is not None else staged, create=False)
    try:
        if plan.cases_now is None and not has_owner_passphrase(store):
            return
        require_owner(store, passphrase)
    finally:
        store.close()


def _stage(anchor: Path, source: Path) -> Path:
    """A private copy of ``source`` beside the backups, migrated to this fixbench's schema."""
    folder = backup_folder(anchor)
    make_private_folder(folder)
    staged = folder / f".restoring-{datetime.now(UTC).strftime('%Y%m%d-%H%M%S-%f')}.sqlite"
    copy_database(source, staged)
    open_store(staged, create=False).close()
    return staged


def _replace_file(database: Path, staged: Path) -> Path | None:
    """No readable shop there: move a damaged file aside (kept) and put the backup in its place."""
    set_aside = None
    if database.exists() and database.stat().st_size > 0:
        set_aside = _move_aside(database)
    make_private_folder(database.parent)
    copy_database(staged, database)
    return set_aside


def _onto_sqlite(database: Path, staged: Path, on_wait) -> tuple[Path, bool]:
    """Replace every record of a live SQLite shop in one write transaction: the safety copy is
    taken under the same lock, so no bench's write falls between the two."""
    raw = sqlite3.connect(database, timeout=0, isolation_level=None)
    try:
        # Foreign keys off (outside a transaction, or SQLite ignores it) and checked at the end,
        # as the migrations do: rows go table by table.
        raw.execute("PRAGMA foreign_keys=OFF")
        raw.execute("ATTACH DATABASE ? AS restoring", (str(staged),))
        waited = _begin_immediate(raw, on_wait)
        try:
            previous = backup_database(database, kind="before-restore").path
            for table in reversed(shop_tables()):
                raw.execute(f'DELETE FROM main."{table.name}"')
            for table in shop_tables():
                columns = ", ".join(f'"{c.name}"' for c in table.columns)
                raw.execute(f'INSERT INTO main."{table.name}" ({columns}) '
                            f'SELECT {columns} FROM restoring."{table.name}"')
            orphans = raw.execute("PRAGMA main.foreign_key_check").fetchall()
            if orphans:
                raise StoreError(f"the backup's records do not hold together ({len(orphans)} rows "
                                 f"refer to rows it lacks, e.g. {orphans[0]}); nothing was restored")
            raw.execute("COMMIT")
        except BaseException:
            raw.execute("ROLLBACK")
            raise
        raw.execute("DETACH DATABASE restoring")
    finally:
        raw.close()
    return previous, waited


def _begin_immediate(raw: sqlite3.Connection, on_wait) -> bool:
    try:
        raw.execute("BEGIN IMMEDIATE")
        return False
    except sqlite3.OperationalError as err:
        if "locked" not in str(err) and "busy" not in str(err):
            raise
    if on_wait is not None:
        on_wait(f"another bench is writing to this shop; waiting up to {BUSY_TIMEOUT_S:g} s for "
                "its write to end (its next writes wait for the restore)")
    raw.execute(f"PRAGMA busy_timeout={int(BUSY_TIMEOUT_S * 1000)}")
    try:
        raw.execute("BEGIN IMMEDIATE")
    except sqlite3.OperationalError as err:
        raise ShopInUse(f"another bench kept writing to this shop for {BUSY_TIMEOUT_S:g} s; nothing "
                        "was restored. Close fixbench on the other benches and try again") from err
    return True


def _onto_server(url: str, staged: Path) -> Path:
    """Replace every record of a server shop, refused while another session is connected."""
    store = open_store(url, create=False)
    source = open_store(staged, create=False)
    try:
        store.engine.dispose()  # this process's own idle connections are not other benches
        with store.engine.connect() as connection, connection.begin():
            _refuse_others(connection)
            connection.execute(text("SET LOCAL lock_timeout = '30s'"))
            for table in shop_tables():
                connection.execute(text(f'LOCK TABLE "{table.name}" IN ACCESS EXCLUSIVE MODE'))
            _refuse_others(connection)  # anyone who connected meanwhile
            previous = backup_server(store, kind="before-restore", source=connection).path
            clear_rows(connection)
            with source.read_connection() as rows:
                copy_rows(rows, connection)
            reset_sequences(connection)
    finally:
        source.close()
        store.close()
    return previous


def _refuse_others(connection) -> None:
    count, hosts = connection.execute(text(
        "SELECT count(*), string_agg(DISTINCT coalesce(host(client_addr), 'this machine'), ', ') "
        "FROM pg_stat_activity WHERE datname = current_database() AND pid <> pg_backend_pid() "
        "AND backend_type = 'client backend'")).one()
    if count:
        raise ShopInUse(f"{count} other session{'s are' if count > 1 else ' is'} connected to this "
                        f"shop (from {hosts}); nothing was restored. Close fixbench on the other "
                        "benches, then restore")


def _move_aside(database: Path) -> Path:
    stamp = datetime.now(UTC).strftime("%Y%m%d-%H%M%S")
    aside = database.with_name(f"{database.name}.set-aside-{stamp}")
    os.replace(database, aside)
    for extra in ("-wal", "-shm"):
        companion = database.with_name(database.name + extra)
        if companion.exists():
            os.replace(companion, aside.with_name(aside.name + extra))
    return aside


def _remove(database: Path) -> None:
    for extra in ("", "-wal", "-shm", "-journal"):
        database.with_name(database.name + extra).unlink(missing_ok=True)
