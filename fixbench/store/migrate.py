"""Applies the alembic migrations shipped in ``fixbench/store/migrations`` when a store opens.

On SQLite, alembic's batch mode rebuilds a table by copy, drop and rename; with foreign keys on,
dropping the parent table would cascade-delete every child row. So the migration runs on a
connection whose foreign keys are off, and ``PRAGMA foreign_key_check`` runs inside the same
transaction afterwards: any orphan rolls the whole migration back instead of being kept. (Alembic
docs, "Running 'Batch' Migrations for SQLite", section on foreign keys; SQLite docs, "Making Other
Kinds Of Table Schema Changes", step 1 and 10.)
"""

from __future__ import annotations

import functools
from pathlib import Path

from alembic import command
from alembic.config import Config
from alembic.runtime.migration import MigrationContext
from alembic.script import ScriptDirectory
from sqlalchemy import Connection

from fixbench.store.errors import NewerSchema

MIGRATIONS = Path(__file__).with_name("migrations")


class MigrationBrokeForeignKeys(RuntimeError):
    """A migration left child rows without their parent; it has been rolled back."""


def alembic_config() -> Config:
    config = Config()
    config.set_main_option("script_location", str(MIGRATIONS))
    return config


@functools.cache
def head_revision() -> str:
    return ScriptDirectory.from_config(alembic_config()).get_current_head()


@functools.cache
def known_revisions() -> frozenset[str]:
    """Every schema revision this fixbench ships; a database at any other was written by a newer one."""
    return frozenset(script.revision
                     for script in ScriptDirectory.from_config(alembic_config()).walk_revisions())


def current_revision(connection: Connection) -> str | None:
    return MigrationContext.configure(connection).get_current_revision()


def upgrade_to_head(store) -> None:
    """Bring the database to the newest schema; a no-op when it is already there."""
    upgrade(store, "head")


def upgrade(store, revision: str) -> None:
    """Migrate to ``revision`` (used directly by tests that build an old database)."""
    target = head_revision() if revision == "head" else revision
    # Looked at without the write lock, so opening a shop does not queue behind a bench's write.
    with store.read_connection() as connection:
        current = current_revision(connection)
    if current == target:
        return
    if current is not None and current not in known_revisions():
        # Written by a newer fixbench: alembic would fail on it; leave it as it is.
        raise NewerSchema(_where(store), current, head_revision())
    with store.engine.connect() as connection:
        if store.dialect == "sqlite":
            _upgrade_sqlite(connection, revision)
        else:
            with connection.begin():
                _run_alembic(connection, revision)


def _where(store) -> str:
    if store.path is not None:
        return str(store.path)
    return store.engine.url.render_as_string(hide_password=True)


def _upgrade_sqlite(connection: Connection, revision: str) -> None:
    raw = connection.connection.driver_connection
    # Must be set outside a transaction, or SQLite ignores it.
    raw.execute("PRAGMA foreign_keys=OFF")
    try:
        with connection.begin():
            _run_alembic(connection, revision)
            orphans = connection.exec_driver_sql("PRAGMA foreign_key_check").fetchall()
            if orphans:
                raise MigrationBrokeForeignKeys(
                    f"migration to {revision} would orphan {len(orphans)} rows, e.g. {orphans[0]}")
    finally:
        raw.execute("PRAGMA foreign_keys=ON")


def _run_alembic(connection: Connection, revision: str) -> None:
    config = alembic_config()
    config.attributes["connection"] = connection
    command.upgrade(config, revision)
