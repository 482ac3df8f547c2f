"""Tells a healthy fixbench SQLite file from a damaged or foreign one, without changing it.

Run before anything opens the file for writing, so a truncated database, a file of random bytes or
some other program's SQLite file is reported and left exactly as it was. The header layout used
below (magic string, page size at offset 16, change counter at 24, page count at 28,
version-valid-for at 92) is from "Database File Format", section 1.3, sqlite.org/fileformat.html.
"""

from __future__ import annotations

import sqlite3
from pathlib import Path

from fixbench.store.errors import StoreFileError
from fixbench.store.location import newest_backup

SQLITE_MAGIC = b"SQLite format 3\x00"
HEADER_BYTES = 100
FIXBENCH_TABLES = {"alembic_version", "cases", "readings"}


def check_sqlite_file(path: Path) -> None:
    """Raise :class:`StoreFileError` unless ``path`` is absent, empty, or a fixbench database."""
    if not path.exists() or path.stat().st_size == 0:
        return
    problem = _header_problem(path)
    if problem is None:
        problem = _schema_problem(path)
    if problem is not None:
        raise StoreFileError(path, problem, newest_backup(path))


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


def _schema_problem(path: Path) -> str | None:
    try:
        connection = sqlite3.connect(f"{path.resolve().as_uri()}?mode=ro", uri=True)
    except sqlite3.Error as err:
        return f"cannot be read ({err})"
    try:
        names = {row[0] for row in connection.execute(
            "SELECT name FROM sqlite_master WHERE type = 'table'")}
    except sqlite3.DatabaseError as err:
        return f"is damaged ({err})"
    finally:
        connection.close()
    if names and not FIXBENCH_TABLES <= names:
        return "is not a fixbench database (it is another program's SQLite file)"
    return None
