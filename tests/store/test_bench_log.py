"""The bench's own record: undo, skips, caution acknowledgement, settings, and reading a case back."""

from __future__ import annotations

from datetime import timedelta

import pytest
from sqlalchemy import text

from fixbench.store import open_store
from fixbench.store.bench_log import (acknowledge_cautions, find_device, get_setting, known_models,
                                      load_case, open_case_count, open_cases, set_setting,
                                      skip_check, ticket_taken, withdraw_last_reading)
from fixbench.store.cases import RankedSuspect, add_reading, add_repair_action, open_case
from fixbench.store.errors import ClosedCaseError, StoreInputError
from fixbench.store.migrate import current_revision, head_revision, upgrade
from fixbench.store.models import Case
from fixbench.store.people import add_device
from tests.store.conftest import RATINGS, START, record_case


def _open(store, tech, device, ticket="B-1", opened=START):
    return open_case(store, ticket_ref=ticket, device_id=device, technician_id=tech,
                     family_id="pwm_flyback", ratings=RATINGS, opened_at=opened)


def _read(store, case_id, check, typed, top):
    return add_reading(store, case_id, check_id=check, typed=typed, value=None, unit=None,
                       outcome=typed, suspects=[RankedSuspect(top, 0.5, None, None)])


def test_setting_is_kept_replaced_and_defaults_when_missing(store):
    assert get_setting(store, "report_footer") is None
    assert get_setting(store, "report_footer", "none yet") == "none yet"
    set_setting(store, "report_footer", "Brightwater Repairs, bench 2")
    set_setting(store, "report_footer", "Brightwater Repairs, bench 3")
    assert get_setting(store, "report_footer") == "Brightwater Repairs, bench 3"
    with pytest.raises(StoreInputError):
        set_setting(store, "", "x")
    with pytest.raises(StoreInputError):
        set_setting(store, "k" * 65, "x")


def test_undo_withdraws_newest_standing_reading_and_restores_first_suspect(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    _read(store, case_id, "symptom_dead", "yes", "F1.open")
    _read(store, case_id, "look_fuse", "yes", "Q1.short")
    _read(store, case_id, "mosfet_drain_source", "OL", "R3.open")

    withdraw_last_reading(store, case_id)
    record = load_case(store, case_id)
    assert [r.check_id for r in record.readings] == ["symptom_dead", "look_fuse"]
    with store.session() as session:
        assert session.get(Case, case_id).top_suspect_fault == "Q1.short"

    withdraw_last_reading(store, case_id)
    withdraw_last_reading(store, case_id)
    assert withdraw_last_reading(store, case_id) is None
    assert load_case(store, case_id).readings == ()
    with store.session() as session:
        assert session.get(Case, case_id).top_suspect_fault is None
        # Withdrawn readings stay in the record.
        assert session.execute(text("SELECT count(*) FROM readings")).scalar() == 3


def test_skips_and_acknowledgement_are_read_back_once(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    assert load_case(store, case_id).cautions_acknowledged is False
    acknowledge_cautions(store, case_id, tech, at=START)
    acknowledge_cautions(store, case_id, tech, at=START + timedelta(hours=1))
    skip_check(store, case_id, "output_ripple")
    skip_check(store, case_id, "vcc_voltage")
    record = load_case(store, case_id)
    assert record.cautions_acknowledged is True
    assert record.skipped == ("output_ripple", "vcc_voltage")
    assert (record.ticket, record.make, record.model, record.status) == ("B-1", "Quillon", "QX-5",
                                                                          "intake")
    with store.session() as session:
        rows = session.execute(text("SELECT acknowledged_at FROM caution_acknowledgements")).all()
    assert len(rows) == 1


def test_repairs_are_read_back_in_order(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    add_repair_action(store, case_id, part_id="C2", action="replaced", parts_cost_cents=45,
                      value_fitted="22 uF 50 V")
    add_repair_action(store, case_id, part_id="D2", action="tested", test_passed=False)
    add_repair_action(store, case_id, part_id="R3", action="tested", test_passed=True,
                      note="read 0.47 ohm out of circuit")
    repairs = load_case(store, case_id).repairs
    assert [(r.part_id, r.action, r.cost_cents, r.value_fitted, r.test_passed, r.note)
            for r in repairs] == [
        ("C2", "replaced", 45, "22 uF 50 V", None, ""), ("D2", "tested", 0, None, False, ""),
        ("R3", "tested", 0, None, True, "read 0.47 ohm out of circuit")]


def test_closed_case_refuses_bench_writes(bench):
    store, tech, device = bench
    case_id = record_case(store, tech, device, ticket="C-1", opened=START)
    with pytest.raises(ClosedCaseError):
        skip_check(store, case_id, "vcc_voltage")
    with pytest.raises(ClosedCaseError):
        withdraw_last_reading(store, case_id)
    with pytest.raises(ClosedCaseError):
        acknowledge_cautions(store, case_id, tech)


def test_open_cases_list_newest_first_without_closed_ones(bench):
    store, tech, device = bench
    record_case(store, tech, device, ticket="C-1", opened=START)
    older = _open(store, tech, device, "B-1", START + timedelta(days=1))
    newer = _open(store, tech, device, "B-2", START + timedelta(days=2))
    _read(store, older, "symptom_dead", "yes", "F1.open")
    rows = open_cases(store)
    assert [(r.id, r.ticket, r.readings) for r in rows] == [(newer, "B-2", 0), (older, "B-1", 1)]
    assert rows[0].technician == "Ada Tester" and rows[0].make == "Quillon"
    assert open_case_count(store) == 2
    assert [r.ticket for r in open_cases(store, offset=1, limit=1)] == ["B-1"]


def test_known_models_and_comeback_device_and_ticket(bench):
    store, tech, device = bench
    other = add_device(store, make="Larkspur", model="LP-19", kind="laptop adapter",
                       label_ratings={}, serial="SN-77")
    open_case(store, ticket_ref="K-1", device_id=other, technician_id=tech,
              family_id="self_oscillating", ratings={"mains": "universal", "output": "19 V",
                                                      "current": "3.4 A"}, opened_at=START)
    _open(store, tech, device, "K-2", START + timedelta(days=1))
    models = known_models(store)
    assert [m.label for m in models] == ["Larkspur LP-19", "Quillon QX-5"]
    assert models[0].family_id == "self_oscillating" and models[0].ratings["output"] == "19 V"
    assert find_device(store, "larkspur", "lp-19", "SN-77") == other
    assert find_device(store, "Larkspur", "LP-19", "") is None
    assert ticket_taken(store, "K-1") and not ticket_taken(store, "K-9")


def test_database_at_0003_upgrades_to_the_bench_log(tmp_path):
    store = open_store(tmp_path / "old.sqlite", migrate=False)
    upgrade(store, "0003")
    upgrade(store, "head")
    with store.engine.connect() as connection:
        assert current_revision(connection) == head_revision()
        tables = {r[0] for r in connection.exec_driver_sql(
            "SELECT name FROM sqlite_master WHERE type = 'table'")}
    assert {"shop_settings", "withdrawn_readings", "skipped_checks",
            "caution_acknowledgements"} <= tables
    set_setting(store, "report_footer", "kept")
    assert get_setting(store, "report_footer") == "kept"
    store.close()
