"""Where the shop's database lives: the one place that decides it.

Order of preference: a URL or path given explicitly (``--db``), then the ``FIXBENCH_DB``
environment variable, then ``fixbench.sqlite`` in the user data folder that platformdirs names for
the app "fixbench". A plain file path means SQLite; anything with ``://`` is a SQLAlchemy URL
(``postgresql+psycopg://user@host/db`` lets several benches share one server).

The demo shop's database ships read-only: in a wheel inside the package (``demo_files/``), in a
source checkout in ``demo_db/`` beside the package.
"""

from __future__ import annotations

import os
import shutil
from pathlib import Path

from platformdirs import user_data_path

APP_NAME = "fixbench"
ENV_VAR = "FIXBENCH_DB"
DEFAULT_FILE_NAME = "fixbench.sqlite"
BACKUP_FOLDER_SUFFIX = "-backups"
BACKUP_SUFFIX = ".sqlite"
DEMO_FILE_NAME = "fixbench-demo.sqlite"
PACKAGE_DIR = Path(__file__).resolve().parent.parent


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


def list_backups(database: Path) -> list[Path]:
    """Backups of ``database``, oldest first (their names sort by time)."""
    folder = backup_folder(database)
    if not folder.is_dir():
        return []
    prefix = f"{database.stem}-"
    return sorted(p for p in folder.iterdir()
                  if p.name.startswith(prefix) and p.name.endswith(BACKUP_SUFFIX))


def newest_backup(database: Path) -> Path | None:
    backups = list_backups(database)
    return backups[-1] if backups else None


def demo_database_path() -> Path | None:
    """The shipped demo shop database, or None when this build has none.

    Treat it as read-only: opening a database writes to it (schema upgrades, the WAL), so open
    :func:`demo_working_copy` instead.
    """
    for candidate in (PACKAGE_DIR / "demo_files" / DEMO_FILE_NAME,
                      PACKAGE_DIR.parent / "demo_db" / DEMO_FILE_NAME):
        if candidate.is_file():
            return candidate
    return None


def demo_working_copy(folder: Path | None = None) -> Path | None:
    """A fresh writable copy of the demo shop to open, or None when this build has none.

    The copy goes to ``demo-shop/`` in ``folder`` (default: the user data folder) and replaces the
    previous one, so every visit to the demo starts from the shipped history. A plain file copy is
    safe here: the shipped file is a closed, single-file database (no WAL beside it).
    """
    source = demo_database_path()
    if source is None or not source.exists():
        return None
    target = (folder if folder is not None else data_folder()) / "demo-shop" / DEMO_FILE_NAME
    target.parent.mkdir(parents=True, exist_ok=True)
    for extra in ("-wal", "-shm", "-journal"):
        target.with_name(target.name + extra).unlink(missing_ok=True)
    shutil.copyfile(source, target)
    return target
