"""Closed cases change only by owner amendment, which keeps who, when, why and the old value."""

from __future__ import annotations

import pytest
from sqlalchemy import func, select

from fixbench.store.amendments import (amend_closed_case, amendments_of, delete_case,
                                       original_value)
from fixbench.store.errors import OwnerRequired, StoreInputError
from fixbench.store.models import Case, ReadingRow, SuspectRow
from fixbench.store.owner import set_owner_passphrase
from tests.store.conftest import START, record_case

PASS = "solder smoke rises"


def test_amendment_corrects_a_closed_case_and_keeps_the_original(bench):
    store, tech, device = bench
    set_owner_passphrase(store, PASS)
    case_id = record_case(store, tech, device, ticket="A-1", opened=START, minutes=30)
    amend_closed_case(store, case_id, {"confirmed_fault": "D5.short", "bench_minutes": 45},
                      by="Owner Ruth", reason="second look showed the snubber diode",
                      passphrase=PASS)
    with store.session() as session:
        case = session.get(Case, case_id)
        assert (case.confirmed_fault, case.bench_minutes, case.status) == ("D5.short", 45, "closed")
    rows = amendments_of(store, case_id)
    assert {(a.field, a.amended_by) for a in rows} == {("confirmed_fault", "Owner Ruth"),
                                                       ("bench_minutes", "Owner Ruth")}
    assert all(a.reason.startswith("second look") and a.amended_at for a in rows)
    assert original_value(store, case_id, "confirmed_fault") == "Q1.short"
    assert original_value(store, case_id, "bench_minutes") == 30


def test_amendment_without_the_passphrase_changes_nothing(bench):
    store, tech, device = bench
    set_owner_passphrase(store, PASS)
    case_id = record_case(store, tech, device, ticket="A-2", opened=START)
    with pytest.raises(OwnerRequired):
        amend_closed_case(store, case_id, {"outcome": "no_fault_found"}, by="Tech",
                          reason="x", passphrase="guess guess")
    assert amendments_of(store, case_id) == []
    with store.session() as session:
        assert session.get(Case, case_id).outcome == "repaired"


def test_only_listed_fields_of_closed_cases_can_be_amended(bench):
    store, tech, device = bench
    set_owner_passphrase(store, PASS)
    case_id = record_case(store, tech, device, ticket="A-3", opened=START)
    with pytest.raises(StoreInputError, match="cannot amend ticket_ref"):
        amend_closed_case(store, case_id, {"ticket_ref": "X"}, by="O", reason="r", passphrase=PASS)
    with pytest.raises(StoreInputError, match="needs who"):
        amend_closed_case(store, case_id, {"notes": "n"}, by="O", reason=" ", passphrase=PASS)


def test_deleting_a_case_needs_the_owner_and_removes_its_records(bench):
    store, tech, device = bench
    set_owner_passphrase(store, PASS)
    keep = record_case(store, tech, device, ticket="D-1", opened=START)
    gone = record_case(store, tech, device, ticket="D-2", opened=START)
    with pytest.raises(OwnerRequired):
        delete_case(store, gone, passphrase=None)
    delete_case(store, gone, passphrase=PASS)
    with store.session() as session:
        assert session.scalars(select(Case.id)).all() == [keep]
        assert session.scalar(select(func.count()).select_from(ReadingRow)) == 1
        assert session.scalar(select(func.count()).select_from(SuspectRow)) == 2
