"""Priors for the engine: confirmed root faults counted per family from closed cases only."""

from __future__ import annotations

from fixbench.store.cases import open_case
from fixbench.store.priors import confirmed_fault_counts
from tests.store.conftest import RATINGS, START, record_case


def test_confirmed_faults_are_counted_per_family(bench):
    store, tech, device = bench
    for i, fault in enumerate(["Q1.short", "Q1.short", "R3.open"]):
        record_case(store, tech, device, ticket=f"P-{i}", opened=START, fault=fault)
    record_case(store, tech, device, ticket="P-x", opened=START, fault="C1.dry",
                family="self_oscillating")
    record_case(store, tech, device, ticket="P-u", opened=START, outcome="not_economical")
    open_case(store, ticket_ref="P-open", device_id=device, technician_id=tech,
              family_id="pwm_flyback", ratings=RATINGS)
    assert confirmed_fault_counts(store, "pwm_flyback") == {"Q1.short": 2, "R3.open": 1}
    assert confirmed_fault_counts(store, "self_oscillating") == {"C1.dry": 1}
    assert confirmed_fault_counts(store, "primary_side") == {}


def test_counts_can_be_read_inside_a_callers_session(bench):
    store, tech, device = bench
    record_case(store, tech, device, ticket="S-1", opened=START)
    with store.session() as session:
        assert confirmed_fault_counts(session, "pwm_flyback") == {"Q1.short": 1}
