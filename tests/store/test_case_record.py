"""A case read back whole, the one way: what stands, what was taken back, skips, cautions, repairs,
verifications and amendments; and the bench writes beside the readings (undo, skips, cautions)."""

from __future__ import annotations

from datetime import timedelta

import pytest
from sqlalchemy import text

from fixbench.store.amendments import amend_closed_case
from fixbench.store.case_record import load_case_record
from fixbench.store.cases import (RankedSuspect, acknowledge_cautions, add_reading,
                                  add_repair_action, open_case, skip_check,
                                  withdraw_last_reading)
from fixbench.store.errors import ClosedCaseError, StoreInputError
from fixbench.store.models import Case
from fixbench.store.owner import set_owner_passphrase
from tests.store.conftest import RATINGS, START, record_case


def _open(store, tech, device, ticket="B-1", opened=START):
    return open_case(store, ticket_ref=ticket, device_id=device, technician_id=tech,
                     family_id="pwm_flyback", ratings=RATINGS, opened_at=opened)


def _read(store, case_id, check, typed, top):
    return add_reading(store, case_id, check_id=check, typed=typed, value=None, unit=None,
                       outcome=typed, suspects=[RankedSuspect(top, 0.5, None, None)])


def test_undo_withdraws_newest_standing_reading_and_restores_first_suspect(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    _read(store, case_id, "symptom_dead", "yes", "F1.open")
    _read(store, case_id, "look_fuse", "yes", "Q1.short")
    _read(store, case_id, "mosfet_drain_source", "OL", "R3.open")

    withdraw_last_reading(store, case_id)
    record = load_case_record(store, case_id)
    assert [r.check_id for r in record.standing_readings] == ["symptom_dead", "look_fuse"]
    with store.session() as session:
        assert session.get(Case, case_id).top_suspect_fault == "Q1.short"

    withdraw_last_reading(store, case_id)
    withdraw_last_reading(store, case_id)
    assert withdraw_last_reading(store, case_id) is None
    assert load_case_record(store, case_id).standing_readings == ()
    with store.session() as session:
        assert session.get(Case, case_id).top_suspect_fault is None
        # Withdrawn readings stay in the record.
        assert session.execute(text("SELECT count(*) FROM readings")).scalar() == 3


def test_skips_and_acknowledgement_are_read_back_once(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    assert load_case_record(store, case_id).cautions_acknowledged is False
    acknowledge_cautions(store, case_id, tech, at=START)
    acknowledge_cautions(store, case_id, tech, at=START + timedelta(hours=1))
    skip_check(store, case_id, "output_ripple")
    skip_check(store, case_id, "vcc_voltage")
    record = load_case_record(store, case_id)
    assert record.cautions_acknowledged is True
    assert [s.check_id for s in record.skipped] == ["output_ripple", "vcc_voltage"]
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
    repairs = load_case_record(store, case_id).repairs
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


def test_withdrawn_readings_stay_in_the_record_with_when_they_were_taken_back(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    _read(store, case_id, "symptom_dead", "yes", "F1.open")
    _read(store, case_id, "look_fuse", "yes", "Q1.short")
    withdraw_last_reading(store, case_id, at=START + timedelta(minutes=9))
    record = load_case_record(store, case_id)
    assert [(r.check_id, r.standing) for r in record.readings] == [("symptom_dead", True),
                                                                   ("look_fuse", False)]
    assert record.withdrawn_readings[0].withdrawn_at == START + timedelta(minutes=9)
    assert record.standing_readings[0].suspects[0].fault_id == "F1.open"


def test_a_case_is_found_by_ticket_and_a_missing_one_is_refused(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device, ticket="B-7")
    assert load_case_record(store, ticket="B-7").id == case_id
    with pytest.raises(StoreInputError, match="no case B-8"):
        load_case_record(store, ticket="B-8")
    with pytest.raises(StoreInputError, match="no case 999"):
        load_case_record(store, 999)


def test_closed_case_reads_back_its_verifications_and_amendments(bench):
    store, tech, device = bench
    set_owner_passphrase(store, "solder smoke rises")
    case_id = record_case(store, tech, device, ticket="C-2", opened=START, minutes=30,
                          verifications=(False, True))
    amend_closed_case(store, case_id, {"bench_minutes": 45}, by="Owner Ruth", reason="recount",
                      passphrase="solder smoke rises")
    record = load_case_record(store, case_id)
    assert [v.passed for v in record.verifications] == [False, True]
    assert [(a.field, a.old_value, a.new_value) for a in record.amendments] == [
        ("bench_minutes", 30, 45)]
    assert record.bench_minutes == 45 and record.as_closed("bench_minutes") == 30
    assert record.technician == "Ada Tester" and record.kind == "phone charger"

