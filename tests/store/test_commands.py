"""The backup, restore, export and demo-db commands as a person runs them."""

from __future__ import annotations

import getpass
import json
from datetime import timedelta

import pytest

from sqlalchemy import func, select

from fixbench.cli import main
from fixbench.store import open_store
from fixbench.store.digest import content_digest
from fixbench.store.cases import open_case
from fixbench.store.customers import find_or_add_customer
from fixbench.store.models import Case
from fixbench.store.owner import set_owner_passphrase
from fixbench.store.people import add_device, add_technician
from tests.store.conftest import RATINGS, START, record_case


OWNER = "owner-passphrase-1"


@pytest.fixture
def shop_file(tmp_path, monkeypatch):
    path = tmp_path / "shop.sqlite"
    store = open_store(path)
    set_owner_passphrase(store, OWNER)
    record_case(store, add_technician(store, "Ada"),
                add_device(store, make="Zintrek", model="Z-Mini", kind="phone charger",
                           label_ratings=RATINGS), ticket="K-1", opened=START)
    customer = find_or_add_customer(store, "Mrs Quorrel", "0123")
    with store.session() as session:
        session.scalars(select(Case)).one().customer_id = customer
    store.close()
    monkeypatch.setenv("FIXBENCH_DB", str(path))
    return path


@pytest.fixture
def owner_types(monkeypatch):
    """The owner at the keyboard: getpass answers with what the test puts in ``typed``."""
    typed = [OWNER]
    monkeypatch.setattr(getpass, "getpass", lambda prompt="": typed[0])
    return typed


def test_backup_then_restore_round_trip(shop_file, capsys, owner_types):
    assert main(["backup"]) == 0
    assert "backed up to" in capsys.readouterr().out
    assert main(["restore"]) == 0
    out, err = capsys.readouterr()
    assert "The shop has 1 cases now" in err and "it will have 1" in err
    assert "restored" in out


def test_restore_without_backups_is_a_usage_error(shop_file, capsys):
    assert main(["restore"]) == 2
    assert "no good backup" in capsys.readouterr().err


def test_restore_of_an_empty_file_is_refused_and_a_backup_after_keeps_the_cases(shop_file, tmp_path,
                                                                               capsys, owner_types):
    # `restore empty.sqlite && backup --keep 1` used to leave no case anywhere.
    assert main(["backup"]) == 0
    empty = tmp_path / "empty.sqlite"
    empty.write_bytes(b"")
    assert main(["restore", str(empty)]) == 2
    err = capsys.readouterr().err
    assert "is empty (0 bytes), not a fixbench shop" in err and len(err.strip().splitlines()) == 1
    assert main(["backup", "--keep", "1", "--json"]) == 0
    made = json.loads(capsys.readouterr().out)
    assert made["good"] and made["cases"] == 1


def test_restore_asks_the_owner_and_a_wrong_passphrase_changes_nothing(shop_file, capsys, owner_types):
    assert main(["backup"]) == 0
    before = content_digest_of(shop_file)
    owner_types[0] = "a guess"
    assert main(["restore"]) == 2
    assert "passphrase was not accepted" in capsys.readouterr().err
    assert content_digest_of(shop_file) == before


def test_restore_prints_json_with_the_counts(shop_file, capsys, owner_types):
    assert main(["backup", "--json"]) == 0
    backup = json.loads(capsys.readouterr().out)["backup"]
    assert main(["restore", "--json"]) == 0
    done = json.loads(capsys.readouterr().out)
    assert done["restored_from"] == backup
    assert (done["cases_before"], done["cases_after"]) == (1, 1)
    assert done["previous_backup"] and done["after_backup"] and done["waited_for_another_bench"] is False


def test_backup_list_json_names_each_kind(shop_file, capsys, owner_types):
    main(["backup"])
    main(["restore"])
    capsys.readouterr()
    assert main(["backup", "--list", "--json"]) == 0
    kinds = [b["kind"] for b in json.loads(capsys.readouterr().out)]
    assert kinds == ["good", "before-restore", "good"]


def test_db_is_taken_after_the_command_too(shop_file, tmp_path, capsys, monkeypatch):
    monkeypatch.delenv("FIXBENCH_DB")
    assert main(["export", "--case", "K-1", "--db", str(shop_file)]) == 0
    assert json.loads(capsys.readouterr().out)["record"]["ticket"] == "K-1"
    assert main(["--db", str(tmp_path / "other.sqlite"), "cases", "--db", str(shop_file), "--json"]) == 0
    assert [c["ticket"] for c in json.loads(capsys.readouterr().out)] == ["K-1"]


def test_export_case_prints_json_for_diagnose(shop_file, capsys):
    assert main(["export", "--case", "K-1"]) == 0
    assert json.loads(capsys.readouterr().out)["family"] == "pwm_flyback"


