"""A shop's records copied table by table between two databases of the same schema revision.

A SQLite shop is backed up and restored as a file (SQLite's online backup and ATTACH, in
:mod:`fixbench.store.backup` and :mod:`fixbench.store.restore`). A shop on a server has no file, so
its backup is the same records written into a new SQLite file of the same schema, and a restore
writes a backup's records back onto the server: both go through here. Rows go parents first (the
schema's foreign-key order, ``MetaData.sorted_tables``), in chunks, inside the transaction the
caller holds on the target; the caller reads the source in one snapshot.
"""

from __future__ import annotations

from sqlalchemy import Connection, Table, func, select, text

from fixbench.store.models import Base

CHUNK_ROWS = 5000


def shop_tables() -> list[Table]:
    """Every table of the shop's records, parents before children (alembic's own table left out:
    both sides are migrated to the same revision before a copy)."""
    return list(Base.metadata.sorted_tables)


def copy_rows(source: Connection, target: Connection) -> dict[str, int]:
    """Insert every row of ``source`` into ``target``'s (empty) tables; returns rows per table."""
    copied = {}
    for table in shop_tables():
        count = 0
        result = source.execute(select(table).order_by(*table.primary_key.columns),
                                execution_options={"yield_per": CHUNK_ROWS})
        for chunk in result.partitions(CHUNK_ROWS):
            target.execute(table.insert(), [dict(row._mapping) for row in chunk])
            count += len(chunk)
        copied[table.name] = count
    return copied


def clear_rows(target: Connection) -> None:
    """Delete every row of the shop, children first."""
    for table in reversed(shop_tables()):
        target.execute(table.delete())


def reset_sequences(target: Connection) -> None:
    """On PostgreSQL, move each table's id sequence past the ids copied in, so the next case a bench
    opens does not collide with a restored one (rows inserted with their ids leave it behind)."""
    if target.dialect.name != "postgresql":
        return
    for table in shop_tables():
        if "id" not in table.c or not table.c.id.primary_key:
            continue
        sequence = target.execute(text("SELECT pg_get_serial_sequence(:t, 'id')"),
                                  {"t": table.name}).scalar()
        if sequence is None:
            continue
        highest = target.execute(select(func.max(table.c.id))).scalar()
        target.execute(text("SELECT setval(:s, :v, :called)"),
                       {"s": sequence, "v": highest or 1, "called": highest is not None})
