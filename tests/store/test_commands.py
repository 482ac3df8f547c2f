"""The backup, restore, export and demo-db commands as a person runs them."""

from __future__ import annotations

import json

import pytest

from sqlalchemy import func, select

from fixbench.cli import main
from fixbench.store import open_store
from fixbench.store.digest import content_digest
from fixbench.store.models import Case
from fixbench.store.people import add_device, add_technician
from tests.store.conftest import RATINGS, START, record_case


@pytest.fixture
def shop_file(tmp_path, monkeypatch):
    path = tmp_path / "shop.sqlite"
    store = open_store(path)
    record_case(store, add_technician(store, "Ada"),
                add_device(store, make="Zintrek", model="Z-Mini", kind="phone charger",
                           label_ratings=RATINGS), ticket="K-1", opened=START)
    store.close()
    monkeypatch.setenv("FIXBENCH_DB", str(path))
    return path


def test_backup_then_restore_round_trip(shop_file, capsys):
    assert main(["backup"]) == 0
    assert "backed up to" in capsys.readouterr().out
    assert main(["restore"]) == 0
    assert "restored" in capsys.readouterr().out


def test_restore_without_backups_is_a_usage_error(shop_file, capsys):
    assert main(["restore"]) == 2
    assert "no backups" in capsys.readouterr().err


def test_export_case_prints_json_for_diagnose(shop_file, capsys):
    assert main(["export", "--case", "K-1"]) == 0
    assert json.loads(capsys.readouterr().out)["family"] == "pwm_flyback"


def test_export_of_a_damaged_file_says_so_and_offers_the_backup(shop_file, capsys):
    main(["backup"])
    capsys.readouterr()
    shop_file.write_bytes(b"\x00garbage" * 512)
    assert main(["export", "--case", "K-1"]) == 2
    err = capsys.readouterr().err
    assert "not a fixbench database" in err and "fixbench restore" in err
    assert shop_file.read_bytes() == b"\x00garbage" * 512


def test_demo_db_refuses_an_existing_file(shop_file, capsys):
    assert main(["demo-db", str(shop_file)]) == 2
    assert "already exists" in capsys.readouterr().err


def test_demo_db_builds_one_self_contained_file_and_prints_its_digest(tmp_path, capsys):
    path = tmp_path / "demo.sqlite"
    assert main(["demo-db", str(path), "--seed", "3", "--days", "20"]) == 0
    out = capsys.readouterr().out
    assert "built the demo shop" in out and "(seed 3, 20 days)" in out
    assert sorted(p.name for p in tmp_path.iterdir()) == ["demo.sqlite"]  # no WAL, no leftovers
    store = open_store(path)
    try:
        digest = content_digest(store)
        with store.session() as session:
            cases = session.scalar(select(func.count()).select_from(Case))
    finally:
        store.close()
    assert f"{cases} cases" in out and f"content digest: {digest}" in out
