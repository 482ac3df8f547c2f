"""Rolling backups of a shop, each proven readable before it counts.

A SQLite shop is copied with SQLite's online backup API (sqlite.org/backup.html): a plain file copy
while a WAL file exists can miss committed pages still only in the WAL, and the API reads a
consistent snapshot while benches keep working. A shop on a server is copied into a new SQLite file
of the same schema (:mod:`fixbench.store.shop_copy`), so every backup is one file either way.

The online backup copies damaged pages as faithfully as good ones, so a copy is first written under
a temporary name and read through with ``PRAGMA integrity_check`` (:func:`fixbench.store.health.prove`):

- a copy that fails is deleted and the backup refused; the backups already there are untouched;
- a copy holding fewer than half the cases of the newest good backup (a shop emptied by mistake, a
  restore of the wrong file) is kept under the kind ``fewer-cases``: it is not a good backup, and the
  good one before it is never pruned, until the owner confirms the smaller shop (``accept_fewer``);
- otherwise it is a good backup.

Pruning keeps the newest ``keep`` backups and, past them, always the newest good one.
"""

from __future__ import annotations

import os
import sqlite3
import stat
from dataclasses import dataclass
from datetime import UTC, datetime, timedelta
from pathlib import Path

from sqlalchemy import Connection

from fixbench.store.errors import StoreError, StoreFileError
from fixbench.store.health import Proof, check_sqlite_file, good_backups, prove
from fixbench.store.location import (backup_anchor, backup_folder, backup_path, create_private_file,
                                     file_status, list_backups, make_private_folder, newest_backup)

KEEP_BACKUPS = 14
BUSY_TIMEOUT_S = 30.0
# A copy with fewer than this share of the newest good backup's cases has collapsed. Deleting a few
# cases (an amendment, a test case) never comes near; losing the shop does [practice].
COLLAPSE_BELOW = 0.5


@dataclass(frozen=True)
class BackupMade:
    path: Path
    cases: int
    good: bool
    reference: Path | None  # the newest good backup before this one
    reference_cases: int | None
    pruned: tuple[Path, ...] = ()

    def note(self) -> str | None:
        """What the owner should know when the copy does not count as a good backup."""
        if self.good or self.reference is None:
            return None
        return (f"the shop now holds {self.cases} cases, under half of the {self.reference_cases} "
                f"in the good backup {self.reference.name}: this copy is kept but does not count as "
                f"good, and {self.reference.name} will not be pruned. If the shop is meant to be "
                "smaller, the owner confirms it with `fixbench backup --accept-fewer`.")


def backup_database(database: Path, keep: int = KEEP_BACKUPS, *, kind: str = "",
                    accept_fewer: bool = False) -> BackupMade:
    """Back up the SQLite shop ``database`` beside it (see the module's docstring)."""
    status = file_status(database)
    if status is None:
        raise StoreError(f"{database} does not exist; there is nothing to back up")
    if not stat.S_ISREG(status.st_mode):
        raise StoreError(f"{database} is not a database file; there is nothing to back up")
    check_sqlite_file(database)
    stamp, partial = _partial(database, kind)
    try:
        copy_database(database, partial, replace=False)
    except sqlite3.DatabaseError as err:
        _remove(partial)
        raise StoreFileError(database, f"is damaged ({err}); no backup was made and the backups there "
                             "are kept", next(good_backups(database), (None, None))[0]) from err
    return _place(database, partial, stamp, keep, kind, accept_fewer)


def backup_server(store, keep: int = KEEP_BACKUPS, *, kind: str = "", accept_fewer: bool = False,
                  source: Connection | None = None) -> BackupMade:
    """Back up a shop on a server (an open, migrated store) into a SQLite file in the user data
    folder: its records read in one REPEATABLE READ snapshot (or through ``source``, a connection in
    a transaction the caller holds), written into a new file of the same schema."""
    from fixbench.store.database import open_store
    from fixbench.store.shop_copy import copy_rows

    anchor = backup_anchor(store.engine.url.render_as_string(hide_password=False))
    stamp, partial = _partial(anchor, kind)
    target = open_store(partial)  # creates the file owner-only, at this fixbench's schema
    try:
        with target.engine.begin() as written:
            if source is not None:
                copy_rows(source, written)
            else:
                with (store.engine.connect().execution_options(isolation_level="REPEATABLE READ")
                      as snapshot, snapshot.begin()):
                    copy_rows(snapshot, written)
    except BaseException:
        target.close()
        _remove(partial)
        raise
    target.close()
    _single_file(partial)
    return _place(anchor, partial, stamp, keep, kind, accept_fewer)


