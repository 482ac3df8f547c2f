"""Warranty returns: linked at intake by serial, or by customer and model where a serial cannot
tell units apart, within the window; and the comeback rates by technician, model and fault,
recomputed from the plan."""

from __future__ import annotations

from collections import defaultdict
from datetime import timedelta

import pytest
from sqlalchemy import select

from fixbench.store import comeback_figures as comebacks
from fixbench.store.cases import open_case
from fixbench.store.models import Case
from fixbench.store.owner_figures import Period
from tests.store.conftest import RATINGS
from tests.store.money_shop import (PLAN, RETURNS, TECHNICIANS, closed_jobs, model_of,
                                    write_money_shop)


@pytest.fixture
def shop(store):
    ids = write_money_shop(store)
    return store, ids


def _links(store) -> dict[str, str]:
    with store.reading() as session:
        tickets = dict(session.execute(select(Case.id, Case.ticket_ref)).all())
        return {tickets[case]: tickets[original] for case, original in session.execute(
            select(Case.id, Case.comeback_of_id).where(Case.comeback_of_id.is_not(None)))}


def test_returns_are_linked_by_serial_or_by_customer_and_model(shop):
    store, _ids = shop
    assert _links(store) == RETURNS


def test_window_from_the_settings_decides_at_intake(shop):
    store, ids = shop
    with store.reading() as session:
        m8 = session.get(Case, ids["M8"])
        device, tech = m8.device_id, m8.technician_id
        closed = m8.closed_at
    # M8's unit back 100 days after its repair: outside 90 days, inside a 120-day window.
    late = open_case(store, ticket_ref="L1", device_id=device, technician_id=tech,
                     family_id="pwm_flyback", ratings=RATINGS,
                     opened_at=closed + timedelta(days=100))
    longer = open_case(store, ticket_ref="L2", device_id=device, technician_id=tech,
                       family_id="pwm_flyback", ratings=RATINGS,
                       opened_at=closed + timedelta(days=100), comeback_days=120)
    with store.reading() as session:
        assert session.get(Case, late).comeback_of_id is None
        assert session.get(Case, longer).comeback_of_id == ids["M8"]


def _rates(key) -> dict:
    returned = set(RETURNS.values())
    groups = defaultdict(lambda: [0, 0])
    for job in closed_jobs():
        if job.outcome == "repaired":
            groups[key(job)][0] += 1
            groups[key(job)][1] += job.ticket in returned
        else:
            groups[key(job)]
    return {k: (r, b, _rounded(b / r if r else None)) for k, (r, b) in groups.items()}


def _rounded(rate):
    return None if rate is None else round(rate, 9)


def _shown(rows, width):
    return {tuple(r[:width]) if width > 1 else r[0]: (r[width], r[width + 1],
                                                      _rounded(r[width + 2])) for r in rows}


def test_comeback_rate_per_technician_model_and_fault(shop):
    store, _ids = shop
    assert _shown(comebacks.comebacks_by_technician(store).rows, 1) \
        == _rates(lambda j: TECHNICIANS[j.tech])
    assert _shown(comebacks.comebacks_by_model(store).rows, 2) == _rates(model_of)
    expected = {k: v for k, v in _rates(lambda j: (j.family, j.fault)).items() if k[1]}
    assert _shown(comebacks.comebacks_by_fault(store).rows, 2) == expected


def test_the_open_job_is_no_part_of_the_closed_figures(shop):
    store, _ids = shop
    closed = sum(r[1] for r in comebacks.comebacks_by_technician(store, Period()).rows)
    assert closed == sum(job.outcome == "repaired" for job in PLAN)
