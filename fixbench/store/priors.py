"""What past repairs teach the engine: counts of confirmed root faults per supply family."""

from __future__ import annotations

from sqlalchemy import func, select
from sqlalchemy.orm import Session

from fixbench.store.database import Store
from fixbench.store.models import Case


def confirmed_fault_counts(session_or_store: Session | Store, family_id: str) -> dict[str, int]:
    """Fault id -> number of closed cases of ``family_id`` whose confirmed root fault it is."""
    query = (select(Case.confirmed_fault, func.count())
             .where(Case.family_id == family_id, Case.status == "closed",
                    Case.confirmed_fault.is_not(None))
             .group_by(Case.confirmed_fault))
    if isinstance(session_or_store, Session):
        return {fault: count for fault, count in session_or_store.execute(query)}
    with session_or_store.reading() as session:
        return {fault: count for fault, count in session.execute(query)}
