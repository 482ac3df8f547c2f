"""The shipped schema revisions read without alembic agree with alembic's own reading, and a shop
already at the newest schema opens without importing alembic."""

from __future__ import annotations

import subprocess
import sys

from fixbench.store import open_store
from fixbench.store.migrate import head_revision, known_revisions
from fixbench.store.revisions import head, is_at_head, shipped_revisions


def test_the_light_reading_of_the_migrations_is_alembics():
    assert set(shipped_revisions()) == known_revisions()
    assert head() == head_revision()


def test_a_new_shop_is_not_at_head_until_migrated(tmp_path):
    store = open_store(tmp_path / "shop.sqlite", migrate=False)
    assert not is_at_head(store)
    store.close()
    store = open_store(tmp_path / "shop.sqlite")
    assert is_at_head(store)
    store.close()


def test_a_shop_at_the_newest_schema_opens_without_alembic(tmp_path):
    path = tmp_path / "shop.sqlite"
    open_store(path).close()
    code = ("import sys\n"
            "from fixbench.store import open_store\n"
            "open_store(sys.argv[1]).close()\n"
            "print('alembic' in sys.modules)\n")
    shown = subprocess.run([sys.executable, "-c", code, str(path)], capture_output=True, text=True,
                           check=True)
    assert shown.stdout.strip() == "False"
