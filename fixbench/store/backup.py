"""Rolling backups of a SQLite shop database, and restoring one, with SQLite's online backup API.

A plain file copy while a WAL file exists can miss committed pages that are still only in the WAL,
so every copy here goes through ``sqlite3.Connection.backup`` (SQLite "Online Backup API",
sqlite.org/backup.html), which reads a consistent snapshot while benches keep working. Backups are
single files (journal mode DELETE) named with their UTC time, newest kept, oldest pruned.

Restoring never overwrites a file it cannot read as a healthy fixbench database: such a file is
moved aside under a new name, and a healthy one is itself backed up first, so a restore can be
undone.
"""

from __future__ import annotations

import os
import sqlite3
from dataclasses import dataclass
from datetime import UTC, datetime, timedelta
from pathlib import Path

from fixbench.store.errors import StoreError, StoreFileError
from fixbench.store.health import check_sqlite_file
from fixbench.store.location import BACKUP_SUFFIX, backup_folder, list_backups, newest_backup

KEEP_BACKUPS = 14
BUSY_TIMEOUT_S = 30.0


def backup_database(database: Path, keep: int = KEEP_BACKUPS) -> Path:
    """Write a consistent copy of ``database`` beside it and keep only the newest ``keep``."""
    if not database.exists():
        raise StoreError(f"{database} does not exist; there is nothing to back up")
    check_sqlite_file(database)
    folder = backup_folder(database)
    folder.mkdir(parents=True, exist_ok=True)
    stamp = datetime.now(UTC).strftime("%Y%m%d-%H%M%S-%f")
    target = folder / f"{database.stem}-{stamp}{BACKUP_SUFFIX}"
    copy_database(database, target)
    for old in list_backups(database)[:-keep] if keep > 0 else []:
        old.unlink()
    return target


def backup_if_due(database: Path | None, every: timedelta = timedelta(hours=24),
                  keep: int = KEEP_BACKUPS) -> Path | None:
    """The automatic rolling backup: the app calls this once at start, with ``store.path``.

    Writes a backup (see :func:`backup_database`) when the newest backup of ``database`` is older
    than ``every`` or there is none, keeping the newest ``keep``; returns the new backup's path, or
    None when none was due. ``database`` None (a PostgreSQL shop: back it up on the server) or a
    file that does not exist yet does nothing. Safe while benches are writing, since the copy is
    SQLite's online backup; it reads the whole file (about 3 kB per case), so call it off the GUI
    thread. Raises :class:`StoreFileError` for a damaged database rather than backing it up.
    """
    if database is None or not database.exists():
        return None
    newest = newest_backup(database)
    if newest is not None:
        age = datetime.now(UTC).timestamp() - newest.stat().st_mtime
        if age < every.total_seconds():
            return None
    return backup_database(database, keep=keep)


def copy_database(source: Path, target: Path) -> None:
    """Online-backup ``source`` into a new single file ``target`` (journal mode DELETE, no WAL
    beside it), which appears only when complete."""
    partial = target.with_name(target.name + ".partial")
    partial.unlink(missing_ok=True)
    src = sqlite3.connect(source, timeout=BUSY_TIMEOUT_S)
    dst = sqlite3.connect(partial)
    try:
        src.backup(dst)
        dst.execute("PRAGMA journal_mode=DELETE")
    finally:
        dst.close()
        src.close()
    os.replace(partial, target)


@dataclass(frozen=True)
class Restored:
    database: Path
    previous_backup: Path | None  # the healthy database as it was before the restore
    set_aside: Path | None  # a damaged or foreign file moved out of the way, kept


def restore_backup(backup: Path, database: Path) -> Restored:
    """Make ``database`` a copy of ``backup`` without destroying what was there."""
    if not backup.is_file():
        raise StoreError(f"{backup} does not exist")
    check_sqlite_file(backup)
    _require_intact(backup)
    previous, set_aside = None, None
    if database.exists() and database.stat().st_size > 0:
        try:
            check_sqlite_file(database)
        except StoreFileError:
            set_aside = _move_aside(database)
        else:
            previous = backup_database(database)
    database.parent.mkdir(parents=True, exist_ok=True)
    src = sqlite3.connect(backup)
    dst = sqlite3.connect(database, timeout=BUSY_TIMEOUT_S)
    try:
        src.backup(dst)
        dst.execute("PRAGMA journal_mode=WAL")
    finally:
        dst.close()
        src.close()
    return Restored(database=database, previous_backup=previous, set_aside=set_aside)


def _require_intact(path: Path) -> None:
    connection = sqlite3.connect(f"{path.resolve().as_uri()}?mode=ro", uri=True)
    try:
        verdict = connection.execute("PRAGMA integrity_check").fetchone()[0]
    except sqlite3.DatabaseError as err:
        verdict = str(err)
    finally:
        connection.close()
    if verdict != "ok":
        raise StoreFileError(path, f"is damaged ({verdict})", None)


def _move_aside(database: Path) -> Path:
    stamp = datetime.now(UTC).strftime("%Y%m%d-%H%M%S")
    aside = database.with_name(f"{database.name}.set-aside-{stamp}")
    os.replace(database, aside)
    for extra in ("-wal", "-shm"):
        companion = database.with_name(database.name + extra)
        if companion.exists():
            os.replace(companion, aside.with_name(aside.name + extra))
    return aside
