"""Migrations: a database made by the first schema, full of rows, upgrades and keeps every row."""

from __future__ import annotations

import json
from datetime import datetime, timedelta

import pytest
from alembic.autogenerate import compare_metadata
from alembic.runtime.migration import MigrationContext
from sqlalchemy import DateTime, bindparam, text

from fixbench.store import open_store
from fixbench.store.case_flags import recompute_all_flags
from fixbench.store.migrate import MigrationBrokeForeignKeys, current_revision, head_revision, upgrade
from fixbench.store.models import Base

# Every shop here is migrated by alembic, not copied from one migrated earlier (tests/conftest.py).
pytestmark = pytest.mark.migrations

TABLES = ("technicians", "devices", "cases", "readings", "suspects", "repair_actions",
          "verifications", "practice_attempts", "amendments")


def _sql(statement: str):
    """Plain SQL whose :at parameter is a timestamp (so each driver adapts it properly)."""
    query = text(statement)
    return query.bindparams(bindparam("at", type_=DateTime())) if ":at" in statement else query


def _fill_v1(connection, cases: int) -> None:
    """Rows written the way the first schema's code wrote them (plain SQL, no ORM)."""
    now = datetime(2023, 5, 1, 10, 0)
    connection.execute(_sql("INSERT INTO technicians (id, name, role, active) VALUES "
                            "(1, 'Mara Okonkwo-Lind', 'technician', true), "
                            "(2, 'Pip Trainee', 'trainee', true)"))
    connection.execute(_sql("INSERT INTO devices (id, make, model, kind, label_ratings) "
                            "VALUES (1, 'Quillon', 'QX-5', 'phone charger', :r)"),
                       {"r": json.dumps({"output": "5 V"})})
    for c in range(1, cases + 1):
        connection.execute(_sql(
            "INSERT INTO cases (id, ticket_ref, device_id, technician_id, family_id, ratings, "
            "status, outcome, opened_at, closed_at, bench_minutes, confirmed_fault, notes) VALUES "
            "(:id, :t, 1, 1, 'pwm_flyback', '{}', 'closed', 'repaired', :at, :at, 20, "
            "'Q1.short', 'ok')"), {"id": c, "t": f"V1-{c}", "at": now})
        for seq in (1, 2):
            rid = c * 10 + seq
            connection.execute(_sql(
                "INSERT INTO readings (id, case_id, seq, check_id, typed, value, unit, entered_at) "
                "VALUES (:id, :c, :s, 'bulk_voltage', '325 V', 325.0, 'V', :at)"),
                {"id": rid, "c": c, "s": seq, "at": now})
            top = "Q1.short" if seq == 2 else "F1.open"
            connection.execute(_sql(
                "INSERT INTO suspects (reading_id, rank, fault_id, probability) VALUES "
                "(:r, 1, :f, 0.6), (:r, 2, 'R3.open', 0.3)"), {"r": rid, "f": top})
        connection.execute(_sql(
            "INSERT INTO repair_actions (case_id, part_id, action, parts_cost_cents, done_at, note)"
            " VALUES (:c, 'Q1', 'replaced', 150, :at, '')"), {"c": c, "at": now})
        if c % 10 == 7:  # every tenth case failed its first verification
            connection.execute(_sql(
                "INSERT INTO verifications (case_id, check_id, typed, passed, entered_at) "
                "VALUES (:c, 'output_voltage', '0 V', false, :at)"), {"c": c, "at": now})
        connection.execute(_sql(
            "INSERT INTO verifications (case_id, check_id, typed, passed, entered_at) "
            "VALUES (:c, 'output_voltage', '5 V', true, :at)"), {"c": c, "at": now})
        connection.execute(_sql(
            "INSERT INTO amendments (case_id, field, old_value, new_value, amended_by, "
            "amended_at, reason) VALUES (:c, 'notes', '\"\"', '\"ok\"', 'Owner', :at, 'typo')"),
            {"c": c, "at": now})
    connection.execute(_sql(
        "INSERT INTO practice_attempts (trainee_id, scenario, checks_used, minutes, score, "
        "safety_slips, attempted_at) VALUES (2, 'open_startup_resistor', 6, 12.5, 0.8, 1, :at)"),
        {"at": now})


def _counts(store) -> dict[str, int]:
    with store.engine.connect() as connection:
        return {t: connection.execute(text(f"SELECT count(*) FROM {t}")).scalar() for t in TABLES}


