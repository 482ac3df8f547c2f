"""Tells a healthy fixbench SQLite file from a damaged, foreign or newer one, without changing it,
and proves a copy readable before it counts as a backup.

:func:`check_sqlite_file` runs before anything opens the file for writing, so a truncated database,
a file of random bytes, some other program's SQLite file or one from a newer fixbench is reported
and left exactly as it was. The header layout used below (magic string, page size at offset 16,
change counter at 24, page count at 28, version-valid-for at 92) is from "Database File Format",
section 1.3, sqlite.org/fileformat.html.

The header and the schema say nothing of damage inside a page. :func:`prove` reads a copy through:
``PRAGMA quick_check`` (every page and record well formed) or ``PRAGMA integrity_check`` (that and
every index matching its table), sqlite.org/pragma.html, then counts its cases. A backup counts only
once proven, and :func:`newest_good_backup` recommends nothing else.
"""

from __future__ import annotations

import sqlite3
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path

from fixbench.store.errors import NewerSchema, StoreFileError
from fixbench.store.location import list_backups
from fixbench.store.revisions import head, shipped_revisions

SQLITE_MAGIC = b"SQLite format 3\x00"
HEADER_BYTES = 100
FIXBENCH_TABLES = {"alembic_version", "cases", "readings"}


@dataclass(frozen=True)
class Proof:
    """What reading a file through showed: a problem, or its schema revision and case count."""

    problem: str | None
    revision: str | None = None
    cases: int = 0

    @property
    def good(self) -> bool:
        return self.problem is None


def check_sqlite_file(path: Path) -> None:
    """Raise :class:`StoreFileError` unless ``path`` is absent, empty, or a fixbench database, and
    :class:`NewerSchema` for one a newer fixbench wrote."""
    if not path.exists() or path.stat().st_size == 0:
        return
    problem = _header_problem(path)
    revision = None
    if problem is None:
        problem, revision = _schema(path)
    if problem is not None:
        raise StoreFileError(path, problem, newest_good_backup(path))
    refuse_newer(str(path), revision)


def prove(path: Path, thorough: bool = False) -> Proof:
    """Read ``path`` through (quick_check, or integrity_check when ``thorough``) and count its cases."""
    try:
        if path.stat().st_size == 0:
            return Proof("is empty (0 bytes), not a fixbench shop")
    except OSError as err:
        return Proof(f"cannot be read ({err.strerror or err})")
    problem = _header_problem(path)
    revision = None
    if problem is None:
        problem, revision = _schema(path)
    if problem is None and revision is None:
        problem = "holds no tables, not a fixbench shop"
    if problem is not None:
        return Proof(problem)
    connection = _read_only(path)
    try:
        pragma = "integrity_check" if thorough else "quick_check"
        verdict = [row[0] for row in connection.execute(f"PRAGMA {pragma}(5)")]
        if verdict != ["ok"]:
            return Proof(f"is damaged ({pragma}: {'; '.join(verdict)})", revision)
        cases = connection.execute("SELECT count(*) FROM cases").fetchone()[0]
    except sqlite3.DatabaseError as err:
        return Proof(f"is damaged ({err})", revision)
    finally:
        connection.close()
    return Proof(None, revision, cases)


def good_backups(database: Path) -> Iterator[tuple[Path, Proof]]:
    """The good backups of ``database`` (kind "", see :mod:`fixbench.store.location`), newest first,
    each proven with quick_check as it is reached: a caller that stops at the first reads one file."""
    for backup in reversed(list_backups(database, kinds=("",))):
        proof = prove(backup)
        if proof.good:
            yield backup, proof


def newest_good_backup(database: Path) -> Path | None:
    return next((backup for backup, _ in good_backups(database)), None)


def refuse_newer(where: str, revision: str | None) -> None:
    """Raise :class:`NewerSchema` when ``revision`` is one this fixbench does not ship."""
    if revision is not None and revision not in shipped_revisions():
        raise NewerSchema(where, revision, head())


def _read_only(path: Path) -> sqlite3.Connection:
    return sqlite3.connect(f"{path.resolve().as_uri()}?mode=ro", uri=True)


def _header_problem(path: Path) -> str | None:
    size = path.stat().st_size
    with path.open("rb") as handle:
        header = handle.read(HEADER_BYTES)
    if not header.startswith(SQLITE_MAGIC):
        return "is not a fixbench database (it is not a SQLite file at all)"
    if len(header) < HEADER_BYTES:
        return "is damaged (it is cut short inside its header)"
    page_size = int.from_bytes(header[16:18], "big")
    page_size = 65536 if page_size == 1 else page_size
    if page_size < 512 or page_size & (page_size - 1):
        return "is damaged (its header gives no valid page size)"  # a power of two, 512 to 65536
    change_counter = int.from_bytes(header[24:28], "big")
    page_count = int.from_bytes(header[28:32], "big")
    valid_for = int.from_bytes(header[92:96], "big")
    # The in-header page count is only trustworthy when version-valid-for matches (fileformat 1.3.7).
    if valid_for == change_counter and page_count and size < page_size * page_count:
        return (f"is damaged (it is cut short: {size} bytes where its header promises "
                f"{page_size * page_count})")
    if size % page_size:
        return "is damaged (its size is not a whole number of pages)"
    return None


def _schema(path: Path) -> tuple[str | None, str | None]:
    """(problem, schema revision): revision None for a SQLite file with no tables yet."""
    try:
        connection = _read_only(path)
    except sqlite3.Error as err:
        return f"cannot be read ({err})", None
    try:
        names = {row[0] for row in connection.execute(
            "SELECT name FROM sqlite_master WHERE type = 'table'")}
        if names and not FIXBENCH_TABLES <= names:
            return "is not a fixbench database (it is another program's SQLite file)", None
        if not names:
            return None, None
        row = connection.execute("SELECT version_num FROM alembic_version").fetchone()
    except sqlite3.DatabaseError as err:
        return f"is damaged ({err})", None
    finally:
        connection.close()
    if row is None:
        return "is not a fixbench database (its schema revision is missing)", None
    return None, row[0]
