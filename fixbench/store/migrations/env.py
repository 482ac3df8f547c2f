"""Alembic environment for the shop database: always run on a connection the store hands in."""

from __future__ import annotations

from alembic import context

from fixbench.store.models import Base

connection = context.config.attributes.get("connection")
if connection is None:
    raise RuntimeError("fixbench migrations run through fixbench.store.migrate, not the alembic CLI")

context.configure(
    connection=connection,
    target_metadata=Base.metadata,
    render_as_batch=True,
)
with context.begin_transaction():
    context.run_migrations()