def test_export_case_leaves_the_customer_out_unless_the_owner_asks(shop_file, capsys, owner_types):
    assert main(["export", "--case", "K-1"]) == 0
    out = capsys.readouterr().out
    assert "Quorrel" not in out and "customer" not in json.loads(out)["record"]
    assert main(["export", "--case", "K-1", "--with-customer"]) == 0
    assert json.loads(capsys.readouterr().out)["record"]["customer"] == {"name": "Mrs Quorrel",
                                                                        "contact": "0123"}
    owner_types[0] = "a guess"
    assert main(["export", "--case", "K-1", "--with-customer"]) == 2
    assert "Quorrel" not in "".join(capsys.readouterr())


def test_an_unknown_ticket_names_the_near_ones(shop_file, capsys):
    assert main(["export", "--case", "K-2"]) == 2
    err = capsys.readouterr().err
    assert "there is no case K-2 (did you mean: K-1?)" in err and "fixbench cases" in err


@pytest.mark.parametrize("since", ["yesterday", "2024-13-45", ""])
def test_export_dates_that_are_not_dates_are_one_line(shop_file, capsys, since):
    assert main(["export", "--since", since, "--until", "2024-02-01"]) == 2
    err = capsys.readouterr().err
    assert "is not a date like 2025-03-31" in err and len(err.strip().splitlines()) == 1


def test_export_out_is_left_as_it_was_until_the_passphrase_is_accepted(shop_file, tmp_path, capsys,
                                                                       owner_types):
    out = tmp_path / "figures.csv"
    out.write_text("last month's figures\n")
    owner_types[0] = "a guess"
    assert main(["export", "--since", "2024-01-01", "--until", "2024-02-01", "--out", str(out)]) == 2
    assert out.read_text() == "last month's figures\n"
    owner_types[0] = OWNER
    assert main(["export", "--since", "2024-01-01", "--until", "2024-02-01", "--out", str(out)]) == 0
    assert out.read_text().startswith("ticket,opened_at,")  # customers only when asked for
    assert "Quorrel" not in out.read_text()
    assert sorted(p.name for p in tmp_path.iterdir() if p.name.startswith(".")) == []


def test_export_without_a_terminal_for_the_passphrase_is_one_line(shop_file, capsys, monkeypatch):
    def no_input(prompt=""):
        raise EOFError

    monkeypatch.setattr(getpass, "getpass", no_input)
    assert main(["export", "--since", "2024-01-01", "--until", "2024-02-01"]) == 2
    err = capsys.readouterr().err
    assert "the owner's passphrase is needed to export cases" in err and len(err.strip().splitlines()) == 1


def test_export_json_lists_the_cases_of_the_period(shop_file, capsys, owner_types):
    assert main(["export", "--since", "2024-01-01", "--until", "2024-02-01", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)
    assert [r["ticket"] for r in rows] == ["K-1"] and rows[0]["opened_at"].startswith("2024-01-08")


def test_export_from_a_missing_shop_creates_nothing(tmp_path, capsys):
    # It used to create a new empty database and its folders, then say there was no case.
    missing = tmp_path / "not" / "here" / "shop.sqlite"
    assert main(["--db", str(missing), "export", "--case", "K-1"]) == 2
    assert "there is no shop database at" in capsys.readouterr().err
    assert list(tmp_path.iterdir()) == []


def test_cases_lists_tickets_newest_first_and_the_open_ones(shop_file, capsys):
    store = open_store(shop_file)
    open_case(store, ticket_ref="K-2", device_id=1, technician_id=1, family_id="pwm_flyback",
              ratings=RATINGS, opened_at=START + timedelta(days=1))
    store.close()
    assert main(["cases", "--json"]) == 0
    assert [c["ticket"] for c in json.loads(capsys.readouterr().out)] == ["K-2", "K-1"]
    assert main(["cases", "--open"]) == 0
    out = capsys.readouterr().out
    assert "K-2" in out and "K-1" not in out


def content_digest_of(path) -> str:
    store = open_store(path)
    try:
        return content_digest(store)
    finally:
        store.close()


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


def test_demo_db_json_says_where_what_and_its_digest(tmp_path, capsys):
    path = tmp_path / "small.sqlite"
    assert main(["demo-db", str(path), "--days", "3", "--json"]) == 0
    built = json.loads(capsys.readouterr().out)
    assert built["path"] == str(path) and built["days"] == 3
    assert built["content_digest"] == content_digest_of(path)


def test_a_periods_csv_names_customers_only_when_the_owner_asks(shop_file, tmp_path, owner_types):
    out = tmp_path / "with.csv"
    assert main(["export", "--since", "2024-01-01", "--until", "2024-02-01", "--out", str(out),
                 "--with-customer"]) == 0
    header, row = out.read_text().splitlines()[:2]
    assert header.endswith("customer,customer_contact") and row.endswith("Mrs Quorrel,0123")
