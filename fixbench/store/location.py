"""Where the shop's database lives: the one place that decides it.

Order of preference: a URL or path given explicitly (``--db``), then the ``FIXBENCH_DB``
environment variable, then ``fixbench.sqlite`` in the user data folder that platformdirs names for
the app "fixbench". A plain file path means SQLite; anything with ``://`` is a SQLAlchemy URL
(``postgresql+psycopg://user@host/db`` lets several benches share one server).

Everything created here for a shop (its folder, the database file, backups) is owner-only on POSIX
systems (folders 0700, files 0600): the records hold customers' references and the owner's
passphrase hash. SQLite gives the WAL and shared-memory files the database file's own mode.
A folder or file that already exists keeps the mode it has.

Backups are named ``STEM-YYYYmmdd-HHMMSS-ffffff[-KIND].sqlite`` in ``STEM-backups`` beside the
database (UTC time, so names sort by age). KIND is empty for a backup proven readable whose case
count did not collapse, ``fewer-cases`` for one that holds far fewer cases than the good backup
before it, and ``before-restore`` for the shop as it was just before a restore replaced it. A shop
on a server has its backups under ``server-backups`` in the user data folder, named after host,
port and database.

The demo shop's database ships read-only: in a wheel inside the package (``demo_files/``), in a
source checkout in ``demo_db/`` beside the package.
"""

from __future__ import annotations

import os
import re
import shutil
import stat
from pathlib import Path

from platformdirs import user_data_path

APP_NAME = "fixbench"
ENV_VAR = "FIXBENCH_DB"
DEFAULT_FILE_NAME = "fixbench.sqlite"
BACKUP_FOLDER_SUFFIX = "-backups"
BACKUP_SUFFIX = ".sqlite"
DEMO_FILE_NAME = "fixbench-demo.sqlite"
PACKAGE_DIR = Path(__file__).resolve().parent.parent


BACKUP_KINDS = ("", "fewer-cases", "before-restore")
SERVER_BACKUPS = "server-backups"
_STAMP = re.compile(r"^\d{8}-\d{6}-\d{6}(?:-(?P<kind>[a-z-]+))?$")


def data_folder() -> Path:
    """The user data folder for fixbench (created owner-only on first use)."""
    folder = user_data_path(APP_NAME, appauthor=False)
    make_private_folder(folder)
    return folder


def file_status(path: Path) -> os.stat_result | None:
    """What is at ``path`` (None when nothing is): one line, not a trace, when the name itself is
    refused (too long, a file where a folder should be, no permission)."""
    try:
        return path.stat()
    except (FileNotFoundError, NotADirectoryError):
        return None
    except OSError as err:
        from fixbench.store.errors import StoreLocationError

        raise StoreLocationError(f"{path}: {err.strerror or err}") from None


def make_private_folder(folder: Path) -> None:
    """Create ``folder`` and its missing parents owner-only (0700); existing ones are left alone."""
    missing = []
    while not folder.exists() and folder != folder.parent:
        missing.append(folder)
        folder = folder.parent
    for level in reversed(missing):
        level.mkdir(mode=0o700, exist_ok=True)


def create_private_file(path: Path) -> None:
    """Create ``path`` empty and owner-only (0600); raises FileExistsError if it is there."""
    os.close(os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600))


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


def backup_anchor(url: str) -> Path:
    """The path a shop's backups are named after: its SQLite file, or for a server a name in the
    user data folder (``server-backups/HOST-PORT-DATABASE``) that nothing is ever written to."""
    path = sqlite_path(url)
    if path is not None:
        return path
    from sqlalchemy.engine import make_url

    parts = make_url(url)
    name = "-".join(str(x) for x in (parts.host or "local", parts.port or "default", parts.database or "shop"))
    return data_folder() / SERVER_BACKUPS / re.sub(r"[^A-Za-z0-9._-]", "_", name)


def backup_path(database: Path, stamp: str, kind: str = "") -> Path:
    """Where a backup of ``database`` taken at ``stamp`` (UTC, YYYYmmdd-HHMMSS-ffffff) goes."""
    if kind not in BACKUP_KINDS:
        raise ValueError(f"unknown kind of backup {kind!r}")
    return backup_folder(database) / f"{database.stem}-{stamp}{'-' + kind if kind else ''}{BACKUP_SUFFIX}"


def backup_kind(backup: Path) -> str:
    """"" for a good backup, "fewer-cases" or "before-restore" (see the module's docstring)."""
    match = _STAMP.match(_stamp_part(backup))
    return (match.group("kind") or "") if match else ""


def _stamp_part(backup: Path) -> str:
    stem = backup.name.removesuffix(BACKUP_SUFFIX)
    folder_stem = backup.parent.name.removesuffix(BACKUP_FOLDER_SUFFIX)
    return stem.removeprefix(f"{folder_stem}-")


def list_backups(database: Path, kinds: tuple[str, ...] = BACKUP_KINDS) -> list[Path]:
    """Backups of ``database`` of the given kinds, oldest first (their names sort by time)."""
    folder = backup_folder(database)
    status = file_status(folder)
    if status is None or not stat.S_ISDIR(status.st_mode):
        return []
    prefix = f"{database.stem}-"
    return sorted(p for p in folder.iterdir()
                  if p.name.startswith(prefix) and p.name.endswith(BACKUP_SUFFIX)
                  and _STAMP.match(_stamp_part(p)) and backup_kind(p) in kinds)


def newest_backup(database: Path, kinds: tuple[str, ...] = BACKUP_KINDS) -> Path | None:
    """The newest backup file of these kinds, readable or not (:mod:`fixbench.store.health` proves)."""
    backups = list_backups(database, kinds)
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
    make_private_folder(target.parent)
    for extra in ("", "-wal", "-shm", "-journal"):
        target.with_name(target.name + extra).unlink(missing_ok=True)
    create_private_file(target)
    shutil.copyfile(source, target)
    return target
