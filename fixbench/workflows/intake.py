"""Intake: reading the label ratings as typed, what the shop's record offers to complete the form
from (models and customers seen before), whether the unit is a warranty return, and opening the
case with its customer, its quoted price and its symptoms as the first readings.

Ratings are read by the one ratings parser, :func:`fixbench.physics.ratings.parse_ratings`: a
single field is read by giving the parser a reference label with that one field replaced, so the
intake accepts and refuses exactly what the parser does ("85-265 V" is a universal input
everywhere). Everything that touches the database here runs off the GUI thread.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime

from fixbench.engine import start_diagnosis
from fixbench.knowledge import KnowledgeBase
from fixbench.physics.ratings import UNIVERSAL_WORDS, parse_ratings, read_mains_label
from fixbench.quantities import ReadingError
from fixbench.store import StoreInputError, cases, people, priors
from fixbench.store.case_record import load_case_record
from fixbench.store.cases import utc_now
from fixbench.store.customers import CustomerRow, customers_like, find_or_add_customer
from fixbench.store.database import Store
from fixbench.store.intake_lookups import (EarlierJob, KnownModel, earlier_job_under_warranty,
                                           find_device, known_customer, known_models,
                                           ticket_taken)
from fixbench.store.shop_terms import shop_terms
from fixbench.workflows.bench import Loaded, case_view, keep, warm
from fixbench.workflows.board_profiles import board_of_model, board_photos, family_on_board

# A label every rule of the parser accepts, to read one typed field against.
REFERENCE_LABEL = {"mains": "230 V", "output": "5 V", "current": "1 A"}

__all__ = ["REFERENCE_LABEL", "CustomerRow", "EarlierJob", "IntakeForm", "KnownModel",
           "TicketInUse", "customers_like", "is_universal", "known_models", "label_ratings",
           "open_new_case", "read_rating_field", "ticket_in_use", "warranty_check"]


class TicketInUse(StoreInputError):
    """The ticket reference is already a case's; intake shows it beside the ticket field."""


@dataclass(frozen=True)
class IntakeForm:
    ticket: str
    make: str
    model: str
    serial: str
    kind: str
    family_id: str
    ratings: dict[str, str]
    symptoms: tuple[str, ...]  # checks answered "yes" at intake (reported or seen)
    notes: str = ""
    customer_name: str = ""  # optional, with how to reach them
    customer_contact: str = ""
    quoted_cents: int | None = None  # the price quoted at the counter


def warranty_check(store: Store, make: str, model: str, serial: str, customer_name: str,
                   customer_contact: str, at: datetime | None = None) -> EarlierJob | None:
    """The repaired job this unit would be kept as a warranty return of, if opened now: the same
    unit (by serial), or the same customer's unit of that make and model, back within the shop's
    comeback window."""
    customer_id = known_customer(store, customer_name, customer_contact.strip() or None)
    return earlier_job_under_warranty(store, make=make, model=model, serial=serial,
                                      customer_id=customer_id, at=at or utc_now(),
                                      window_days=shop_terms(store).comeback_days)


def read_rating_field(key: str, text: str) -> str:
    """One label rating as typed, read by the ratings parser; the text back, or ReadingError with
    the parser's message (without its "rating 'key':" prefix, since it is shown beside the field)."""
    text = text.strip()
    try:
        parse_ratings({**REFERENCE_LABEL, key: text})
    except ReadingError as err:
        raise ReadingError(str(err).split(": ", 1)[-1]) from None
    return text


def is_universal(mains_text: str) -> bool:
    """Whether the label's mains reads as a universal input (the parser's own words)."""
    label = read_mains_label(mains_text)
    return mains_text.strip().lower() in UNIVERSAL_WORDS or (label is not None and label.universal)


def label_ratings(typed: dict[str, str]) -> dict[str, str]:
    """The ratings to keep from the fields typed: empty ones left out, and the bench mains only
    for a universal unit (a fixed-mains unit is tested on its own mains). ReadingError (naming the
    rating) if the whole label does not read."""
    ratings = {key: text.strip() for key, text in typed.items() if text.strip()}
    if not is_universal(ratings.get("mains", "")):
        ratings.pop("bench_mains", None)
    parse_ratings(ratings)
    return ratings


def ticket_in_use(store: Store, ticket: str) -> bool:
    return ticket_taken(store, ticket)


def open_new_case(store: Store, knowledge: KnowledgeBase, technician_id: int,
                  form: IntakeForm) -> Loaded:
    """Keep a checked intake form as a new case, its symptoms as the first readings."""
    if ticket_taken(store, form.ticket):
        raise TicketInUse(f"ticket {form.ticket.strip()} is already a case: open it from the "
                          "list, or use another")
    # The engine is started before anything is kept: ratings the family cannot describe (an
    # output below its reference) are refused here, not kept as a case that never opens. The
    # shop's profile of this model's board, if any, gives the family its board's parts.
    family, ratings = family_on_board(knowledge.family(form.family_id), parse_ratings(form.ratings),
                                      board_of_model(store, form.model, form.family_id))
    state = start_diagnosis(family, ratings, priors.confirmed_fault_counts(store, family.id))
    terms = shop_terms(store)
    now = utc_now()
    customer_id = (find_or_add_customer(store, form.customer_name,
                                        form.customer_contact.strip() or None, at=now)
                   if form.customer_name.strip() else None)
    device_id = find_device(store, form.make, form.model, form.serial)
    if device_id is None and not form.serial.strip():
        # An unnumbered unit of a customer's model back within the window is that unit again.
        earlier = earlier_job_under_warranty(store, make=form.make, model=form.model, serial="",
                                             customer_id=customer_id, at=now,
                                             window_days=terms.comeback_days)
        device_id = None if earlier is None else earlier.device_id
    if device_id is None:
        device_id = people.add_device(store, make=form.make.strip(), model=form.model.strip(),
                                      kind=form.kind, label_ratings=form.ratings,
                                      serial=form.serial.strip() or None)
    case_id = cases.open_case(store, ticket_ref=form.ticket.strip(), device_id=device_id,
                              technician_id=technician_id, family_id=family.id,
                              ratings=form.ratings, notes=form.notes, customer_id=customer_id,
                              quoted_cents=form.quoted_cents, opened_at=now,
                              comeback_days=terms.comeback_days)
    for check_id in form.symptoms:
        state = warm(state.with_reading(check_id, "yes"))
        keep(store, case_id, state.readings[-1], state)
    record = load_case_record(store, case_id)
    notice = "Case opened."
    if record.return_of is not None:
        notice += f" Kept as a warranty return of job {record.return_of.ticket}."
    if family is not knowledge.family(form.family_id):
        notice += f" The board profile of {form.model.strip()} is applied."
    return Loaded(case_view(record, family), warm(state), notice=notice,
                  photos=board_photos(store, form.model, family.id))
