"""The schema revisions this fixbench ships, read from the migration files' own lines without
importing alembic (about a third of a second to import, more on a slow disk), so opening a shop
that is already at the newest schema, the everyday case, never loads it.

Each file under ``migrations/versions`` declares ``revision = "..."`` and ``down_revision = ...``
on lines of their own, as alembic's template writes them; the head is the revision no other one
revises. ``tests/store/test_revisions.py`` holds this reading equal to alembic's own.
"""

from __future__ import annotations

import functools
import re
from pathlib import Path

from sqlalchemy import text
from sqlalchemy.exc import DBAPIError

VERSIONS = Path(__file__).with_name("migrations") / "versions"
_REVISION = re.compile(r'^revision\s*=\s*["\']([^"\']+)["\']', re.MULTILINE)
_DOWN = re.compile(r'^down_revision\s*=\s*(?:["\']([^"\']+)["\']|None)', re.MULTILINE)


@functools.cache
def shipped_revisions() -> dict[str, str | None]:
    """Every shipped revision with the one it revises (None for the first)."""
    found: dict[str, str | None] = {}
    for path in sorted(VERSIONS.glob("*.py")):
        text = path.read_text(encoding="utf-8")
        revision, down = _REVISION.search(text), _DOWN.search(text)
        if revision is None or down is None:
            continue  # not a revision file (the package's __init__)
        found[revision.group(1)] = down.group(1)
    return found


@functools.cache
def head() -> str:
    """The newest shipped revision: the one no other revises."""
    revisions = shipped_revisions()
    heads = set(revisions) - {down for down in revisions.values() if down is not None}
    if len(heads) != 1:
        raise RuntimeError(f"the migrations have {len(heads)} heads ({sorted(heads)}); "
                           "each new revision must revise the single head")
    return heads.pop()


def is_at_head(store) -> bool:
    """Whether the shop's schema is the newest shipped one (False when it cannot tell: no schema
    yet, or an error the migration step then reports in its own words)."""
    try:
        with store.read_connection() as connection:
            current = connection.scalar(text("SELECT version_num FROM alembic_version"))
    except DBAPIError:
        return False
    return current == head()
