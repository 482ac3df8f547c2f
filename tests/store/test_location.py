"""Where the database lives: explicit value, then FIXBENCH_DB, then the user data folder."""

from __future__ import annotations

from pathlib import Path

from fixbench.store.location import backup_folder, resolve_url, sqlite_path


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
