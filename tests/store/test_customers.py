"""Customers: optional on a job, found again by name or contact, their earlier jobs listed, and
removed on request by the owner without touching any job's figures."""

from __future__ import annotations

import pytest
from sqlalchemy import select

from fixbench.store.customers import (customer, customer_jobs, customers_like,
                                      find_or_add_customer, forget_customer)
from fixbench.store.errors import OwnerRequired, StoreInputError
from fixbench.store.models import Case, Customer
from fixbench.store.money_figures import money_by_model
from fixbench.store.owner import set_owner_passphrase
from fixbench.store.owner_figures import Period
from tests.store.money_shop import CUSTOMERS, PLAN, RATE_NOW, write_money_shop

PASS = "desoldering pump"


def test_the_same_name_and_contact_is_the_same_customer(store):
    first = find_or_add_customer(store, "Odile Fenwright", "0171 555 0101")
    assert find_or_add_customer(store, "  odile fenwright ", "0171 555 0101") == first
    assert find_or_add_customer(store, "Odile Fenwright", "odile@example.org") != first
    with pytest.raises(StoreInputError):
        find_or_add_customer(store, "   ")


def test_customers_are_found_by_part_of_a_name_or_contact(store):
    write_money_shop(store)
    assert [c.name for c in customers_like(store, "fenw")] == ["Odile Fenwright"]
    assert [c.name for c in customers_like(store, "555")] == ["Odile Fenwright"]
    assert customers_like(store, "%") == []  # a wildcard typed is a character, not "anything"


def test_a_customers_earlier_jobs_newest_first(store):
    ids = write_money_shop(store)
    with store.reading() as session:
        odile = session.scalar(select(Customer.id).where(Customer.name == CUSTOMERS[0][0]))
    jobs = customer_jobs(store, odile)
    expected = sorted((job for job in PLAN if job.customer == 0), key=lambda j: j.opened,
                      reverse=True)
    assert [j.ticket for j in jobs] == [job.ticket for job in expected]
    assert jobs[0].case_id == ids[expected[0].ticket]


def test_removing_a_customer_keeps_every_jobs_figures(store):
    write_money_shop(store)
    set_owner_passphrase(store, PASS)
    before = money_by_model(store, Period(), RATE_NOW).rows
    with store.reading() as session:
        odile = session.scalar(select(Customer.id).where(Customer.name == CUSTOMERS[0][0]))
        linked = session.scalars(select(Case.ticket_ref).where(Case.customer_id == odile)).all()
    with pytest.raises(OwnerRequired):
        forget_customer(store, odile, passphrase="not the owner")
    assert customer(store, odile) is not None
    kept = forget_customer(store, odile, passphrase=PASS)
    assert kept == len(linked) == sum(job.customer == 0 for job in PLAN)
    assert customer(store, odile) is None
    assert customers_like(store, "Odile") == []
    with store.reading() as session:
        assert session.scalar(select(Case.id).where(Case.ticket_ref.in_(linked),
                                                    Case.customer_id.is_not(None))) is None
        assert session.scalar(select(Case.comeback_of_id).where(Case.ticket_ref == "M5"))
    assert money_by_model(store, Period(), RATE_NOW).rows == before
