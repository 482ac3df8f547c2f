"""Columns for what a practice round taught: whether the verdict was right, the kinds of safety
mistake made (each once), the checks that told nothing, and the round's record (its scenario in
full, the trainee's actions in order, the diagnosis committed and the readings seen), so a kept
debrief can be opened again and the next unit drawn where the trainee is weakest.

Every column is nullable: rounds kept before this revision knew none of it, and stay as they were
(they show in progress and count in the summaries, but cannot be reopened).

Revision ID: 0006
Revises: 0005
"""

import sqlalchemy as sa
from alembic import op

revision = "0006"
down_revision = "0005"
branch_labels = None
depends_on = None


def _recreate() -> str:
    return "always" if op.get_bind().dialect.name == "sqlite" else "auto"


def upgrade() -> None:
    with op.batch_alter_table("practice_attempts", recreate=_recreate()) as batch:
        batch.add_column(sa.Column("fault_right", sa.Boolean, nullable=True))
        batch.add_column(sa.Column("slip_kinds", sa.Text, nullable=True))
        batch.add_column(sa.Column("checks_wasted", sa.Integer, nullable=True))
        batch.add_column(sa.Column("record", sa.JSON, nullable=True))


def downgrade() -> None:
    with op.batch_alter_table("practice_attempts", recreate=_recreate()) as batch:
        batch.drop_column("record")
        batch.drop_column("checks_wasted")
        batch.drop_column("slip_kinds")
        batch.drop_column("fault_right")