def backup_if_due(database: Path | None, every: timedelta = timedelta(hours=24),
                  keep: int = KEEP_BACKUPS) -> BackupMade | None:
    """The automatic rolling backup: the app calls this once at start, with the SQLite file.

    Backs up (:func:`backup_database`, the same proof and pruning rule) when the newest backup of
    ``database`` is older than ``every`` or there is none; returns what was made, or None when none
    was due. ``database`` None (a shop on a server), a file that does not exist yet or is empty, or
    a name that is not a file at all does nothing.
    It reads the whole file twice (the copy and its proof), so call it off the GUI thread. Raises
    :class:`StoreFileError` for a damaged database, naming the newest good backup.
    """
    status = None if database is None else file_status(database)
    if status is None or not stat.S_ISREG(status.st_mode) or status.st_size == 0:
        return None  # nothing to back up; opening the shop says what is wrong with the name
    newest = newest_backup(database)
    if newest is not None:
        age = datetime.now(UTC).timestamp() - newest.stat().st_mtime
        if age < every.total_seconds():
            return None
    return backup_database(database, keep=keep)


def copy_database(source: Path, target: Path, *, replace: bool = True) -> None:
    """Online-backup ``source`` into a new single file ``target`` (journal mode DELETE, no WAL
    beside it, owner-only); with ``replace`` it is written beside and appears only when complete."""
    written = target.with_name(target.name + ".partial") if replace else target
    _remove(written)
    create_private_file(written)
    src = sqlite3.connect(source, timeout=BUSY_TIMEOUT_S)
    dst = sqlite3.connect(written)
    try:
        src.backup(dst)
        dst.execute("PRAGMA journal_mode=DELETE")
    finally:
        dst.close()
        src.close()
    if replace:
        os.replace(written, target)


def _partial(anchor: Path, kind: str) -> tuple[str, Path]:
    make_private_folder(backup_folder(anchor))
    stamp = datetime.now(UTC).strftime("%Y%m%d-%H%M%S-%f")
    return stamp, backup_path(anchor, stamp, kind).with_suffix(".partial")


def _place(anchor: Path, partial: Path, stamp: str, keep: int, kind: str,
           accept_fewer: bool) -> BackupMade:
    proof = prove(partial, thorough=True)
    if not proof.good:
        _remove(partial)
        reference = next(good_backups(anchor), (None, None))[0]
        raise StoreFileError(anchor, f"{proof.problem}; no backup was made and the backups there "
                             "are kept", reference)
    reference, reference_proof = next(good_backups(anchor), (None, Proof("none")))
    good = kind == "" and (accept_fewer or reference is None
                           or proof.cases >= COLLAPSE_BELOW * reference_proof.cases)
    if kind == "" and not good:
        kind = "fewer-cases"
    target = backup_path(anchor, stamp, kind)
    os.replace(partial, target)
    protect = target if good else reference
    pruned = _prune(anchor, keep, protect)
    return BackupMade(target, proof.cases, good, reference,
                      reference_proof.cases if reference is not None else None, pruned)


def _prune(anchor: Path, keep: int, protect: Path | None) -> tuple[Path, ...]:
    """Remove the oldest backups past the newest ``keep``, never ``protect`` (the newest good one)."""
    pruned = []
    for old in list_backups(anchor)[:-keep] if keep > 0 else []:
        if old != protect:
            old.unlink()
            pruned.append(old)
    return tuple(pruned)


def _single_file(database: Path) -> None:
    """Fold a closed SQLite file's WAL into it, so the backup is one self-contained file."""
    connection = sqlite3.connect(database)
    try:
        connection.execute("PRAGMA journal_mode=DELETE")
    finally:
        connection.close()


def _remove(database: Path) -> None:
    for extra in ("", "-wal", "-shm", "-journal"):
        database.with_name(database.name + extra).unlink(missing_ok=True)
