"""A digest of a shop database's content: the same rows give the same digest, whatever the bytes.

Two SQLite files holding the same records differ in their bytes (page layout, free pages, the WAL
history), so a rebuilt demo database is compared by what it holds: every row of every table of
the schema, in primary-key order, each value written in one canonical text form, through SHA-256.
"""

from __future__ import annotations

import hashlib
import json
import math
from datetime import datetime

from sqlalchemy import select

from fixbench.store.database import Store
from fixbench.store.models import Base


def _canonical(value) -> str:
    if isinstance(value, float):
        return "inf" if math.isinf(value) else repr(value)
    if isinstance(value, datetime):
        return value.isoformat()
    if isinstance(value, (dict, list)):
        return json.dumps(value, sort_keys=True, ensure_ascii=False)
    if isinstance(value, bytes):
        return value.hex()
    return repr(value)


def table_digests(store: Store) -> dict[str, str]:
    """Table name -> SHA-256 of its rows (hex), for every table of the schema."""
    digests = {}
    with store.read_connection() as connection:
        for table in Base.metadata.sorted_tables:
            sha = hashlib.sha256()
            for row in connection.execute(select(table).order_by(*table.primary_key.columns)):
                sha.update("\x1f".join(_canonical(v) for v in row).encode("utf-8"))
                sha.update(b"\x1e")
            digests[table.name] = sha.hexdigest()
    return digests


def content_digest(store: Store) -> str:
    """One SHA-256 (hex) over :func:`table_digests`, table by table in name order."""
    sha = hashlib.sha256()
    for name, digest in sorted(table_digests(store).items()):
        sha.update(f"{name}={digest}\n".encode())
    return sha.hexdigest()
