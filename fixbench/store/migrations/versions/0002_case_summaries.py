"""Summary column and indexes on cases for the owner's figures and sorted case lists.

Adds ``cases.top_suspect_fault`` (the engine's first suspect after the case's last reading),
fills it from ``suspects``, and indexes the columns the figures group by and the case list sorts
by. On SQLite the table is rebuilt in batch mode (``recreate="always"``): it is the parent of
readings, repairs and verifications, which is exactly the case the foreign-key-off migration
guards.

Revision ID: 0002
Revises: 0001
"""

import sqlalchemy as sa
from alembic import op

revision = "0002"
down_revision = "0001"
branch_labels = None
depends_on = None

NEW_INDEXES = {
    "ix_cases_closed_at": ["closed_at"],
    "ix_cases_status": ["status"],
    "ix_cases_outcome": ["outcome"],
    "ix_cases_family_fault": ["family_id", "confirmed_fault"],
    "ix_cases_technician": ["technician_id", "bench_minutes"],
    "ix_cases_device_opened": ["device_id", "opened_at"],
    "ix_cases_bench_minutes": ["bench_minutes"],
    "ix_cases_confirmed_fault": ["confirmed_fault"],
    "ix_cases_confirmed_part": ["confirmed_part"],
    "ix_cases_confirmed_stage": ["confirmed_stage"],
}

# Rank-1 suspect of each case's highest-numbered reading.
BACKFILL = """
UPDATE cases SET top_suspect_fault = (
    SELECT s.fault_id FROM readings r JOIN suspects s ON s.reading_id = r.id
    WHERE r.case_id = cases.id AND s.rank = 1
    ORDER BY r.seq DESC LIMIT 1)
"""


def _recreate() -> str:
    # Rebuilding by copy is SQLite's way; PostgreSQL alters the table in place.
    return "always" if op.get_bind().dialect.name == "sqlite" else "auto"


def upgrade() -> None:
    with op.batch_alter_table("cases", recreate=_recreate()) as batch:
        batch.add_column(sa.Column("top_suspect_fault", sa.Text))
        for name, columns in NEW_INDEXES.items():
            batch.create_index(name, columns)
    op.execute(BACKFILL)


def downgrade() -> None:
    with op.batch_alter_table("cases", recreate=_recreate()) as batch:
        for name in NEW_INDEXES:
            batch.drop_index(name)
        batch.drop_column("top_suspect_fault")
