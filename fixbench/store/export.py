"""Taking records out of the store: cases of a period as CSV, and one case as a re-runnable JSON.

The CSV is for the owner's spreadsheet, so it needs the owner's passphrase. Customers' names and
contacts are personal data kept in the shop's database: they are left out of the CSV unless the
owner asks for them (``with_customers``), and then a job's customer is the one kept now (a person
removed on request has no name to export). Cells that a spreadsheet would run as a formula
(starting with = + - @ or a tab/CR) get a leading apostrophe (OWASP, "CSV Injection").

The case JSON holds what ``fixbench diagnose`` reads (``family``, ``ratings`` and the ``readings``
in the order taken, each as the check id and the text typed), so a past case can be re-run;
the rest of the record travels under ``"record"``, which diagnose ignores. It is what the bench
needs and anyone at the bench may take it; who the customer is travels only when the owner asks
with the passphrase, since customers' details are personal data kept in the shop.
"""

from __future__ import annotations

import csv
import json
from collections.abc import Iterator
from datetime import datetime
from typing import Any, TextIO

from sqlalchemy import and_, func, select
from sqlalchemy.orm import aliased

from fixbench.store.case_record import load_case_record
from fixbench.store.database import Store
from fixbench.store.errors import StoreInputError
from fixbench.store.models import Case, Customer, Device, ReadingRow, Technician, WithdrawnReading
from fixbench.store.owner import require_owner

CASE_JSON_FORMAT = "fixbench-case"
CASE_JSON_VERSION = 1
CSV_COLUMNS = ("ticket", "opened_at", "closed_at", "status", "outcome", "family", "make", "model",
               "kind", "technician", "bench_minutes", "confirmed_fault", "confirmed_part",
               "confirmed_stage", "engine_first_suspect", "came_back", "return_of",
               "quoted_price", "price", "parts_cost", "readings")
CUSTOMER_COLUMNS = ("customer", "customer_contact")
_FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")


def _cell(value: Any) -> Any:
    if isinstance(value, datetime):
        return value.isoformat(sep=" ", timespec="seconds")
    if isinstance(value, str) and value.startswith(_FORMULA_STARTS):
        return "'" + value
    return "" if value is None else value


def export_cases_csv(store: Store, out: TextIO, *, since: datetime, until: datetime,
                     passphrase: str | None, with_customers: bool = False) -> int:
    """Write cases opened in [since, until) to ``out`` as CSV; returns the number of cases."""
    require_owner(store, passphrase)
    where, order = _period(since, until)
    return write_cases_csv(store, out, where=where, order=order, with_customers=with_customers)


def export_cases_rows(store: Store, *, since: datetime, until: datetime,
                      passphrase: str | None, with_customers: bool = False) -> list[dict[str, Any]]:
    """The cases of :func:`export_cases_csv` as one dict per case (the CSV's columns), for JSON."""
    require_owner(store, passphrase)
    where, order = _period(since, until)
    columns = CSV_COLUMNS + (CUSTOMER_COLUMNS if with_customers else ())
    return [{k: _iso(v) if isinstance(v, datetime) else v for k, v in zip(columns, row)}
            for row in case_rows(store, where=where, order=order, with_customers=with_customers)]


def _period(since: datetime, until: datetime):
    if until <= since:
        raise StoreInputError("the end of the period must come after its start")
    return (and_(Case.opened_at >= since, Case.opened_at < until),
            (Case.opened_at.asc(), Case.id.asc()))


def write_cases_csv(store: Store, out: TextIO, *, where, order,
                    with_customers: bool = False) -> int:
    """The one CSV writer of cases: the cases matching ``where`` in ``order``, with their money,
    warranty-return link and reading count (and, asked for, the customer). Callers check the
    owner's passphrase first."""
    writer = csv.writer(out)
    writer.writerow(CSV_COLUMNS + (CUSTOMER_COLUMNS if with_customers else ()))
    count = 0
    for row in case_rows(store, where=where, order=order, with_customers=with_customers):
        writer.writerow([_cell(v) for v in row])
        count += 1
    return count


def _amount(cents: int | None) -> str:
    return "" if cents is None else f"{cents / 100:.2f}"


