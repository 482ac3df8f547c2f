"""Owner-only changes to the record: amending a closed case, deleting a case.

A closed case's row is corrected only together with an amendment row that keeps the old value, the
new value, who asked, when and why, in one transaction; so the original is always recoverable as
the old value of the first amendment to each field. Readings, suspects, repairs and verifications
of a closed case are never changed.
"""

from __future__ import annotations

import json
from collections.abc import Mapping
from typing import Any

from sqlalchemy import select

from fixbench.store.case_flags import refresh_came_back
from fixbench.store.cases import locked_case, utc_now
from fixbench.store.database import Store
from fixbench.store.errors import StoreInputError, checked_text
from fixbench.store.models import OUTCOMES, Amendment, Case
from fixbench.store.owner import require_owner

AMENDABLE = ("outcome", "bench_minutes", "confirmed_fault", "confirmed_part", "confirmed_stage",
             "price_cents", "notes")


def amend_closed_case(store: Store, case_id: int, changes: Mapping[str, Any], *, by: str,
                      reason: str, passphrase: str | None) -> list[int]:
    """Correct fields of a closed case; returns the ids of the amendment rows written."""
    require_owner(store, passphrase)
    unknown = set(changes) - set(AMENDABLE)
    if unknown:
        raise StoreInputError(f"cannot amend {', '.join(sorted(unknown))}; "
                              f"amendable: {', '.join(AMENDABLE)}")
    if not reason.strip() or not by.strip():
        raise StoreInputError("an amendment needs who made it and why")
    if "outcome" in changes and changes["outcome"] not in OUTCOMES:
        raise StoreInputError(f"an outcome is one of {', '.join(OUTCOMES)}")
    price = changes.get("price_cents")
    if price is not None and (not isinstance(price, int) or price < 0):
        raise StoreInputError("a price is a whole number of cents, not negative")
    with store.session() as session:
        case = locked_case(session, case_id)
        if case.status != "closed":
            raise StoreInputError(f"case {case.ticket_ref} is still open; change it directly")
        rows = []
        for field, new in changes.items():
            if isinstance(new, str):
                checked_text(new, field)
            old = getattr(case, field)
            if old == new:
                continue
            rows.append(Amendment(case_id=case_id, field=field, old_value=json.dumps(old),
                                  new_value=json.dumps(new), amended_by=checked_text(by, "name"),
                                  amended_at=utc_now(), reason=checked_text(reason, "reason")))
            setattr(case, field, new)
        session.add_all(rows)
        session.flush()
        if "outcome" in changes:
            refresh_came_back(session, [case.id])
        return [row.id for row in rows]


def amendments_of(store: Store, case_id: int) -> list[Amendment]:
    """The case's amendments, oldest first."""
    with store.reading() as session:
        return list(session.scalars(select(Amendment).where(Amendment.case_id == case_id)
                                    .order_by(Amendment.id)))


def original_value(store: Store, case_id: int, field: str) -> Any:
    """The value a field had when the case was closed, before any amendment."""
    first = next((a for a in amendments_of(store, case_id) if a.field == field), None)
    if first is not None:
        return json.loads(first.old_value)
    with store.reading() as session:
        return getattr(session.get(Case, case_id), field)


def delete_case(store: Store, case_id: int, *, passphrase: str | None) -> None:
    """Delete a case and everything recorded under it (owner only)."""
    require_owner(store, passphrase)
    with store.session() as session:
        case = locked_case(session, case_id)
        original = case.comeback_of_id
        session.delete(case)
        session.flush()
        # The job it was a return of may no longer have come back (its own returns lose their
        # link with it: the foreign key sets them to null).
        refresh_came_back(session, [original])
