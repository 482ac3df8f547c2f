"""The open cases at the bench: newest first, closed ones left out, paged."""

from __future__ import annotations

from datetime import timedelta

from fixbench.store.case_list import open_case_count, open_cases
from fixbench.store.cases import RankedSuspect, add_reading, open_case
from tests.store.conftest import RATINGS, START, record_case


def _open(store, tech, device, ticket="B-1", opened=START):
    return open_case(store, ticket_ref=ticket, device_id=device, technician_id=tech,
                     family_id="pwm_flyback", ratings=RATINGS, opened_at=opened)


def _read(store, case_id, check, typed, top):
    return add_reading(store, case_id, check_id=check, typed=typed, value=None, unit=None,
                       outcome=typed, suspects=[RankedSuspect(top, 0.5, None, None)])


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
