"""Shared test set-up: Qt runs offscreen, so the suite needs no display; and every new SQLite shop
a test opens starts as a copy of one shop migrated once per run.

Running the alembic migrations on an empty SQLite file takes about half a second (batch mode
rebuilds tables by copy), and hundreds of tests open a fresh shop. An empty file migrated to the
head revision is the same file every time, so the first fresh shop of a run is migrated for real
and later ones are written as its copy (SQLite's backup API, into the file the store has just
created, which keeps its owner-only mode). Shops that already hold a schema are migrated as
always, and so is every shop of a test marked ``migrations`` (the migration tests themselves).
"""

from __future__ import annotations

import os
import sqlite3
from contextlib import closing
from pathlib import Path

import pytest

from fixbench.store import migrate, open_store

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
_MIGRATE = migrate.upgrade_to_head  # the real one, whatever a test patches


@pytest.fixture(scope="session")
def migrated_shop_file(tmp_path_factory) -> Path:
    """An empty shop at the head revision, migrated by the real migrations once per run."""
    path = tmp_path_factory.mktemp("head") / "shop-at-head.sqlite"
    store = open_store(path, migrate=False)
    _MIGRATE(store)
    store.close()  # closing the last connection checkpoints the WAL into the file
    return path


@pytest.fixture(autouse=True)
def _fresh_shops_copied(request, monkeypatch):
    if request.node.get_closest_marker("migrations") is not None:
        return

    def upgrade_or_copy(store) -> None:
        path = store.path
        if path is None or not _fresh(path):
            _MIGRATE(store)
            return
        template = request.getfixturevalue("migrated_shop_file")
        with closing(sqlite3.connect(template)) as source, closing(sqlite3.connect(path)) as target:
            source.backup(target)

    monkeypatch.setattr(migrate, "upgrade_to_head", upgrade_or_copy)


def _fresh(path: Path) -> bool:
    """A file the store has just created: empty, with no write-ahead log beside it."""
    wal = path.with_name(path.name + "-wal")
    return path.is_file() and path.stat().st_size == 0 and not wal.exists()
