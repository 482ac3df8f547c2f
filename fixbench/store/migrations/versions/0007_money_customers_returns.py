"""Money, customers and warranty returns.

- ``customers`` (name, contact, when added): a person's details live here only, so a person can
  be removed on request by deleting one row; ``cases.customer_id`` links a job to them (set to
  null when the person is removed, keeping the job and its figures). Each distinct
  ``cases.customer_ref`` (the free-text reference kept so far) becomes one customer named by that
  text, and the column is dropped.
- ``cases.quoted_cents`` and ``cases.price_cents``: the price quoted at intake and the final price
  at close (unknown for jobs kept so far, so null).
- ``cases.parts_cents``: the sum of the job's repair lines, kept as lines are written, so money
  figures are one aggregate over cases; filled here from ``repair_actions``.
- ``cases.labour_rate_cents``: the shop's labour rate per hour when the job was closed (null so
  far: the figures then use the rate in the shop's settings).
- ``cases.comeback_of_id``: this job is a warranty return of that earlier job. Filled here by the
  rule that made ``came_back`` so far (the unit's next job, opened within 90 days of a repaired
  job's closing), so the flags stay as they were; from now on intake makes the link.
- Indexes: one covering every column the owner's figures read (``FIGURE_INDEX``), one per customer
  and per return link, one on the units' serials (intake looks a returning unit up by it).

On SQLite ``cases`` is rebuilt in batch mode (twice: columns added, then ``customer_ref`` dropped
once its text has moved) under the foreign-keys-off discipline of ``fixbench.store.migrate``.
The backfill rules are frozen copies of this revision's rules (a migration must not change when
application code does).

Revision ID: 0007
Revises: 0006
"""

from datetime import timedelta

import sqlalchemy as sa
from alembic import op

revision = "0007"
down_revision = "0006"
branch_labels = None
depends_on = None

COMEBACK_DAYS = 90  # the rule that made came_back up to revision 0006

# Every column the owner's figures read, so each figure of a period is answered from this one
# index without visiting the wide case rows (a visit per case took seconds at 100,000 cases).
FIGURE_INDEX = ["status", "opened_at", "technician_id", "device_id", "family_id",
                "confirmed_fault", "confirmed_part", "outcome", "came_back", "failed_verification",
                "top_suspect_fault", "bench_minutes", "price_cents", "parts_cents",
                "labour_rate_cents", "comeback_of_id", "closed_at"]

_customers = sa.table("customers", sa.column("id", sa.Integer), sa.column("name", sa.Text),
                      sa.column("contact", sa.Text), sa.column("added_at", sa.DateTime))
_cases = sa.table("cases", sa.column("id", sa.Integer), sa.column("customer_ref", sa.Text),
                  sa.column("customer_id", sa.Integer), sa.column("device_id", sa.Integer),
                  sa.column("outcome", sa.String), sa.column("opened_at", sa.DateTime),
                  sa.column("closed_at", sa.DateTime), sa.column("parts_cents", sa.Integer),
                  sa.column("comeback_of_id", sa.Integer), sa.column("came_back", sa.Boolean))
_repairs = sa.table("repair_actions", sa.column("case_id", sa.Integer),
                    sa.column("parts_cost_cents", sa.Integer))


def _recreate() -> str:
    return "always" if op.get_bind().dialect.name == "sqlite" else "auto"


def upgrade() -> None:
    op.create_table(
        "customers",
        sa.Column("id", sa.Integer),
        sa.Column("name", sa.Text, nullable=False),
        sa.Column("contact", sa.Text, nullable=True),
        sa.Column("added_at", sa.DateTime, nullable=False),
        sa.PrimaryKeyConstraint("id", name="pk_customers"),
    )
    op.create_index("ix_customers_name", "customers", ["name"])
    op.create_index("ix_devices_serial", "devices", ["serial"])
    with op.batch_alter_table("cases", recreate=_recreate()) as batch:
        batch.add_column(sa.Column("customer_id", sa.Integer, nullable=True))
        batch.add_column(sa.Column("quoted_cents", sa.Integer, nullable=True))
        batch.add_column(sa.Column("price_cents", sa.Integer, nullable=True))
        batch.add_column(sa.Column("parts_cents", sa.Integer, nullable=False,
                                   server_default="0"))
        batch.add_column(sa.Column("labour_rate_cents", sa.Integer, nullable=True))
        batch.add_column(sa.Column("comeback_of_id", sa.Integer, nullable=True))
        batch.create_foreign_key("fk_cases_customer_id_customers", "customers",
                                 ["customer_id"], ["id"], ondelete="SET NULL")
        batch.create_foreign_key("fk_cases_comeback_of_id_cases", "cases",
                                 ["comeback_of_id"], ["id"], ondelete="SET NULL")
        batch.create_index("ix_cases_fig_all", FIGURE_INDEX)
        batch.create_index("ix_cases_customer", ["customer_id", "opened_at"])
        batch.create_index("ix_cases_comeback_of", ["comeback_of_id"])
    _move_customer_refs()
    _fill_parts_cents()
    _link_returns()
    with op.batch_alter_table("cases", recreate=_recreate()) as batch:
        batch.drop_column("customer_ref")


