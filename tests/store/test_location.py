"""Where the database lives: explicit value, then FIXBENCH_DB, then the user data folder."""

from __future__ import annotations

from pathlib import Path

import pytest

from fixbench.store import location
from fixbench.store.location import (backup_folder, demo_database_path, demo_working_copy,
                                     resolve_url, sqlite_path)


def test_explicit_path_wins_over_environment(monkeypatch, tmp_path):
    monkeypatch.setenv("FIXBENCH_DB", str(tmp_path / "env.sqlite"))
    assert resolve_url(tmp_path / "mine.sqlite") == f"sqlite:///{tmp_path / 'mine.sqlite'}"


def test_environment_used_when_nothing_explicit(monkeypatch, tmp_path):
    monkeypatch.setenv("FIXBENCH_DB", "postgresql+psycopg://bench@server/shop")
    assert resolve_url(None) == "postgresql+psycopg://bench@server/shop"


def test_default_is_a_file_in_the_user_data_folder(monkeypatch, tmp_path):
    monkeypatch.delenv("FIXBENCH_DB", raising=False)
    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path))
    url = resolve_url(None)
    assert sqlite_path(url) == tmp_path / "fixbench" / "fixbench.sqlite"


def test_relative_path_is_made_absolute_and_backups_sit_beside_it(monkeypatch, tmp_path):
    monkeypatch.chdir(tmp_path)
    path = sqlite_path(resolve_url("shop.sqlite"))
    assert path == tmp_path / "shop.sqlite"
    assert backup_folder(path) == tmp_path / "shop-backups"
    assert sqlite_path("postgresql+psycopg://x/y") is None
    assert sqlite_path("sqlite://") is None
    assert isinstance(path, Path)


def test_demo_database_is_found_inside_the_package_first_then_beside_it(monkeypatch, tmp_path):
    package = tmp_path / "site" / "fixbench"
    monkeypatch.setattr(location, "PACKAGE_DIR", package)
    assert demo_database_path() is None
    checkout = tmp_path / "site" / "demo_db" / "fixbench-demo.sqlite"
    checkout.parent.mkdir(parents=True)
    checkout.write_bytes(b"")
    assert demo_database_path() == checkout
    shipped = package / "demo_files" / "fixbench-demo.sqlite"
    shipped.parent.mkdir(parents=True)
    shipped.write_bytes(b"")
    assert demo_database_path() == shipped


def test_demo_is_opened_from_a_fresh_copy_and_the_shipped_file_is_untouched(monkeypatch, tmp_path):
    package = tmp_path / "site" / "fixbench"
    shipped = package / "demo_files" / "fixbench-demo.sqlite"
    shipped.parent.mkdir(parents=True)
    shipped.write_bytes(b"the shipped history")
    monkeypatch.setattr(location, "PACKAGE_DIR", package)
    copy = demo_working_copy(tmp_path / "data")
    assert copy == tmp_path / "data" / "demo-shop" / "fixbench-demo.sqlite"
    copy.write_bytes(b"changed while trying the demo")
    copy.with_name(copy.name + "-wal").write_bytes(b"stale")
    assert demo_working_copy(tmp_path / "data").read_bytes() == b"the shipped history"
    assert not copy.with_name(copy.name + "-wal").exists()
    assert shipped.read_bytes() == b"the shipped history"


def test_the_committed_demo_database_opens_as_a_fixbench_shop(tmp_path):
    from fixbench.store import open_store
    from fixbench.store.case_list import case_count

    if demo_database_path() is None:
        pytest.skip("this checkout has no demo database")
    store = open_store(demo_working_copy(tmp_path))
    try:
        assert case_count(store) > 300
    finally:
        store.close()
