"""The session factory: SQLite durability settings, concurrent benches, and killed processes."""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap

from sqlalchemy import func, select

from fixbench.store import open_store
from fixbench.store.cases import open_case
from fixbench.store.models import ReadingRow
from fixbench.store.people import add_device, add_technician
from tests.store.conftest import RATINGS


def test_sqlite_connections_use_wal_full_sync_foreign_keys_and_busy_timeout(sqlite_store):
    with sqlite_store.engine.connect() as connection:
        pragma = lambda name: connection.exec_driver_sql(f"PRAGMA {name}").scalar()  # noqa: E731
        assert pragma("journal_mode") == "wal"
        assert pragma("synchronous") == 2  # FULL (sqlite.org/pragma.html#pragma_synchronous)
        assert pragma("foreign_keys") == 1
        assert pragma("busy_timeout") == 30_000


def test_write_transactions_begin_immediate(sqlite_store):
    statements = []
    from sqlalchemy import event

    event.listen(sqlite_store.engine, "before_cursor_execute",
                 lambda conn, cur, stmt, *a: statements.append(stmt))
    add_technician(sqlite_store, "Bo")
    assert "BEGIN IMMEDIATE" in statements


def _setup_case(path):
    store = open_store(path)
    tech = add_technician(store, "Writer")
    device = add_device(store, make="Tarnwick", model="TW-1", kind="usb adapter",
                        label_ratings=RATINGS)
    case_id = open_case(store, ticket_ref="C-1", device_id=device, technician_id=tech,
                        family_id="pwm_flyback", ratings=RATINGS)
    store.close()
    return case_id


BENCH_WRITER = textwrap.dedent("""
    import sys
    from fixbench.store import open_store
    from fixbench.store.cases import RankedSuspect, add_reading
    path, case_id, label, count = sys.argv[1], int(sys.argv[2]), sys.argv[3], int(sys.argv[4])
    store = open_store(path)
    for i in range(count):
        add_reading(store, case_id, check_id=f"{label}-{i}", typed=f"{i} V", value=float(i),
                    unit="V", outcome=None, suspects=[RankedSuspect("Q1.short", 0.5)])
    store.close()
""")


def test_two_processes_writing_one_file_lose_nothing(tmp_path):
    path = str(tmp_path / "shared.sqlite")
    case_id = _setup_case(path)
    # Two separate interpreters, as two bench PCs would be (a script, so any pytest import mode
    # works in the child).
    workers = [subprocess.Popen([sys.executable, "-c", BENCH_WRITER, path, str(case_id), name,
                                 "150"], stderr=subprocess.PIPE, text=True, cwd=os.getcwd())
               for name in ("bench-a", "bench-b")]
    errors = [worker.communicate(timeout=120)[1] for worker in workers]
    # A "database is locked" error would end a worker with a non-zero exit code.
    assert [w.returncode for w in workers] == [0, 0], errors
    store = open_store(path)
    with store.session() as session:
        seqs = session.scalars(select(ReadingRow.seq).order_by(ReadingRow.seq)).all()
        per_bench = dict(session.execute(
            select(func.substr(ReadingRow.check_id, 1, 7), func.count()).group_by(
                func.substr(ReadingRow.check_id, 1, 7))).all())
    assert seqs == list(range(1, 301))
    assert per_bench == {"bench-a": 150, "bench-b": 150}


KILLED_WRITER = textwrap.dedent("""
    import sys
    from fixbench.store import open_store
    from fixbench.store.cases import RankedSuspect, add_reading
    store = open_store(sys.argv[1])
    i = 0
    while True:
        add_reading(store, int(sys.argv[2]), check_id=f"r{i}", typed="1 V", value=1.0,
                    unit="V", outcome=None, suspects=[RankedSuspect("Q1.short", 1.0)])
        print(i, flush=True)
        i += 1
""")


def test_process_killed_mid_case_loses_no_committed_reading(tmp_path):
    path = str(tmp_path / "killed.sqlite")
    case_id = _setup_case(path)
    writer = subprocess.Popen([sys.executable, "-c", KILLED_WRITER, path, str(case_id)],
                              stdout=subprocess.PIPE, text=True, cwd=os.getcwd())
    reported = []
    for line in writer.stdout:
        reported.append(int(line))
        if len(reported) >= 40:
            break
    writer.send_signal(signal.SIGKILL)
    writer.wait(timeout=30)
    store = open_store(path)
    with store.session() as session:
        kept = set(session.scalars(select(ReadingRow.check_id)))
    assert {f"r{i}" for i in reported} <= kept


def test_reads_do_not_take_the_write_lock(tmp_path):
    """A query while another connection holds the write lock answers at once (WAL readers)."""
    import sqlite3

    from sqlalchemy import text

    from fixbench.store import open_store

    path = tmp_path / "locks.sqlite"
    store = open_store(path)
    writer = sqlite3.connect(path, isolation_level=None)
    writer.execute("BEGIN IMMEDIATE")
    try:
        with store.reading() as session:
            assert session.execute(text("SELECT count(*) FROM cases")).scalar() == 0
        with store.read_connection() as connection:
            assert connection.execute(text("SELECT 1")).scalar() == 1
    finally:
        writer.execute("ROLLBACK")
        writer.close()
        store.close()