def test_first_schema_database_with_rows_upgrades_keeping_every_row(store_url):
    store = open_store(store_url, migrate=False)
    upgrade(store, "0001")
    with store.engine.begin() as connection:
        _fill_v1(connection, cases=60)
    before = _counts(store)
    assert before["readings"] == 120 and before["suspects"] == 240

    upgrade(store, "head")

    assert _counts(store) == before
    with store.engine.connect() as connection:
        assert current_revision(connection) == head_revision()
        tops = connection.execute(text("SELECT DISTINCT top_suspect_fault FROM cases")).all()
    assert tops == [("Q1.short",)]  # filled from the rank-1 suspect of the last reading
    # One unit, every case opened and closed at the same moment: each repaired case but the last
    # (by opening time, then id) has a next case 0 days after its closing, so it came back.
    flags = _flags(store)
    assert [c for c, (back, _) in flags.items() if not back] == [60]
    assert [c for c, (_, failed) in flags.items() if failed] == [7, 17, 27, 37, 47, 57]
    # The migration's frozen backfill and the store's live rule agree.
    with store.engine.begin() as connection:
        recompute_all_flags(connection)
    assert _flags(store) == flags
    store.close()


def _flags(store) -> dict[int, tuple[bool, bool]]:
    with store.engine.connect() as connection:
        return {c: (bool(back), bool(failed)) for c, back, failed in connection.execute(text(
            "SELECT id, came_back, failed_verification FROM cases ORDER BY id"))}


def test_migrated_schema_matches_the_models(store_url):
    store = open_store(store_url)
    with store.engine.connect() as connection:
        diff = compare_metadata(MigrationContext.configure(connection), Base.metadata)
    assert diff == []
    store.close()


def test_migration_that_would_orphan_child_rows_is_rolled_back(tmp_path, monkeypatch):
    path = tmp_path / "orphan.sqlite"
    store = open_store(path, migrate=False)
    upgrade(store, "0001")
    with store.engine.begin() as connection:
        _fill_v1(connection, cases=3)
    before = _counts(store)
    from fixbench.store import migrate

    real = migrate._run_alembic

    def upgrade_then_lose_a_parent(connection, revision):
        real(connection, revision)
        connection.exec_driver_sql("DELETE FROM cases WHERE id = 1")

    monkeypatch.setattr(migrate, "_run_alembic", upgrade_then_lose_a_parent)
    with pytest.raises(MigrationBrokeForeignKeys):
        upgrade(store, "head")
    assert _counts(store) == before
    with store.engine.connect() as connection:
        assert current_revision(connection) == "0001"
        assert connection.exec_driver_sql("PRAGMA foreign_keys").scalar() == 1
    store.close()


# Rows as revision 0004's code wrote them: marks appended to the scenario id, the bench's value
# fitted (and the demo shop's sentences) in the repair line's note.
ATTEMPTS_AT_0004 = {
    1: "drawn:normal:pwm_flyback:Q1.short:s3:coach",
    2: "replay:easy:self_oscillating:R1.open:s7:blown",
    3: "drawn:hard:primary_side:C3.dried:s1:coach:blown",
    4: "drawn:easy:pwm_flyback:R3.open:s2",
    5: "open_startup_resistor",  # the first schema's demo kept a bare fault id
    6: "blown:coach",  # no scenario id before the words: the 0004 reader saw no marks here
}
REPAIRS_AT_0004 = {  # id: (action, note)
    1: ("replaced", "22 uF 50 V"),
    2: ("replaced", ""),
    3: ("replaced", "replaced as the diagnosis concluded"),
    4: ("tested", "tested good before power-up"),
    5: ("tested", "looked fine"),
    6: ("replaced", "found on a second look after a failed check"),
    7: ("tested", ""),
}


def test_revision_0004_marks_and_bench_values_move_into_their_columns(store_url):
    store = open_store(store_url, migrate=False)
    upgrade(store, "0004")
    with store.engine.begin() as connection:
        _fill_v1(connection, cases=1)
        for attempt_id, scenario in ATTEMPTS_AT_0004.items():
            connection.execute(_sql(
                "INSERT INTO practice_attempts (id, trainee_id, scenario, checks_used, minutes, "
                "score, safety_slips, attempted_at) VALUES (:id, 2, :s, 6, 12.5, 80, 0, :at)"),
                {"id": 100 + attempt_id, "s": scenario, "at": datetime(2024, 2, 1)})
        for repair_id, (action, note) in REPAIRS_AT_0004.items():
            connection.execute(_sql(
                "INSERT INTO repair_actions (id, case_id, part_id, action, parts_cost_cents, "
                "done_at, note) VALUES (:id, 1, 'C2', :a, 45, :at, :n)"),
                {"id": 100 + repair_id, "a": action, "n": note, "at": datetime(2024, 2, 1)})
    before = _counts(store)

    upgrade(store, "head")

    assert _counts(store) == before
    with store.engine.connect() as connection:
        attempts = {i - 100: (s, bool(c), bool(b)) for i, s, c, b in connection.execute(text(
            "SELECT id, scenario, coach_used, fuse_blown FROM practice_attempts WHERE id > 100"))}
        repairs = {i - 100: (n, v, None if p is None else bool(p)) for i, n, v, p in
                   connection.execute(text("SELECT id, note, value_fitted, test_passed "
                                           "FROM repair_actions WHERE id > 100"))}
    assert attempts == {
        1: ("drawn:normal:pwm_flyback:Q1.short:s3", True, False),
        2: ("replay:easy:self_oscillating:R1.open:s7", False, True),
        3: ("drawn:hard:primary_side:C3.dried:s1", True, True),
        4: ("drawn:easy:pwm_flyback:R3.open:s2", False, False),
        5: ("open_startup_resistor", False, False),
        6: ("blown:coach", False, False),
    }
    assert repairs == {
        1: ("", "22 uF 50 V", None),  # the bench's value field
        2: ("", None, None),
        3: ("replaced as the diagnosis concluded", None, None),  # the demo's free notes stay
        4: ("tested good before power-up", None, True),
        5: ("looked fine", None, None),  # a tested part's note says nothing reliable
        6: ("found on a second look after a failed check", None, None),
        7: ("", None, None),
    }
    store.close()


