"""Export: owner-only CSV of a period, and one case as the JSON that diagnose re-runs."""

from __future__ import annotations

import csv
import io
import json
from datetime import timedelta

import pytest

from fixbench.store.cases import add_repair_action
from fixbench.store.errors import OwnerRequired
from fixbench.store.export import CSV_COLUMNS, case_as_json, dump_case_json, export_cases_csv
from fixbench.store.owner import set_owner_passphrase
from tests.store.conftest import RATINGS, START, record_case

PASS = "flux and braid"


def test_csv_holds_cases_opened_in_the_period_only(bench):
    store, tech, device = bench
    set_owner_passphrase(store, PASS)
    for day in range(5):
        record_case(store, tech, device, ticket=f"E-{day}", opened=START + timedelta(days=day))
    out = io.StringIO()
    n = export_cases_csv(store, out, since=START + timedelta(days=1),
                         until=START + timedelta(days=3), passphrase=PASS)
    rows = list(csv.DictReader(io.StringIO(out.getvalue())))
    assert n == 2 and [r["ticket"] for r in rows] == ["E-1", "E-2"]
    assert tuple(rows[0]) == CSV_COLUMNS
    assert rows[0]["technician"] == "Ada Tester" and rows[0]["readings"] == "1"


def test_csv_cells_that_look_like_formulas_are_defused(bench):
    store, tech, device = bench
    set_owner_passphrase(store, PASS)
    record_case(store, tech, device, ticket="=HYPERLINK(1)", opened=START)
    out = io.StringIO()
    export_cases_csv(store, out, since=START, until=START + timedelta(days=1), passphrase=PASS)
    assert next(csv.DictReader(io.StringIO(out.getvalue())))["ticket"] == "'=HYPERLINK(1)"


def test_csv_export_needs_the_owner(bench):
    store, tech, device = bench
    set_owner_passphrase(store, PASS)
    with pytest.raises(OwnerRequired):
        export_cases_csv(store, io.StringIO(), since=START, until=START + timedelta(days=1),
                         passphrase="nope nope")


def test_case_json_has_family_ratings_and_readings_in_order(bench):
    store, tech, device = bench
    case_id = record_case(store, tech, device, ticket="J-1", opened=START)
    data = case_as_json(store, "J-1")
    assert data["family"] == "pwm_flyback" and data["ratings"] == RATINGS
    assert data["readings"] == [{"check": "bulk_voltage", "value": "325 V"}]
    assert data["record"]["confirmed"]["fault"] == "Q1.short"
    assert data["record"]["suspects_after_each_reading"][0][0] == ["Q1.short", 0.7]
    assert case_as_json(store, case_id) == data
    assert json.loads(dump_case_json(store, "J-1")) == data


def test_case_json_lists_repairs(bench):
    store, tech, device = bench
    from fixbench.store.cases import open_case

    case_id = open_case(store, ticket_ref="J-2", device_id=device, technician_id=tech,
                        family_id="pwm_flyback", ratings=RATINGS)
    add_repair_action(store, case_id, part_id="C5", action="replaced", parts_cost_cents=95)
    assert case_as_json(store, "J-2")["record"]["repairs"] == [
        {"part": "C5", "fault": None, "action": "replaced", "parts_cost_cents": 95}]


def test_a_reading_taken_back_is_left_out_of_the_case_file(tmp_path):
    from fixbench.store import open_store
    from fixbench.store.cases import withdraw_last_reading
    from fixbench.store.cases import add_reading, open_case
    from fixbench.store.export import case_as_json
    from fixbench.store.people import add_device, add_technician

    store = open_store(tmp_path / "undo.sqlite")
    tech = add_technician(store, "Ines Vale")
    device = add_device(store, make="Quillon", model="Q-5", kind="USB charger",
                        label_ratings={"output": "5 V", "current": "1 A"})
    case_id = open_case(store, ticket_ref="UN-1", device_id=device, technician_id=tech,
                        family_id="pwm_flyback", ratings={"mains": "230 V", "output": "5 V", "current": "1 A"})
    add_reading(store, case_id, check_id="symptom_dead", typed="yes", value=None, unit=None, outcome="yes", suspects=[])
    add_reading(store, case_id, check_id="fuse_resistance", typed="0.1", value=0.1, unit="ohm", outcome="ok", suspects=[])
    withdraw_last_reading(store, case_id)
    data = case_as_json(store, case_id)
    assert data["readings"] == [{"check": "symptom_dead", "value": "yes"}]
    assert data["record"]["withdrawn_readings"] == [{"check": "fuse_resistance", "value": "0.1"}]
    store.close()


def test_customers_are_left_out_of_the_csv_unless_the_owner_asks(store):
    from tests.store.money_shop import CUSTOMERS, write_money_shop

    write_money_shop(store)
    set_owner_passphrase(store, PASS)
    plain, asked = io.StringIO(), io.StringIO()
    period = dict(since=START.replace(year=2000), until=START.replace(year=2030))
    export_cases_csv(store, plain, passphrase=PASS, **period)
    export_cases_csv(store, asked, passphrase=PASS, with_customers=True, **period)
    name, contact = CUSTOMERS[0]
    assert name not in plain.getvalue() and contact not in plain.getvalue()
    rows = {row["ticket"]: row for row in csv.DictReader(io.StringIO(asked.getvalue()))}
    assert rows["M1"]["customer"] == name and rows["M1"]["customer_contact"] == contact
    assert rows["M5"]["return_of"] == "M1" and rows["M1"]["came_back"] == "yes"
    assert rows["M1"]["price"] == "45.00" and rows["M1"]["parts_cost"] == "2.40"
