"""Writing the demo shop: the planned history lands in the store through the bench functions.

The engine is not in this build yet, so these tests drive the writer with a scripted bench
session (test data only: it names the true fault first); the production path refuses to run
without the engine rather than invent readings.
"""

from __future__ import annotations

import pytest
from sqlalchemy import func, select

from fixbench.knowledge import load_knowledge
from fixbench.store.cases import RankedSuspect
from fixbench.store.demo_plan import catalogue_from_knowledge, plan_shop
from fixbench.store.demo_shop import BenchStep, build_demo_shop, engine_bench_session
from fixbench.store.figures import first_suspect_hits, repair_rates
from fixbench.store.models import Case, PracticeAttempt, Reading, Technician


def scripted_session(family_id, ratings, fault_id, seed):
    return [BenchStep("bulk_voltage", "325 V", 325.0, "V", None,
                      (RankedSuspect("F1.open", 0.5), RankedSuspect(fault_id, 0.3))),
            BenchStep("q1_drain_source", "OL", float("inf"), "ohm", "OL",
                      (RankedSuspect(fault_id, 0.8), RankedSuspect("F1.open", 0.1)))]


def test_demo_history_is_written_whole_and_coherent(sqlite_store):
    count = build_demo_shop(sqlite_store, seed=1, bench_session=scripted_session)
    assert count == len(plan_shop(1, catalogue_from_knowledge(load_knowledge())))
    with sqlite_store.session() as session:
        assert session.scalar(select(func.count()).select_from(Case)) == count
        assert session.scalar(select(func.count()).select_from(Reading)) == 2 * count
        assert session.scalar(select(func.count()).where(Case.status != "closed")) == 0
        roles = dict(session.execute(select(Technician.role, func.count())
                                     .group_by(Technician.role)).all())
        assert roles == {"technician": 4, "trainee": 2}
        assert session.scalar(select(func.count()).select_from(PracticeAttempt)) > 100
    (closed, repaired, ftf, comeback), = repair_rates(sqlite_store).rows
    assert closed == count and 0 < comeback < 0.15 and ftf > 0.8
    assert first_suspect_hits(sqlite_store).rows[0][2] == 1.0


def test_without_the_engine_the_demo_refuses_instead_of_inventing_readings():
    with pytest.raises(NotImplementedError, match="engine"):
        engine_bench_session("pwm_flyback", {}, "Q1.short", 1)
