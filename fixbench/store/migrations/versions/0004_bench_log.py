"""The bench's own record: withdrawn readings (undo), skipped checks, caution acknowledgement per
case, and shop settings (key/value text, such as the footer of the owner's reports).

Only new tables: no existing table is rebuilt, so no row is copied and the foreign-keys-off
discipline of ``fixbench.store.migrate`` has nothing to guard here beyond its usual check.

Revision ID: 0004
Revises: 0003
"""

import sqlalchemy as sa
from alembic import op

revision = "0004"
down_revision = "0003"
branch_labels = None
depends_on = None


def upgrade() -> None:
    op.create_table(
        "shop_settings",
        sa.Column("key", sa.String(64), nullable=False),
        sa.Column("value", sa.Text, nullable=False),
        sa.PrimaryKeyConstraint("key", name="pk_shop_settings"),
    )
    op.create_table(
        "withdrawn_readings",
        sa.Column("reading_id", sa.Integer, nullable=False),
        sa.Column("withdrawn_at", sa.DateTime, nullable=False),
        sa.PrimaryKeyConstraint("reading_id", name="pk_withdrawn_readings"),
        sa.ForeignKeyConstraint(["reading_id"], ["readings.id"], ondelete="CASCADE",
                                name="fk_withdrawn_readings_reading_id_readings"),
    )
    op.create_table(
        "skipped_checks",
        sa.Column("id", sa.Integer),
        sa.Column("case_id", sa.Integer, nullable=False),
        sa.Column("check_id", sa.Text, nullable=False),
        sa.Column("skipped_at", sa.DateTime, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_skipped_checks"),
        sa.ForeignKeyConstraint(["case_id"], ["cases.id"], ondelete="CASCADE",
                                name="fk_skipped_checks_case_id_cases"),
    )
    op.create_index("ix_skipped_checks_case_id", "skipped_checks", ["case_id"])
    op.create_table(
        "caution_acknowledgements",
        sa.Column("case_id", sa.Integer, nullable=False),
        sa.Column("technician_id", sa.Integer, nullable=False),
        sa.Column("acknowledged_at", sa.DateTime, nullable=False),
        sa.PrimaryKeyConstraint("case_id", name="pk_caution_acknowledgements"),
        sa.ForeignKeyConstraint(["case_id"], ["cases.id"], ondelete="CASCADE",
                                name="fk_caution_acknowledgements_case_id_cases"),
        sa.ForeignKeyConstraint(["technician_id"], ["technicians.id"],
                                name="fk_caution_acknowledgements_technician_id_technicians"),
    )


def downgrade() -> None:
    op.drop_table("caution_acknowledgements")
    op.drop_index("ix_skipped_checks_case_id", table_name="skipped_checks")
    op.drop_table("skipped_checks")
    op.drop_table("withdrawn_readings")
    op.drop_table("shop_settings")
