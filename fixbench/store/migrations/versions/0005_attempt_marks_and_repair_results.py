"""Columns for what practice attempts and repair lines kept inside their text.

- ``practice_attempts.coach_used`` and ``practice_attempts.fuse_blown``: practice kept these as
  ":coach" and ":blown" appended to the scenario id (source, level, family, root fault, seed). The
  marks move into the columns and ``scenario`` keeps the id alone.
- ``repair_actions.value_fitted``: the bench kept the value typed in its "Value fitted" field as
  the line's ``note``. On a replaced part it moves to the new column and ``note`` is left empty.
- ``repair_actions.test_passed``: whether a part tested before power-up passed. Null for a
  replaced part, and for tested parts kept so far: their result was never recorded.

Notes are told apart by their writer. Up to this revision the bench wrote nothing but the value
field into ``note``, and the demo shop wrote only the four sentences in ``DEMO_NOTES``, so a
replaced part's note that is none of those is a value fitted. A tested part's note is left where it
is: what a technician typed into "Value fitted" for a part not fitted is not a value, and says
nothing reliable about the result. The demo's "tested good before power-up" does: it is a pass.

On SQLite both tables are rebuilt in batch mode, as in 0002 and 0003, under the foreign-keys-off
discipline of ``fixbench.store.migrate``. The backfill rules are frozen copies of the writers and
readers at revision 0004 (a migration must not change when application code does).

Revision ID: 0005
Revises: 0004
"""

import sqlalchemy as sa
from alembic import op

revision = "0005"
down_revision = "0004"
branch_labels = None
depends_on = None

# The marks practice appended, and the fields of the scenario id before them (the reader at 0004
# counted marks only after these five).
COACH_MARK, BLOWN_MARK = "coach", "blown"
SCENARIO_FIELDS = 5

# Every note the demo shop's writer kept on a repair line up to this revision.
DEMO_NOTES = ("replaced as the diagnosis concluded", "failed its test before power-up",
              "tested good before power-up", "found on a second look after a failed check")
DEMO_TESTED_GOOD = "tested good before power-up"

_attempts = sa.table("practice_attempts", sa.column("id", sa.Integer),
                     sa.column("scenario", sa.Text), sa.column("coach_used", sa.Boolean),
                     sa.column("fuse_blown", sa.Boolean))
_repairs = sa.table("repair_actions", sa.column("action", sa.String),
                    sa.column("note", sa.Text), sa.column("value_fitted", sa.Text),
                    sa.column("test_passed", sa.Boolean))


def _recreate() -> str:
    return "always" if op.get_bind().dialect.name == "sqlite" else "auto"


def upgrade() -> None:
    with op.batch_alter_table("practice_attempts", recreate=_recreate()) as batch:
        batch.add_column(sa.Column("coach_used", sa.Boolean, nullable=False,
                                   server_default=sa.false()))
        batch.add_column(sa.Column("fuse_blown", sa.Boolean, nullable=False,
                                   server_default=sa.false()))
    with op.batch_alter_table("repair_actions", recreate=_recreate()) as batch:
        batch.add_column(sa.Column("value_fitted", sa.Text, nullable=True))
        batch.add_column(sa.Column("test_passed", sa.Boolean, nullable=True))
    _move_attempt_marks()
    op.execute(_repairs.update()
               .where(_repairs.c.action == "replaced", _repairs.c.note != "",
                      _repairs.c.note.not_in(DEMO_NOTES))
               .values(value_fitted=_repairs.c.note, note=""))
    op.execute(_repairs.update()
               .where(_repairs.c.action == "tested", _repairs.c.note == DEMO_TESTED_GOOD)
               .values(test_passed=True))


def _move_attempt_marks() -> None:
    """Strip the marks off each marked scenario id and set the columns they stood for."""
    bind = op.get_bind()
    marked = bind.execute(sa.select(_attempts.c.id, _attempts.c.scenario).where(sa.or_(
        _attempts.c.scenario.like(f"%:{COACH_MARK}%"),
        _attempts.c.scenario.like(f"%:{BLOWN_MARK}%")))).all()
    moved = []
    for attempt_id, scenario in marked:
        fields = scenario.split(":")
        marks = fields[SCENARIO_FIELDS:]
        if COACH_MARK not in marks and BLOWN_MARK not in marks:
            continue  # the text only happens to hold the word
        kept = fields[:SCENARIO_FIELDS] + [m for m in marks if m not in (COACH_MARK, BLOWN_MARK)]
        moved.append({"attempt_id": attempt_id, "new_scenario": ":".join(kept),
                      "coach": COACH_MARK in marks, "blown": BLOWN_MARK in marks})
    if moved:
        bind.execute(_attempts.update().where(_attempts.c.id == sa.bindparam("attempt_id"))
                     .values(scenario=sa.bindparam("new_scenario"),
                             coach_used=sa.bindparam("coach"),
                             fuse_blown=sa.bindparam("blown")), moved)


def downgrade() -> None:
    # Put the marks and values back where revision 0004's code reads them (a value fitted on a line
    # that also has a note of its own is lost, as is every test result).
    bind = op.get_bind()
    rows = bind.execute(sa.select(_attempts.c.id, _attempts.c.scenario, _attempts.c.coach_used,
                                  _attempts.c.fuse_blown)
                        .where(sa.or_(_attempts.c.coach_used, _attempts.c.fuse_blown))).all()
    if rows:
        bind.execute(_attempts.update().where(_attempts.c.id == sa.bindparam("attempt_id"))
                     .values(scenario=sa.bindparam("new_scenario")),
                     [{"attempt_id": i, "new_scenario": ":".join(
                         [s] + [COACH_MARK] * bool(coach) + [BLOWN_MARK] * bool(blown))}
                      for i, s, coach, blown in rows])
    op.execute(_repairs.update()
               .where(_repairs.c.value_fitted.is_not(None), _repairs.c.note == "")
               .values(note=_repairs.c.value_fitted))
    with op.batch_alter_table("repair_actions", recreate=_recreate()) as batch:
        batch.drop_column("test_passed")
        batch.drop_column("value_fitted")
    with op.batch_alter_table("practice_attempts", recreate=_recreate()) as batch:
        batch.drop_column("fuse_blown")
        batch.drop_column("coach_used")
