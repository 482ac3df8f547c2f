"""Where the shop's database lives: the one place that decides it.

Order of preference: a URL or path given explicitly (``--db``), then the ``FIXBENCH_DB``
environment variable, then ``fixbench.sqlite`` in the user data folder that platformdirs names for
the app "fixbench". A plain file path means SQLite; anything with ``://`` is a SQLAlchemy URL
(``postgresql+psycopg://user@host/db`` lets several benches share one server).
"""

from __future__ import annotations

import os
from pathlib import Path

from platformdirs import user_data_path

APP_NAME = "fixbench"
ENV_VAR = "FIXBENCH_DB"
DEFAULT_FILE_NAME = "fixbench.sqlite"
BACKUP_FOLDER_SUFFIX = "-backups"


def data_folder() -> Path:
    """The user data folder for fixbench (created on first use)."""
    folder = user_data_path(APP_NAME, appauthor=False)
    folder.mkdir(parents=True, exist_ok=True)
    return folder


def resolve_url(explicit: str | os.PathLike[str] | None = None) -> str:
    """The SQLAlchemy URL to open, from an explicit value, the environment, or the default file."""
    chosen = explicit if explicit not in (None, "") else os.environ.get(ENV_VAR) or None
    if chosen is None:
        return sqlite_url(data_folder() / DEFAULT_FILE_NAME)
    text = os.fspath(chosen)
    if "://" in text:
        return text
    return sqlite_url(Path(text).expanduser())


def sqlite_url(path: Path) -> str:
    """A SQLAlchemy URL for a SQLite file (absolute, so the working folder does not matter)."""
    return f"sqlite:///{path.resolve()}"


def sqlite_path(url: str) -> Path | None:
    """The file behind a SQLite URL, or None for other databases and in-memory SQLite."""
    if not url.startswith("sqlite"):
        return None
    _, _, rest = url.partition(":///")
    rest = rest.split("?", 1)[0]
    if rest in ("", ":memory:"):
        return None
    return Path(rest)


def backup_folder(database: Path) -> Path:
    """Where rolling backups of a SQLite database file go: a folder beside it, named after it."""
    return database.parent / f"{database.stem}{BACKUP_FOLDER_SUFFIX}"