def test_revision_0005_attempts_keep_their_rows_and_know_nothing_of_what_they_taught(store_url):
    store = open_store(store_url, migrate=False)
    upgrade(store, "0005")
    with store.engine.begin() as connection:
        _fill_v1(connection, cases=1)
        connection.execute(_sql(
            "INSERT INTO practice_attempts (id, trainee_id, scenario, checks_used, minutes, score, "
            "safety_slips, attempted_at, coach_used, fuse_blown) VALUES "
            "(200, 2, 'drawn:normal:pwm_flyback:Q1.short:s3', 6, 12.5, 80, 1, :at, true, false)"),
            {"at": datetime(2024, 2, 1)})
    before = _counts(store)

    upgrade(store, "head")

    assert _counts(store) == before
    with store.engine.connect() as connection:
        row = connection.execute(text(
            "SELECT scenario, coach_used, fault_right, slip_kinds, checks_wasted, record "
            "FROM practice_attempts WHERE id = 200")).one()
    assert (row[0], bool(row[1])) == ("drawn:normal:pwm_flyback:Q1.short:s3", True)
    assert tuple(row[2:]) == (None, None, None, None)
    store.close()


def test_revision_0006_customer_references_parts_and_returns_move_to_their_places(store_url):
    """Customer references become customers, repair lines sum into the job's parts, and each
    repaired unit's next job within 90 days becomes its linked warranty return, so every job
    that came back before still has."""
    store = open_store(store_url, migrate=False)
    upgrade(store, "0006")
    at = datetime(2024, 2, 1, 9)
    with store.engine.begin() as connection:
        _fill_v1(connection, cases=4)  # one unit, four repaired jobs at the same moment
        connection.execute(_sql("INSERT INTO devices (id, make, model, kind, label_ratings) "
                                "VALUES (2, 'Tarnwick', 'TW-9', 'usb adapter', '{}')"))
        for case_id, ref, days in ((10, "Mrs Example", 0), (11, "Mrs Example", 200),
                                   (12, None, 210)):
            connection.execute(_sql(
                "INSERT INTO cases (id, ticket_ref, customer_ref, device_id, technician_id, "
                "family_id, ratings, status, outcome, opened_at, closed_at, bench_minutes, notes) "
                "VALUES (:id, :t, :ref, 2, 1, 'pwm_flyback', '{}', 'closed', 'repaired', :at, "
                ":at, 20, '')"), {"id": case_id, "t": f"C-{case_id}", "ref": ref,
                                  "at": at + timedelta(days=days)})
        connection.execute(_sql(
            "INSERT INTO repair_actions (case_id, part_id, action, parts_cost_cents, done_at, note)"
            " VALUES (10, 'C1', 'replaced', 240, :at, ''), (10, 'F1', 'tested', 0, :at, '')"),
            {"at": at})
    before = _counts(store)

    upgrade(store, "head")

    assert _counts(store) == before
    # The rule up to 0006: a repaired job whose unit's next job opened within 90 days of its
    # closing came back: jobs 1-3 (the next one 0 days after) and C-11 (C-12 ten days after).
    assert {c for c, (back, _) in _flags(store).items() if back} == {1, 2, 3, 11}
    with store.engine.connect() as connection:
        customers = connection.execute(text("SELECT id, name FROM customers")).all()
        rows = {c: (customer, parts, back_of) for c, customer, parts, back_of in connection.execute(
            text("SELECT id, customer_id, parts_cents, comeback_of_id FROM cases"))}
    assert [name for _id, name in customers] == ["Mrs Example"]
    (mrs,) = [customer_id for customer_id, _name in customers]
    assert rows[10] == (mrs, 240, None) and rows[11] == (mrs, 0, None)
    assert rows[12] == (None, 0, 11)  # ten days after C-11 closed, on the same unit
    assert [rows[c][2] for c in (1, 2, 3, 4)] == [None, 1, 2, 3]
    assert rows[1][1] == 150  # the first schema's one replaced part
    store.close()
