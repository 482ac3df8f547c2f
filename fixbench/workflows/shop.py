"""The shop as a whole: opening its database (with the rolling backup first), the demo shop, who
works at the bench, the shop's settings (report footer, terms of business: labour rate, currency,
tax wording, comeback window) and the owner's passphrase, and the cases still open.

The window opens the shop off the GUI thread; the rest are short queries and writes.
"""

from __future__ import annotations

from fixbench.store import Store, open_store
from fixbench.store.backup import backup_if_due
from fixbench.store.case_list import (OpenCaseRow, case_count, open_case_count, open_case_with_ticket,
                                      open_cases)
from fixbench.store.location import demo_working_copy, resolve_url, sqlite_path
from fixbench.store.owner import has_owner_passphrase, set_owner_passphrase
from fixbench.store.people import add_technician, technicians
from fixbench.store.shop_settings import get_setting, set_setting
from fixbench.store.shop_terms import ShopTerms, set_shop_terms, shop_terms
from fixbench.workflows.reports import set_shop_footer, shop_footer

LAST_AT_BENCH = "bench_last_technician"  # shop setting: who was last at the bench

__all__ = ["OpenCaseRow", "ShopTerms", "Store", "add_person", "bench_people",
           "has_owner_passphrase", "has_records", "last_at_bench", "open_case_count", "open_cases",
           "open_case_with_ticket",
           "open_demo_shop", "open_shop", "remember_at_bench", "set_owner_passphrase",
           "set_shop_footer", "set_shop_terms", "shop_footer", "shop_terms"]


def open_shop(db: str | None) -> Store:
    """Back the file up if a backup is due, then open and migrate the shop's database."""
    backup_if_due(sqlite_path(resolve_url(db)))  # nothing for a new, empty or server shop
    return open_store(db)


def open_demo_shop() -> Store | None:
    """A fresh copy of the demo shop, opened (None when this build has no demo shop). The shipped
    file stays as built, and every visit starts from the same history."""
    path = demo_working_copy()
    if path is None or not path.exists():
        return None
    return open_store(path)


def has_records(store: Store) -> bool:
    return case_count(store) > 0


def bench_people(store: Store) -> list[tuple[int, str]]:
    """Everyone active at the bench by name, trainees marked: (id, label)."""
    return [(p.id, f"{p.name}{' (trainee)' if p.role == 'trainee' else ''}")
            for p in technicians(store) if p.active]


def last_at_bench(store: Store) -> int | None:
    remembered = get_setting(store, LAST_AT_BENCH)
    return None if remembered is None else int(remembered)


def remember_at_bench(store: Store, technician_id: int) -> None:
    set_setting(store, LAST_AT_BENCH, str(technician_id))


def add_person(store: Store, name: str) -> int:
    """A new technician, remembered as the one at the bench."""
    new_id = add_technician(store, name)
    remember_at_bench(store, new_id)
    return new_id
