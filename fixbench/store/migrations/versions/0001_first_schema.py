"""First schema: people, devices, cases, readings with suspects, repairs, verifications, practice.

Revision ID: 0001
Revises:
"""

import sqlalchemy as sa
from alembic import op

revision = "0001"
down_revision = None
branch_labels = None
depends_on = None


def upgrade() -> None:
    op.create_table(
        "technicians",
        sa.Column("id", sa.Integer, primary_key=True),
        sa.Column("name", sa.Text, nullable=False),
        sa.Column("role", sa.String(16), nullable=False),
        sa.Column("active", sa.Boolean, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_technicians"),
    )
    op.create_table(
        "devices",
        sa.Column("id", sa.Integer),
        sa.Column("make", sa.Text, nullable=False),
        sa.Column("model", sa.Text, nullable=False),
        sa.Column("kind", sa.Text, nullable=False),
        sa.Column("label_ratings", sa.JSON, nullable=False),
        sa.Column("serial", sa.Text),
        sa.PrimaryKeyConstraint("id", name="pk_devices"),
    )
    op.create_index("ix_devices_model", "devices", ["model"])
    op.create_table(
        "cases",
        sa.Column("id", sa.Integer),
        sa.Column("ticket_ref", sa.Text, nullable=False),
        sa.Column("customer_ref", sa.Text),
        sa.Column("device_id", sa.Integer, nullable=False),
        sa.Column("technician_id", sa.Integer, nullable=False),
        sa.Column("family_id", sa.Text, nullable=False),
        sa.Column("ratings", sa.JSON, nullable=False),
        sa.Column("status", sa.String(16), nullable=False),
        sa.Column("outcome", sa.String(32)),
        sa.Column("opened_at", sa.DateTime, nullable=False),
        sa.Column("closed_at", sa.DateTime),
        sa.Column("bench_minutes", sa.Integer),
        sa.Column("confirmed_fault", sa.Text),
        sa.Column("confirmed_part", sa.Text),
        sa.Column("confirmed_stage", sa.Text),
        sa.Column("notes", sa.Text, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_cases"),
        sa.UniqueConstraint("ticket_ref", name="uq_cases_ticket_ref"),
        sa.ForeignKeyConstraint(["device_id"], ["devices.id"], name="fk_cases_device_id_devices"),
        sa.ForeignKeyConstraint(["technician_id"], ["technicians.id"],
                                name="fk_cases_technician_id_technicians"),
    )
    op.create_index("ix_cases_opened_at", "cases", ["opened_at"])
    op.create_table(
        "readings",
        sa.Column("id", sa.Integer),
        sa.Column("case_id", sa.Integer, nullable=False),
        sa.Column("seq", sa.Integer, nullable=False),
        sa.Column("check_id", sa.Text, nullable=False),
        sa.Column("typed", sa.Text, nullable=False),
        sa.Column("value", sa.Float),
        sa.Column("unit", sa.Text),
        sa.Column("outcome", sa.Text),
        sa.Column("entered_at", sa.DateTime, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_readings"),
        sa.UniqueConstraint("case_id", "seq", name="uq_readings_case_seq"),
        sa.ForeignKeyConstraint(["case_id"], ["cases.id"], ondelete="CASCADE",
                                name="fk_readings_case_id_cases"),
    )
    op.create_table(
        "suspects",
        sa.Column("id", sa.Integer),
        sa.Column("reading_id", sa.Integer, nullable=False),
        sa.Column("rank", sa.Integer, nullable=False),
        sa.Column("fault_id", sa.Text, nullable=False),
        sa.Column("part_id", sa.Text),
        sa.Column("stage_id", sa.Text),
        sa.Column("probability", sa.Float, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_suspects"),
        sa.UniqueConstraint("reading_id", "rank", name="uq_suspects_reading_rank"),
        sa.ForeignKeyConstraint(["reading_id"], ["readings.id"], ondelete="CASCADE",
                                name="fk_suspects_reading_id_readings"),
    )
    op.create_table(
        "repair_actions",
        sa.Column("id", sa.Integer),
        sa.Column("case_id", sa.Integer, nullable=False),
        sa.Column("part_id", sa.Text, nullable=False),
        sa.Column("fault_id", sa.Text),
        sa.Column("action", sa.String(16), nullable=False),
        sa.Column("parts_cost_cents", sa.Integer, nullable=False),
        sa.Column("done_at", sa.DateTime, nullable=False),
        sa.Column("note", sa.Text, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_repair_actions"),
        sa.ForeignKeyConstraint(["case_id"], ["cases.id"], ondelete="CASCADE",
                                name="fk_repair_actions_case_id_cases"),
    )
    op.create_index("ix_repair_actions_case_id", "repair_actions", ["case_id"])
    op.create_table(
        "verifications",
        sa.Column("id", sa.Integer),
        sa.Column("case_id", sa.Integer, nullable=False),
        sa.Column("check_id", sa.Text, nullable=False),
        sa.Column("typed", sa.Text, nullable=False),
        sa.Column("value", sa.Float),
        sa.Column("unit", sa.Text),
        sa.Column("outcome", sa.Text),
        sa.Column("passed", sa.Boolean, nullable=False),
        sa.Column("entered_at", sa.DateTime, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_verifications"),
        sa.ForeignKeyConstraint(["case_id"], ["cases.id"], ondelete="CASCADE",
                                name="fk_verifications_case_id_cases"),
    )
    op.create_index("ix_verifications_case_id", "verifications", ["case_id"])
    op.create_table(
        "practice_attempts",
        sa.Column("id", sa.Integer),
        sa.Column("trainee_id", sa.Integer, nullable=False),
        sa.Column("scenario", sa.Text, nullable=False),
        sa.Column("checks_used", sa.Integer, nullable=False),
        sa.Column("minutes", sa.Float, nullable=False),
        sa.Column("score", sa.Float, nullable=False),
        sa.Column("safety_slips", sa.Integer, nullable=False),
        sa.Column("attempted_at", sa.DateTime, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_practice_attempts"),
        sa.ForeignKeyConstraint(["trainee_id"], ["technicians.id"],
                                name="fk_practice_attempts_trainee_id_technicians"),
    )
    op.create_index("ix_practice_attempts_trainee_id", "practice_attempts", ["trainee_id"])
    op.create_table(
        "amendments",
        sa.Column("id", sa.Integer),
        sa.Column("case_id", sa.Integer, nullable=False),
        sa.Column("field", sa.Text, nullable=False),
        sa.Column("old_value", sa.Text, nullable=False),
        sa.Column("new_value", sa.Text, nullable=False),
        sa.Column("amended_by", sa.Text, nullable=False),
        sa.Column("amended_at", sa.DateTime, nullable=False),
        sa.Column("reason", sa.Text, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_amendments"),
        sa.ForeignKeyConstraint(["case_id"], ["cases.id"], ondelete="CASCADE",
                                name="fk_amendments_case_id_cases"),
    )
    op.create_index("ix_amendments_case_id", "amendments", ["case_id"])
    op.create_table(
        "owner_secret",
        sa.Column("id", sa.Integer),
        sa.Column("salt", sa.LargeBinary, nullable=False),
        sa.Column("n", sa.Integer, nullable=False),
        sa.Column("r", sa.Integer, nullable=False),
        sa.Column("p", sa.Integer, nullable=False),
        sa.Column("digest", sa.LargeBinary, nullable=False),
        sa.Column("set_at", sa.DateTime, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_owner_secret"),
    )


def downgrade() -> None:
    for table in ("owner_secret", "amendments", "practice_attempts", "verifications",
                  "repair_actions", "suspects", "readings", "cases", "devices", "technicians"):
        op.drop_table(table)
