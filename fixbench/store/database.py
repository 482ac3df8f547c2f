"""The one session factory: opens a shop database, checks it, migrates it, and hands out sessions.

Everything about how SQLite is driven lives here, set once per connection by event listeners:
WAL journal, ``synchronous=FULL`` (a committed reading survives power loss, not only a crash),
foreign keys on, a busy timeout, and ``BEGIN IMMEDIATE`` for every write transaction so two
benches writing the same file queue for the write lock instead of failing with "database is
locked" on upgrade from a read lock. Read-only work (the owner's figures, the case table) goes
through :meth:`Store.reading`, which begins a plain deferred transaction: in WAL mode readers
do not block each other or the writer, and do not queue for the write lock. The recipe (``isolation_level=None`` on the DBAPI connection, BEGIN
emitted from the "begin" event) is SQLAlchemy's documented one for pysqlite ("Serializable
isolation / Savepoints / Transactional DDL" in the SQLite dialect docs).
"""

from __future__ import annotations

import sqlite3
import stat
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path

from sqlalchemy import Engine, create_engine, event
from sqlalchemy.engine import make_url
from sqlalchemy.exc import ArgumentError, DatabaseError, NoSuchModuleError, OperationalError
from sqlalchemy.orm import Session, sessionmaker

from fixbench.store.errors import StoreError, StoreFileError, StoreLocationError
from fixbench.store.health import check_sqlite_file, newest_good_backup
from fixbench.store.location import (DEFAULT_FILE_NAME, create_private_file, file_status,
                                     make_private_folder, resolve_url, sqlite_path)
from fixbench.store.revisions import is_at_head

BUSY_TIMEOUT_MS = 30_000
READ_ONLY_OPTION = "fixbench_read_only"
SQLITE_PRAGMAS = (
    "PRAGMA journal_mode=WAL",
    "PRAGMA synchronous=FULL",
    "PRAGMA foreign_keys=ON",
    f"PRAGMA busy_timeout={BUSY_TIMEOUT_MS}",
)


@dataclass(frozen=True)
class Store:
    """An open shop database: the engine, a session factory, and the SQLite file if there is one."""

    engine: Engine
    sessions: sessionmaker[Session]
    path: Path | None

    @property
    def dialect(self) -> str:
        return self.engine.dialect.name

    @contextmanager
    def session(self) -> Iterator[Session]:
        """A session whose work is committed when the block ends without an error."""
        with self.sessions.begin() as session:
            yield session

    @contextmanager
    def reading(self) -> Iterator[Session]:
        """A session for queries only: it does not take the write lock. Never write through it."""
        with Session(bind=self.engine.execution_options(**{READ_ONLY_OPTION: True}),
                     expire_on_commit=False) as session, session.begin():
            yield session

    def read_connection(self):
        """A Core connection for queries only (see :meth:`reading`)."""
        return self.engine.execution_options(**{READ_ONLY_OPTION: True}).connect()

    def close(self) -> None:
        self.engine.dispose()


def open_store(url_or_path: str | Path | None = None, *, migrate: bool = True,
               create: bool = True) -> Store:
    """Open the shop database (creating it if ``create``), refusing damaged, foreign or newer files
    untouched; every problem a person can fix is a :class:`StoreError` with a one-line message."""
    url = resolve_url(url_or_path)
    path = sqlite_path(url)
    if path is not None:
        _check_place(path, create)
        check_sqlite_file(path)
        if not path.exists():
            make_private_folder(path.parent)
            _create(path)
    engine = _make_engine(url)
    store = Store(engine=engine, sessions=sessionmaker(engine, expire_on_commit=False), path=path)
    if migrate:
        try:
            if not is_at_head(store):
                # alembic is imported only when a shop needs migrating, not on every start.
                from fixbench.store.migrate import upgrade_to_head

                upgrade_to_head(store)
        except StoreError:
            engine.dispose()
            raise
        except (DatabaseError, OperationalError) as err:
            engine.dispose()
            if path is not None and _is_damage(err):
                raise StoreFileError(path, "is damaged", newest_good_backup(path)) from err
            if path is None and isinstance(err, OperationalError):
                raise StoreLocationError(f"cannot reach the database server {_shown(url)}: "
                                         f"{_first_line(err)}") from err
            raise
    return store


def _check_place(path: Path, create: bool) -> None:
    """Refuse, before anything is created, a name that cannot be a shop database file."""
    status = file_status(path)
    if status is None:
        if not create:
            raise StoreLocationError(f"there is no shop database at {path}; check --db or "
                                     "FIXBENCH_DB")
        return
    mode = status.st_mode
    if stat.S_ISDIR(mode):
        raise StoreLocationError(f"{path} is a folder; name the database file, such as "
                                 f"{path / DEFAULT_FILE_NAME}")
    if not stat.S_ISREG(mode):
        raise StoreLocationError(f"{path} is not a regular file (a device or a pipe); name a "
                                 "database file")


def _create(path: Path) -> None:
    try:
        create_private_file(path)
    except FileExistsError:
        pass  # another bench created it a moment ago
    except OSError as err:
        raise StoreLocationError(f"cannot create {path}: {err.strerror or err}") from None


def _shown(url: str) -> str:
    try:
        return make_url(url).render_as_string(hide_password=True)
    except Exception:  # noqa: BLE001 - only for a message; the URL was refused already
        return "(the URL given)"


def _first_line(err: Exception) -> str:
    text = str(getattr(err, "orig", None) or err).strip()
    return text.splitlines()[0] if text else type(err).__name__


def _is_damage(err: Exception) -> bool:
    text = str(getattr(err, "orig", err)).lower()
    return "malformed" in text or "not a database" in text or "disk image" in text


def _make_engine(url: str) -> Engine:
    try:
        parsed = make_url(url)
        if not url.startswith("sqlite"):
            return create_engine(parsed, pool_pre_ping=True)
        engine = create_engine(parsed, connect_args={"timeout": BUSY_TIMEOUT_MS / 1000})
    except NoSuchModuleError as err:
        raise StoreLocationError(f"cannot use {_shown(url)}: no such database kind or driver "
                                 f"({_first_line(err)}); fixbench works with SQLite files and "
                                 "postgresql+psycopg:// servers") from None
    except ImportError as err:
        raise StoreLocationError(f"cannot use {_shown(url)}: its driver is not installed "
                                 f"({err.name or err})") from None
    except (ArgumentError, ValueError) as err:
        raise StoreLocationError(f"the database URL does not parse ({_first_line(err)}); give a "
                                 "file name or a URL such as postgresql+psycopg://user@host/shop") from None
    install_sqlite_listeners(engine)
    return engine


def install_sqlite_listeners(engine: Engine) -> None:
    """Set the pragmas on every new connection; writes BEGIN IMMEDIATE, reads a plain BEGIN."""

    @event.listens_for(engine, "connect")
    def _on_connect(dbapi_connection: sqlite3.Connection, _record: object) -> None:
        # Let SQLAlchemy's "begin" event own transaction starts instead of pysqlite.
        dbapi_connection.isolation_level = None
        for pragma in SQLITE_PRAGMAS:
            dbapi_connection.execute(pragma)

    @event.listens_for(engine, "begin")
    def _on_begin(connection) -> None:
        read_only = connection.get_execution_options().get(READ_ONLY_OPTION, False)
        connection.exec_driver_sql("BEGIN" if read_only else "BEGIN IMMEDIATE")
