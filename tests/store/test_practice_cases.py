"""The store queries practice uses: replayable closed cases, a trainee's attempts, every trainee."""

from __future__ import annotations

from datetime import datetime

from fixbench.store.cases import add_reading, close_case, open_case
from fixbench.store.customers import find_or_add_customer
from fixbench.store.people import add_device, add_practice_attempt, add_technician
from fixbench.store.practice_cases import (attempt_record, attempts_of, every_trainees_attempts, replayable_cases,
                                          trainee_summaries)
from fixbench.workflows.practice import kept_attempts


def test_closed_cases_are_offered_without_who_or_whose(store):
    tech = add_technician(store, "Cy Bench")
    device = add_device(store, make="Northwind", model="NW-12", kind="adapter",
                        label_ratings={"output": "12 V"})
    ratings = {"mains": "230 V", "output": "12 V", "current": "2 A"}
    case_id = open_case(store, ticket_ref="T-1", device_id=device, technician_id=tech,
                        family_id="pwm_flyback", ratings=ratings, customer_id=find_or_add_customer(store, "Mrs Example"))
    close_case(store, case_id, outcome="repaired", bench_minutes=30, confirmed_fault="C3.dried",
               closed_at=datetime(2024, 3, 5))
    open_case(store, ticket_ref="T-2", device_id=device, technician_id=tech, family_id="pwm_flyback",
              ratings=ratings)
    cases = replayable_cases(store)
    assert len(cases) == 1
    assert cases[0].confirmed_fault == "C3.dried" and cases[0].closed == "2024-03"
    assert "Mrs Example" not in repr(cases[0]) and "T-1" not in repr(cases[0])


def test_attempts_come_oldest_first_and_every_trainee_is_summed(store):
    ada = add_technician(store, "Ada Test", role="trainee")
    add_technician(store, "Bo Test", role="trainee")
    add_technician(store, "Cy Bench")
    add_practice_attempt(store, trainee_id=ada, scenario="drawn:easy:f:a:s1", checks_used=3, minutes=5,
                         score=50, safety_slips=1, attempted_at=datetime(2024, 1, 1))
    add_practice_attempt(store, trainee_id=ada, scenario="drawn:easy:f:a:s2", checks_used=4, minutes=6,
                         score=90, safety_slips=0, attempted_at=datetime(2024, 1, 2))
    assert [a.score for a in attempts_of(store, ada)] == [50, 90]
    summaries = trainee_summaries(store)
    assert [s.name for s in summaries] == ["Ada Test", "Bo Test"]
    assert summaries[0].rounds == 2 and summaries[0].mean_score == 70 and summaries[0].rounds_with_slips == 1
    assert summaries[1].rounds == 0


def test_coach_use_and_a_blown_fuse_are_kept_beside_the_scenario_id(store):
    ada = add_technician(store, "Ada Test", role="trainee")
    add_practice_attempt(store, trainee_id=ada, scenario="drawn:easy:f:a:s1", checks_used=3, minutes=5,
                         score=95, safety_slips=1, attempted_at=datetime(2024, 1, 1),
                         coach_used=True, fuse_blown=True)
    add_practice_attempt(store, trainee_id=ada, scenario="drawn:easy:f:a:s2", checks_used=4, minutes=6,
                         score=95, safety_slips=0, attempted_at=datetime(2024, 1, 2))
    blown, clean = attempts_of(store, ada)
    assert (blown.scenario, blown.coach_used, blown.fuse_blown) == ("drawn:easy:f:a:s1", True, True)
    assert (clean.coach_used, clean.fuse_blown) == (False, False)  # the defaults
    blown, clean = kept_attempts(store, ada)  # as practice reads them
    assert blown.band == "Keep practising" and clean.band == "Bench-ready"


def test_what_a_round_taught_and_its_record_are_kept(store):
    ada = add_technician(store, "Ada Test", role="trainee")
    bo = add_technician(store, "Bo Test", role="trainee")
    record = {"version": 1, "actions": [["take", "look_fuse"]]}
    kept = add_practice_attempt(store, trainee_id=ada, scenario="drawn:easy:f:a:s1", checks_used=1, minutes=0,
                                score=40, safety_slips=1, attempted_at=datetime(2024, 1, 1), fault_right=False,
                                slip_kinds="undischarged", checks_wasted=2, record=record)
    old = add_practice_attempt(store, trainee_id=ada, scenario="drawn:easy:f:b:s2", checks_used=1, minutes=0,
                               score=90, safety_slips=0, attempted_at=datetime(2024, 1, 2))
    add_practice_attempt(store, trainee_id=bo, scenario="drawn:easy:f:c:s3", checks_used=1, minutes=0,
                         score=90, safety_slips=0, attempted_at=datetime(2024, 1, 3))
    first, second = attempts_of(store, ada)
    assert (first.attempt_id, first.fault_right, first.slip_kinds, first.checks_wasted, first.has_record) == (
        kept, False, "undischarged", 2, True)
    assert first.attempted_at == datetime(2024, 1, 1)
    assert (second.fault_right, second.has_record) == (None, False)  # as rounds kept before records
    assert attempt_record(store, kept) == record and attempt_record(store, old) is None
    every = every_trainees_attempts(store)
    assert [a.scenario for a in every[ada]] == ["drawn:easy:f:a:s1", "drawn:easy:f:b:s2"]
    assert [a.scenario for a in every[bo]] == ["drawn:easy:f:c:s3"]


def test_a_replayable_case_carries_what_its_customer_said(store):
    tech = add_technician(store, "Cy Bench")
    device = add_device(store, make="Northwind", model="NW-12", kind="adapter", label_ratings={"output": "12 V"})
    case_id = open_case(store, ticket_ref="T-1", device_id=device, technician_id=tech, family_id="pwm_flyback",
                        ratings={"mains": "230 V", "output": "12 V", "current": "2 A"})
    for check_id, typed in (("symptom_dead", "yes"), ("fuse_resistance", "OL"), ("symptom_hot", "no")):
        add_reading(store, case_id, check_id=check_id, typed=typed, value=None, unit=None, outcome=typed,
                    suspects=())
    close_case(store, case_id, outcome="repaired", bench_minutes=30, confirmed_fault="Q1.short",
               closed_at=datetime(2024, 3, 5))
    (case,) = replayable_cases(store, told_checks={"symptom_dead", "symptom_hot"})
    assert case.told == (("symptom_dead", "yes"), ("symptom_hot", "no"))
