"""Comeback and failed-verification flags on cases, kept as cases are written.

Adds ``cases.came_back`` (a repaired case whose unit was opened again as the next case of that
device within 90 days of the closing) and ``cases.failed_verification`` (at least one verification
of the case failed), fills both from the existing rows, and adds covering indexes for the owner's
figures, so the comeback and first-time-fix figures stop needing a window over every device and a
join to the verifications, and no figure visits the case rows themselves. On SQLite the table is
rebuilt in batch mode, as in 0002, under the foreign-keys-off discipline of
``fixbench.store.migrate``.

The backfill SQL is a frozen copy of the rule at this revision (a migration must not change when
application code does); ``fixbench.store.case_flags`` holds the live rule, and the v1 -> head test
checks that the two agree.

Revision ID: 0003
Revises: 0002
"""

import sqlalchemy as sa
from alembic import op

revision = "0003"
down_revision = "0002"
branch_labels = None
depends_on = None

# Covering indexes for the owner's figures: each figure filters on status (and the opening date
# for a period) and reads only columns held in one of these, so SQLite answers it from the index
# without visiting the wide case rows.
NEW_INDEXES = {
    "ix_cases_fig_technician": ["status", "technician_id", "bench_minutes", "outcome", "came_back",
                                "failed_verification", "opened_at"],
    "ix_cases_fig_minutes": ["status", "bench_minutes", "opened_at"],
    "ix_cases_fig_family": ["status", "family_id", "outcome", "opened_at"],
    "ix_cases_fig_fault": ["status", "confirmed_fault", "outcome", "opened_at",
                           "top_suspect_fault"],
    "ix_cases_fig_part": ["status", "confirmed_part", "outcome", "opened_at"],
    "ix_cases_fig_stage": ["status", "confirmed_stage", "outcome", "opened_at"],
    "ix_cases_fig_device": ["status", "device_id", "outcome", "opened_at"],
}

_DAYS = {
    "sqlite": "julianday({})",
    "postgresql": "extract(epoch from {}) / 86400.0",
}

COMEBACK_BACKFILL = """
UPDATE cases SET came_back = {true} WHERE id IN (
    SELECT id FROM (
        SELECT id, outcome, closed_at,
               lead(opened_at) OVER (PARTITION BY device_id ORDER BY opened_at, id) AS next_opened
        FROM cases) AS flow
    WHERE outcome = 'repaired' AND next_opened IS NOT NULL AND closed_at IS NOT NULL
      AND {next_days} - {closed_days} <= 90)
"""

FAILED_BACKFILL = """
UPDATE cases SET failed_verification = {true}
WHERE id IN (SELECT case_id FROM verifications WHERE passed = {false})
"""


def _recreate() -> str:
    return "always" if op.get_bind().dialect.name == "sqlite" else "auto"


def upgrade() -> None:
    dialect = op.get_bind().dialect.name
    with op.batch_alter_table("cases", recreate=_recreate()) as batch:
        batch.add_column(sa.Column("came_back", sa.Boolean, nullable=False,
                                   server_default=sa.false()))
        batch.add_column(sa.Column("failed_verification", sa.Boolean, nullable=False,
                                   server_default=sa.false()))
        for name, columns in NEW_INDEXES.items():
            batch.create_index(name, columns)
    true, false = ("1", "0") if dialect == "sqlite" else ("true", "false")
    days = _DAYS[dialect]
    op.execute(COMEBACK_BACKFILL.format(true=true, next_days=days.format("next_opened"),
                                        closed_days=days.format("closed_at")))
    op.execute(FAILED_BACKFILL.format(true=true, false=false))


def downgrade() -> None:
    with op.batch_alter_table("cases", recreate=_recreate()) as batch:
        for name in NEW_INDEXES:
            batch.drop_index(name)
        batch.drop_column("failed_verification")
        batch.drop_column("came_back")
