"""Recording a case at the bench: every reading kept with its suspects, closed cases locked."""

from __future__ import annotations

import math

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from sqlalchemy import func, select, text
from sqlalchemy.exc import OperationalError

from fixbench.store import open_store
from fixbench.store.cases import (RankedSuspect, acknowledge_cautions, add_reading,
                                  add_repair_action, add_verification, case_for_writing,
                                  close_case, move_case, open_case, skip_check,
                                  withdraw_last_reading)
from fixbench.store.people import add_device, add_technician
from fixbench.store.errors import ClosedCaseError, StoreInputError
from fixbench.store.models import Case, ReadingRow, RepairAction, SuspectRow
from tests.store.conftest import RATINGS, START, record_case


def _open(store, tech, device, ticket="T-1"):
    return open_case(store, ticket_ref=ticket, device_id=device, technician_id=tech,
                     family_id="pwm_flyback", ratings=RATINGS, opened_at=START)


def test_reading_is_kept_as_typed_and_parsed_with_ranked_suspects(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    add_reading(store, case_id, check_id="bulk_voltage", typed="325 V", value=325.0, unit="V",
                outcome=None, suspects=[RankedSuspect("U1.dead", 0.6, "U1", "controller"),
                                        RankedSuspect("R3.open", 0.3, "R3", "startup")])
    add_reading(store, case_id, check_id="q1_drain_source", typed="OL", value=math.inf,
                unit="ohm", outcome="OL", suspects=[RankedSuspect("R3.open", 0.8, "R3")])
    with store.session() as session:
        case = session.get(Case, case_id)
        assert [r.seq for r in case.readings] == [1, 2]
        first, second = case.readings
        assert (first.typed, first.value, first.unit) == ("325 V", 325.0, "V")
        assert [(s.rank, s.fault_id, s.probability) for s in first.suspects] == [
            (1, "U1.dead", 0.6), (2, "R3.open", 0.3)]
        assert second.value == math.inf and second.outcome == "OL"
        assert case.status == "diagnosing"
        assert case.top_suspect_fault == "R3.open"


def test_case_walks_intake_to_closed_through_repair_and_verification(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    with pytest.raises(StoreInputError):
        move_case(store, case_id, "verifying")
    move_case(store, case_id, "diagnosing")
    add_repair_action(store, case_id, part_id="Q1", fault_id="Q1.short", action="replaced",
                      parts_cost_cents=180)
    add_verification(store, case_id, check_id="output_voltage", typed="5.1 V", value=5.1,
                     unit="V", outcome=None, passed=False)
    add_repair_action(store, case_id, part_id="D5", action="tested", test_passed=True)
    add_verification(store, case_id, check_id="output_voltage", typed="5.02 V", value=5.02,
                     unit="V", outcome=None, passed=True)
    close_case(store, case_id, outcome="repaired", bench_minutes=42, confirmed_fault="Q1.short",
               confirmed_part="Q1", confirmed_stage="switch")
    with store.session() as session:
        case = session.get(Case, case_id)
        assert (case.status, case.outcome, case.bench_minutes) == ("closed", "repaired", 42)
        assert case.closed_at is not None


def test_closed_case_refuses_new_readings_repairs_and_status_changes(bench):
    store, tech, device = bench
    case_id = record_case(store, tech, device, ticket="T-9", opened=START)
    with pytest.raises(ClosedCaseError):
        add_reading(store, case_id, check_id="x", typed="1 V", value=1.0, unit="V",
                    outcome=None, suspects=[])
    with pytest.raises(ClosedCaseError):
        add_repair_action(store, case_id, part_id="Q1", action="replaced")
    with pytest.raises(ClosedCaseError):
        close_case(store, case_id, outcome="no_fault_found", bench_minutes=1)
    with store.session() as session:
        assert session.scalar(select(func.count()).select_from(ReadingRow)) == 1


@pytest.mark.parametrize("line, says", [
    ({"action": "tested"}, "needs its result"),
    ({"action": "tested", "test_passed": True, "value_fitted": "22 uF"}, "nothing is fitted"),
    ({"action": "replaced", "test_passed": False}, "has no test result"),
])
def test_a_repair_line_with_a_result_or_value_it_cannot_have_is_refused(bench, line, says):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    with pytest.raises(StoreInputError, match=says):
        add_repair_action(store, case_id, part_id="D5", **line)
    with store.session() as session:
        assert session.scalar(select(func.count()).select_from(RepairAction)) == 0


def test_a_blank_value_fitted_is_kept_as_none(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    add_repair_action(store, case_id, part_id="C2", action="replaced", value_fitted="  ")
    with store.session() as session:
        assert session.scalar(select(RepairAction.value_fitted)) is None


def test_unknown_outcome_and_negative_minutes_are_refused(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    with pytest.raises(StoreInputError, match="outcome"):
        close_case(store, case_id, outcome="fixed", bench_minutes=3)
    with pytest.raises(StoreInputError, match="negative"):
        close_case(store, case_id, outcome="repaired", bench_minutes=-3)


def test_nul_character_is_refused_with_a_message_on_every_backend(bench):
    store, tech, device = bench
    case_id = _open(store, tech, device)
    with pytest.raises(StoreInputError, match="NUL"):
        add_reading(store, case_id, check_id="bulk_voltage", typed="32\x005 V", value=None,
                    unit=None, outcome=None, suspects=[])


def test_very_long_text_round_trips_intact(bench):
    store, tech, device = bench
    long_note = "ñ€😀 long bench note " * 50_000
    case_id = open_case(store, ticket_ref="LONG-1", device_id=device, technician_id=tech,
                        family_id="pwm_flyback", ratings=RATINGS, notes=long_note)
    with store.session() as session:
        assert session.get(Case, case_id).notes == long_note


_text = st.text(st.characters(blacklist_characters="\x00", blacklist_categories=("Cs",)),
                max_size=200)


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(typed=_text, check=_text.filter(bool), fault=_text.filter(bool))
def test_any_unicode_reading_text_round_trips(bench, typed, check, fault):
    store, tech, device = bench
    case_id = _open(store, tech, device, ticket=f"U-{abs(hash((typed, check, fault)))}")
    reading_id = add_reading(store, case_id, check_id=check, typed=typed, value=None, unit=None,
                             outcome=None, suspects=[RankedSuspect(fault, 1.0)])
    with store.session() as session:
        reading = session.get(ReadingRow, reading_id)
        assert (reading.typed, reading.check_id) == (typed, check)
        assert session.scalar(select(SuspectRow.fault_id).where(SuspectRow.reading_id == reading_id)) \
            == fault


@pytest.mark.postgres
def test_a_case_opened_for_writing_is_locked_against_another_bench_on_postgresql(pg_database_url):
    """Every bench write takes its case through case_for_writing; on PostgreSQL the row stays
    locked until that write commits, so a second bench writing the same case waits its turn
    (SELECT ... FOR UPDATE, PostgreSQL manual "Explicit Locking", row-level locks)."""
    store = open_store(pg_database_url)
    try:
        tech = add_technician(store, "Ada Tester")
        device = add_device(store, make="Quillon", model="QX-5", kind="charger", label_ratings={})
        case_id = _open(store, tech, device)
        with store.session() as session:
            case_for_writing(session, case_id)
            with store.engine.connect() as other, pytest.raises(OperationalError):
                other.execute(text("SELECT id FROM cases WHERE id = :id FOR UPDATE NOWAIT"),
                              {"id": case_id})
        with store.engine.connect() as other:  # committed: the lock is gone
            assert other.execute(text("SELECT id FROM cases WHERE id = :id FOR UPDATE NOWAIT"),
                                 {"id": case_id}).scalar() == case_id
    finally:
        store.close()


def test_every_bench_write_refuses_a_closed_case_through_the_one_opener(bench):
    store, tech, device = bench
    case_id = record_case(store, tech, device, ticket="L-1", opened=START)
    writes = [
        lambda: add_reading(store, case_id, check_id="x", typed="1", value=None, unit=None,
                            outcome="yes", suspects=[]),
        lambda: add_repair_action(store, case_id, part_id="Q1", action="replaced"),
        lambda: add_verification(store, case_id, check_id="x", typed="1", value=None, unit=None,
                                 outcome="yes", passed=True),
        lambda: move_case(store, case_id, "repairing"),
        lambda: skip_check(store, case_id, "x"),
        lambda: withdraw_last_reading(store, case_id),
        lambda: acknowledge_cautions(store, case_id, tech),
    ]
    for write in writes:
        with pytest.raises(ClosedCaseError, match="record an amendment instead"):
            write()
