"""Fixtures for store tests: a fresh store per test on SQLite and, when a server is given, PostgreSQL.

Set FIXBENCH_TEST_PG_URL (see .ci/start-postgres) to run the ``postgres`` half; each test then
gets its own freshly created database on that server, dropped afterwards. A store's database is
created at the head revision as a copy of one migrated once per run (PostgreSQL's CREATE DATABASE
... TEMPLATE; SQLite's copy is made by tests/conftest.py), except in tests marked ``migrations``,
whose databases start empty.
"""

from __future__ import annotations

import os
import uuid
from collections.abc import Iterator
from contextlib import contextmanager
from datetime import datetime, timedelta

import pytest
from sqlalchemy import create_engine, text
from sqlalchemy.engine import make_url

from fixbench.store import open_store
from fixbench.store.cases import (RankedSuspect, add_reading, add_verification, close_case,
                                  open_case)
from fixbench.store.migrate import upgrade_to_head
from fixbench.store.people import add_device, add_technician

PG_ENV = "FIXBENCH_TEST_PG_URL"
RATINGS = {"mains": "230 V", "frequency": "50 Hz", "output": "5 V", "current": "2 A"}


def _pg_server() -> str:
    base = os.environ.get(PG_ENV)
    if not base:
        pytest.skip(f"{PG_ENV} is not set")
    return base


@contextmanager
def _pg_database(base: str, template: str | None = None) -> Iterator[str]:
    """A new database on the server (a copy of ``template`` if given), dropped afterwards."""
    name = f"fixbench_test_{uuid.uuid4().hex[:12]}"
    copied = f' TEMPLATE "{template}"' if template else ""
    admin = create_engine(base, isolation_level="AUTOCOMMIT")
    with admin.connect() as connection:
        connection.execute(text(f'CREATE DATABASE "{name}"{copied}'))
    try:
        yield make_url(base).set(database=name).render_as_string(hide_password=False)
    finally:
        with admin.connect() as connection:
            connection.execute(text(f'DROP DATABASE "{name}" WITH (FORCE)'))
        admin.dispose()


@pytest.fixture
def pg_database_url():
    """A brand-new empty database on the test PostgreSQL server (skipped when none is set)."""
    with _pg_database(_pg_server()) as url:
        yield url


@pytest.fixture(scope="session")
def pg_head_template():
    """The name of an empty database at the head revision, migrated once per run."""
    with _pg_database(_pg_server()) as url:
        store = open_store(url, migrate=False)
        upgrade_to_head(store)
        store.close()  # a template database takes no connections while it is copied
        yield make_url(url).database


@pytest.fixture(params=["sqlite", pytest.param("postgres", marks=pytest.mark.postgres)])
def store_url(request, tmp_path):
    if request.param == "sqlite":
        yield str(tmp_path / "shop.sqlite")
    elif request.node.get_closest_marker("migrations") is not None:
        yield request.getfixturevalue("pg_database_url")
    else:
        with _pg_database(_pg_server(), request.getfixturevalue("pg_head_template")) as url:
            yield url


@pytest.fixture
def store(store_url):
    opened = open_store(store_url)
    yield opened
    opened.close()


@pytest.fixture
def sqlite_store(tmp_path):
    opened = open_store(tmp_path / "shop.sqlite")
    yield opened
    opened.close()


@pytest.fixture
def bench(store):
    """A store with one technician and one device, ready for cases."""
    tech = add_technician(store, "Ada Tester")
    device = add_device(store, make="Quillon", model="QX-5", kind="phone charger",
                        label_ratings=RATINGS)
    return store, tech, device


def record_case(store, tech, device, *, ticket, opened, minutes=30, outcome="repaired",
                fault="Q1.short", part="Q1", stage="switch", top=None, family="pwm_flyback",
                closed_after=timedelta(hours=2), verifications=()):
    """Open, read once and close a case; returns its id (test data builder)."""
    case_id = open_case(store, ticket_ref=ticket, device_id=device, technician_id=tech,
                        family_id=family, ratings=RATINGS, opened_at=opened)
    add_reading(store, case_id, check_id="bulk_voltage", typed="325 V", value=325.0, unit="V",
                outcome=None, suspects=[RankedSuspect(top or fault, 0.7, part, stage),
                                        RankedSuspect("F1.open", 0.2, "F1", "input")],
                entered_at=opened + timedelta(minutes=5))
    for passed in verifications:
        add_verification(store, case_id, check_id="output_voltage", typed="5 V", value=5.0,
                         unit="V", outcome=None, passed=passed)
    close_case(store, case_id, outcome=outcome, bench_minutes=minutes,
               confirmed_fault=fault if outcome == "repaired" else None,
               confirmed_part=part if outcome == "repaired" else None,
               confirmed_stage=stage if outcome == "repaired" else None,
               closed_at=opened + closed_after)
    return case_id


START = datetime(2024, 1, 8, 9, 0)