def _move_customer_refs() -> None:
    """One customer per distinct reference text, added when its first job was opened."""
    bind = op.get_bind()
    refs = bind.execute(sa.select(_cases.c.customer_ref, sa.func.min(_cases.c.opened_at))
                        .where(_cases.c.customer_ref.is_not(None))
                        .group_by(_cases.c.customer_ref).order_by(_cases.c.customer_ref)).all()
    for ref, first in refs:
        customer_id = bind.execute(_customers.insert().values(name=ref, contact=None,
                                                              added_at=first)
                                   .returning(_customers.c.id)).scalar_one()
        bind.execute(_cases.update().where(_cases.c.customer_ref == ref)
                     .values(customer_id=customer_id))


def _fill_parts_cents() -> None:
    total = (sa.select(sa.func.coalesce(sa.func.sum(_repairs.c.parts_cost_cents), 0))
             .where(_repairs.c.case_id == _cases.c.id).scalar_subquery())
    op.execute(_cases.update().values(parts_cents=total))


def _link_returns() -> None:
    """Each job opened within 90 days of its unit's previous job, closed as repaired, is a return
    of that job; came_back is then set from the links (the same cases as before)."""
    bind = op.get_bind()
    rows = bind.execute(sa.select(_cases.c.id, _cases.c.device_id, _cases.c.outcome,
                                  _cases.c.opened_at, _cases.c.closed_at)
                        .order_by(_cases.c.device_id, _cases.c.opened_at, _cases.c.id)).all()
    links = []
    for before, this in zip(rows, rows[1:]):
        if (before.device_id == this.device_id and before.outcome == "repaired"
                and before.closed_at is not None
                and this.opened_at - before.closed_at <= timedelta(days=COMEBACK_DAYS)):
            links.append({"case": this.id, "original": before.id})
    if links:
        bind.execute(_cases.update().where(_cases.c.id == sa.bindparam("case"))
                     .values(comeback_of_id=sa.bindparam("original")), links)
    returned = sa.select(_cases.c.comeback_of_id).where(_cases.c.comeback_of_id.is_not(None))
    bind.execute(_cases.update().values(came_back=sa.and_(_cases.c.outcome == "repaired",
                                                          _cases.c.id.in_(returned))))


def downgrade() -> None:
    # The customer's name goes back as the case's reference; contacts, prices and links are lost.
    with op.batch_alter_table("cases", recreate=_recreate()) as batch:
        batch.add_column(sa.Column("customer_ref", sa.Text, nullable=True))
    name = (sa.select(_customers.c.name).where(_customers.c.id == _cases.c.customer_id)
            .scalar_subquery())
    op.execute(_cases.update().where(_cases.c.customer_id.is_not(None))
               .values(customer_ref=name))
    with op.batch_alter_table("cases", recreate=_recreate()) as batch:
        batch.drop_index("ix_cases_comeback_of")
        batch.drop_index("ix_cases_customer")
        batch.drop_index("ix_cases_fig_all")
        batch.drop_constraint("fk_cases_comeback_of_id_cases", type_="foreignkey")
        batch.drop_constraint("fk_cases_customer_id_customers", type_="foreignkey")
        for column in ("comeback_of_id", "labour_rate_cents", "parts_cents", "price_cents",
                       "quoted_cents", "customer_id"):
            batch.drop_column(column)
    op.drop_index("ix_devices_serial", "devices")
    op.drop_index("ix_customers_name", "customers")
    op.drop_table("customers")