def case_rows(store: Store, *, where, order, with_customers: bool = False) -> Iterator[list[Any]]:
    """The one query of exported cases: one list per case in :data:`CSV_COLUMNS` order (then
    :data:`CUSTOMER_COLUMNS`, asked for), amounts in the shop's money ("12.50"). Callers check
    the owner first."""
    # Readings taken back with undo are kept in the record but do not count as readings.
    readings = (select(func.count()).where(ReadingRow.case_id == Case.id,
                                           ReadingRow.id.not_in(select(WithdrawnReading.reading_id)))
                .scalar_subquery())
    original = aliased(Case)
    people = [Customer.name, Customer.contact] if with_customers else []
    query = (select(Case.ticket_ref, Case.opened_at, Case.closed_at, Case.status, Case.outcome,
                    Case.family_id, Device.make, Device.model, Device.kind, Technician.name,
                    Case.bench_minutes, Case.confirmed_fault, Case.confirmed_part,
                    Case.confirmed_stage, Case.top_suspect_fault, Case.came_back,
                    original.ticket_ref, Case.quoted_cents, Case.price_cents, Case.parts_cents,
                    readings, *people)
             .join(Device, Device.id == Case.device_id)
             .join(Technician, Technician.id == Case.technician_id)
             .outerjoin(Customer, Customer.id == Case.customer_id)
             .outerjoin(original, original.id == Case.comeback_of_id)
             .where(where)
             .order_by(*order))
    with store.read_connection() as connection:
        for row in connection.execute(query, execution_options={"yield_per": 1000}):
            head, (back, return_of, quoted, price, parts, n_readings), customer = (
                row[:15], row[15:21], row[21:])
            yield [*head, "yes" if back else "", return_of, _amount(quoted), _amount(price),
                   _amount(parts), n_readings, *customer]


def case_as_json(store: Store, ticket_or_id: str | int, *,
                 owner_passphrase: str | None = None) -> dict[str, Any]:
    """One case in the form ``fixbench diagnose`` reads, plus its record.

    The record is the bench's: the unit, the readings, the parts and the results. Who the customer
    is stays in the shop unless the owner asks for it with the passphrase (``owner_passphrase``):
    then the record carries ``customer`` too."""
    if owner_passphrase is not None:
        require_owner(store, owner_passphrase)
    if isinstance(ticket_or_id, int):
        case = load_case_record(store, ticket_or_id)
    else:
        case = load_case_record(store, ticket=ticket_or_id)
    standing = case.standing_readings
    shown = {
        "format": CASE_JSON_FORMAT,
        "version": CASE_JSON_VERSION,
        "family": case.family_id,
        "ratings": dict(case.ratings),
        "readings": [{"check": r.check_id, "value": r.typed} for r in standing],
        "record": {
            "ticket": case.ticket,
            "device": {"make": case.make, "model": case.model, "kind": case.kind},
            "technician": case.technician,
            "status": case.status,
            "outcome": case.outcome,
            "opened_at": _iso(case.opened_at),
            "closed_at": _iso(case.closed_at),
            "bench_minutes": case.bench_minutes,
            "confirmed": {"fault": case.confirmed_fault, "part": case.confirmed_part,
                          "stage": case.confirmed_stage},
            "suspects_after_each_reading": [
                [[s.fault_id, s.probability] for s in r.suspects] for r in standing],
            "withdrawn_readings": [{"check": r.check_id, "value": r.typed}
                                   for r in case.withdrawn_readings],
            "repairs": [{"part": a.part_id, "fault": a.fault_id, "action": a.action,
                         "parts_cost_cents": a.cost_cents} for a in case.repairs],
            "verification": [{"check": v.check_id, "reading": v.typed, "passed": v.passed}
                             for v in case.verifications],
        },
    }
    if owner_passphrase is not None:
        shown["record"]["customer"] = {"name": case.customer_name,
                                       "contact": case.customer_contact}
    return shown


def _iso(moment: datetime | None) -> str | None:
    return None if moment is None else moment.isoformat(timespec="seconds")


def dump_case_json(store: Store, ticket_or_id: str | int, *, owner_passphrase: str | None = None) -> str:
    return json.dumps(case_as_json(store, ticket_or_id, owner_passphrase=owner_passphrase),
                      ensure_ascii=False, indent=2)
