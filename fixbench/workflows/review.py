"""The owner's review of the shop's record: pages of the case history under a filter, the lists
the filters offer, the period the figures open on, the CSV export, a customer's jobs, and the
owner's corrections (amend or delete a case, remove a customer's details on request). Everything
is counted and sorted by the database; owner-only actions check the passphrase before they touch
anything.
"""

from __future__ import annotations

from datetime import date
from pathlib import Path
from typing import Any

from fixbench.store import amendments, customers
from fixbench.store.amendments import AMENDABLE
from fixbench.store.case_filters import (PAGE_SIZE, RETURNS, CaseFilter, FilterChoices,
                                         export_filtered_csv, filter_choices, filtered_count,
                                         filtered_page, opened_span)
from fixbench.store.case_list import CaseRow
from fixbench.store.chart_counts import MINUTES_BIN
from fixbench.store.database import Store
from fixbench.store.models import OUTCOMES
from fixbench.store.owner import has_owner_passphrase, require_owner
from fixbench.store.owner_figures import Figure
from fixbench.workflows.figures_snapshot import twelve_months_to

__all__ = ["AMENDABLE", "MINUTES_BIN", "OUTCOMES", "PAGE_SIZE", "RETURNS", "CaseFilter", "CaseRow",
           "Figure", "FilterChoices", "Store", "amend_case", "customer_jobs", "delete_case",
           "export_cases_csv", "filter_choices", "forget_customer", "has_owner_passphrase",
           "history_first_page", "history_page", "newest_twelve_months", "require_owner",
           "twelve_months_to"]


def history_first_page(store: Store, case_filter: CaseFilter, sort: str,
                       descending: bool) -> tuple[int, list[CaseRow]]:
    """How many cases the filter holds, and the first page of them in this order."""
    return (filtered_count(store, case_filter),
            filtered_page(store, case_filter, sort, descending, 0, PAGE_SIZE))


def history_page(store: Store, case_filter: CaseFilter, sort: str, descending: bool,
                 offset: int) -> list[CaseRow]:
    return filtered_page(store, case_filter, sort, descending, offset, PAGE_SIZE)


def newest_twelve_months(store: Store) -> CaseFilter:
    """The twelve calendar months up to the newest case (to today in an empty shop)."""
    last = opened_span(store)[1]
    return twelve_months_to(last.date() if last else date.today())


def export_cases_csv(store: Store, case_filter: CaseFilter, path: str | Path, *,
                     passphrase: str | None, sort: str = "opened", descending: bool = False,
                     with_customers: bool = False) -> int:
    """The filtered cases written to a CSV file (owner only: checked before the file is made);
    customers' names and contacts only when the owner asks for them."""
    require_owner(store, passphrase)
    with Path(path).open("w", newline="", encoding="utf-8") as out:
        return export_filtered_csv(store, case_filter, out, passphrase=passphrase, sort=sort,
                                   descending=descending, with_customers=with_customers)


def customer_jobs(store: Store, customer_id: int) -> list[customers.CustomerJob]:
    """Every job of one customer, newest first."""
    return customers.customer_jobs(store, customer_id)


def forget_customer(store: Store, customer_id: int, *, passphrase: str | None) -> int:
    """Remove a person's name and contact on their request (owner only), keeping every job's
    figures; returns how many jobs were theirs."""
    return customers.forget_customer(store, customer_id, passphrase=passphrase)


def amend_case(store: Store, case_id: int, changes: dict[str, Any], *, by: str, reason: str,
               passphrase: str | None) -> list[int]:
    """Correct fields of a closed case, keeping who, when, why and the old values (owner only)."""
    return amendments.amend_closed_case(store, case_id, changes, by=by, reason=reason,
                                        passphrase=passphrase)


def delete_case(store: Store, case_id: int, *, passphrase: str | None) -> None:
    """Delete a case and everything recorded under it (owner only)."""
    amendments.delete_case(store, case_id, passphrase=passphrase)
