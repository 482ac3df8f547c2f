"""Board profiles: what the shop knows of one unit model's board, kept for the next unit of it.

- ``board_profiles``: one per unit model, by the model text as the shop typed it (``model``) and
  the key the next unit finds it by (``model_key``: the text case-folded, spaces collapsed), with
  the family whose part ids its entries name.
- ``board_parts``: per part of the family (its id), the board's designator(s), marking, separate
  voltage rating and package, as typed.
- ``board_photos``: photos of the board, in the database (so a backup and a restore carry them
  whole), each with the SHA-256 of its bytes; ``board_photo_marks``: where on a photo each test
  point is, as fractions of its width and height.

New tables only: nothing kept so far changes.

Revision ID: 0008
Revises: 0007
"""

import sqlalchemy as sa
from alembic import op

revision = "0008"
down_revision = "0007"
branch_labels = None
depends_on = None


def upgrade() -> None:
    op.create_table(
        "board_profiles",
        sa.Column("id", sa.Integer),
        sa.Column("model", sa.Text, nullable=False),
        sa.Column("model_key", sa.Text, nullable=False),
        sa.Column("family_id", sa.String(64), nullable=False),
        sa.Column("updated_at", sa.DateTime, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_board_profiles"),
        sa.UniqueConstraint("model_key", name="uq_board_profiles_model_key"),
    )
    op.create_table(
        "board_parts",
        sa.Column("profile_id", sa.Integer, nullable=False),
        sa.Column("part_id", sa.String(32), nullable=False),
        sa.Column("designator", sa.Text, nullable=False, server_default=""),
        sa.Column("value", sa.Text, nullable=False, server_default=""),
        sa.Column("rated", sa.Text, nullable=False, server_default=""),
        sa.Column("package", sa.Text, nullable=False, server_default=""),
        sa.PrimaryKeyConstraint("profile_id", "part_id", name="pk_board_parts"),
        sa.ForeignKeyConstraint(["profile_id"], ["board_profiles.id"], ondelete="CASCADE",
                                name="fk_board_parts_profile_id_board_profiles"),
    )
    op.create_table(
        "board_photos",
        sa.Column("id", sa.Integer),
        sa.Column("profile_id", sa.Integer, nullable=False),
        sa.Column("title", sa.Text, nullable=False, server_default=""),
        sa.Column("image", sa.LargeBinary, nullable=False),
        sa.Column("sha256", sa.String(64), nullable=False),
        sa.Column("added_at", sa.DateTime, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_board_photos"),
        sa.ForeignKeyConstraint(["profile_id"], ["board_profiles.id"], ondelete="CASCADE",
                                name="fk_board_photos_profile_id_board_profiles"),
    )
    op.create_index("ix_board_photos_profile_id", "board_photos", ["profile_id"])
    op.create_table(
        "board_photo_marks",
        sa.Column("photo_id", sa.Integer, nullable=False),
        sa.Column("point_id", sa.String(64), nullable=False),
        sa.Column("x", sa.Float, nullable=False),
        sa.Column("y", sa.Float, nullable=False),
        sa.PrimaryKeyConstraint("photo_id", "point_id", name="pk_board_photo_marks"),
        sa.ForeignKeyConstraint(["photo_id"], ["board_photos.id"], ondelete="CASCADE",
                                name="fk_board_photo_marks_photo_id_board_photos"),
    )


def downgrade() -> None:
    op.drop_table("board_photo_marks")
    op.drop_index("ix_board_photos_profile_id", table_name="board_photos")
    op.drop_table("board_photos")
    op.drop_table("board_parts")
    op.drop_table("board_profiles")
