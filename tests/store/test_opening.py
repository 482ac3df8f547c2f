"""Opening a shop by what `--db` names: every name that cannot be a shop is one line and exit 2,
nothing is created where it should not be, a newer fixbench's file is left untouched, and what is
created is the owner's alone."""

from __future__ import annotations

import os
import socket
import sqlite3
import stat
import sys

import pytest
from sqlalchemy import text

from fixbench.cli import main
from fixbench.store import open_store
from fixbench.store.backup import backup_database
from fixbench.store.errors import NewerSchema, StoreLocationError
from fixbench.store.people import add_device, add_technician
from tests.store.conftest import RATINGS, START, record_case


def _one_line(capsys, *needles):
    err = capsys.readouterr().err
    assert len(err.strip().splitlines()) == 1, err
    for needle in needles:
        assert needle in err, err
    return err


def _free_port() -> int:
    with socket.socket() as probe:
        probe.bind(("127.0.0.1", 0))
        return probe.getsockname()[1]


@pytest.mark.parametrize("db, message", [
    ("postgresql+psycopg://bench@127.0.0.1:{port}/shop", "cannot reach the database server"),
    ("mysql+nosuchdriver://bench@host/shop", "no such database kind or driver"),
    ("oracle+oracledb://bench@host/shop", "its driver is not installed"),
    ("postgresql+psycopg://bench@[::1/shop", "the database URL does not parse"),
    ("not a url://x", "the database URL does not parse"),
])
def test_a_database_url_that_cannot_be_used_is_one_line(capsys, db, message):
    # Each was a SQLAlchemy or driver traceback.
    assert main(["--db", db.format(port=_free_port()), "export", "--case", "K-1"]) == 2
    _one_line(capsys, message)


def test_a_folder_a_device_and_a_name_too_long_are_one_line_and_create_nothing(tmp_path, capsys):
    assert main(["--db", str(tmp_path), "export", "--case", "K-1"]) == 2
    _one_line(capsys, "is a folder; name the database file")
    too_long = tmp_path / ("a" * 300 + ".sqlite")
    assert main(["--db", str(too_long), "export", "--case", "K-1"]) == 2
    _one_line(capsys, "File name too long")
    with pytest.raises(StoreLocationError, match="File name too long"):
        open_store(too_long)
    assert list(tmp_path.iterdir()) == []


@pytest.mark.skipif(not os.path.exists("/dev/null"), reason="a POSIX device file")
def test_dev_null_is_refused_and_nothing_is_made_beside_it(capsys):
    before = set(os.listdir("/dev"))
    assert main(["--db", "/dev/null", "export", "--case", "K-1"]) == 2
    _one_line(capsys, "/dev/null is not a regular file")
    with pytest.raises(StoreLocationError):
        open_store("/dev/null")
    assert set(os.listdir("/dev")) - before == set()


def test_a_shop_from_a_newer_fixbench_is_named_so_and_left_untouched(tmp_path, capsys):
    # It was a raw alembic "Can't locate revision" traceback, after the file had been switched to WAL.
    path = tmp_path / "shop.sqlite"
    open_store(path).close()
    connection = sqlite3.connect(path, isolation_level=None)
    connection.execute("UPDATE alembic_version SET version_num = '0099'")
    connection.execute("PRAGMA journal_mode=DELETE")
    connection.close()
    before = path.read_bytes()
    with pytest.raises(NewerSchema, match="is from a newer fixbench"):
        open_store(path)
    assert main(["--db", str(path), "export", "--case", "K-1"]) == 2
    _one_line(capsys, "is from a newer fixbench (its records are at schema 0099")
    assert path.read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["shop.sqlite"]


@pytest.mark.postgres
def test_a_server_shop_from_a_newer_fixbench_is_left_untouched(pg_database_url):
    open_store(pg_database_url).close()
    store = open_store(pg_database_url, migrate=False)
    with store.engine.begin() as connection:
        connection.execute(text("UPDATE alembic_version SET version_num = '0099'"))
    store.close()
    with pytest.raises(NewerSchema, match="is from a newer fixbench"):
        open_store(pg_database_url)
    store = open_store(pg_database_url, migrate=False)
    with store.engine.connect() as connection:
        assert connection.execute(text("SELECT version_num FROM alembic_version")).scalar() == "0099"
    store.close()


def _mode(path) -> int:
    return stat.S_IMODE(path.stat().st_mode)


@pytest.mark.skipif(sys.platform == "win32", reason="POSIX permissions")
def test_the_shop_its_wal_backups_and_exports_are_the_owners_alone(tmp_path, capsys):
    # They were 0644 in 0755 folders: readable by every account on the machine, with customers'
    # references and the owner's passphrase hash inside.
    old_umask = os.umask(0o022)
    try:
        folder = tmp_path / "shop-folder" / "inner"
        path = folder / "shop.sqlite"
        store = open_store(path)
        tech = add_technician(store, "Ada")
        device = add_device(store, make="Zintrek", model="Z-Mini", kind="phone charger",
                            label_ratings=RATINGS)
        record_case(store, tech, device, ticket="P-1", opened=START)
        assert _mode(folder / "shop.sqlite-wal") == 0o600 and _mode(folder / "shop.sqlite-shm") == 0o600
        made = backup_database(path)
        store.close()
        out = tmp_path / "case.json"
        assert main(["--db", str(path), "export", "--case", "P-1", "--out", str(out)]) == 0
    finally:
        os.umask(old_umask)
    assert _mode(tmp_path / "shop-folder") == 0o700 and _mode(folder) == 0o700
    assert _mode(path) == 0o600
    assert _mode(made.path) == 0o600 and _mode(made.path.parent) == 0o700
    assert _mode(out) == 0o600


@pytest.mark.parametrize("command", [["backup"], ["backup", "--list"], ["restore"], ["cases"],
                                     ["export", "--case", "K-1"]])
@pytest.mark.parametrize("name", ["folder", "too long", "device"])
def test_every_command_on_a_name_that_cannot_be_a_shop_is_one_line(tmp_path, capsys, command, name):
    db = {"folder": str(tmp_path), "too long": str(tmp_path / ("a" * 300 + ".sqlite")),
          "device": os.devnull}[name]
    code = main(["--db", db, *command])
    err = capsys.readouterr().err
    if command == ["backup", "--list"] and name != "too long":
        assert code == 0  # nothing listed: no backups of a folder or a device
        return
    assert code == 2 and len(err.strip().splitlines()) == 1, err
    assert list(tmp_path.iterdir()) == []
