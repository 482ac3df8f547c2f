"""Intake: reading the label ratings as typed, what the shop's record offers to complete the form
from, and opening the case with its symptoms as the first readings.

Ratings are read by the one ratings parser, :func:`fixbench.physics.ratings.parse_ratings`: a
single field is read by giving the parser a reference label with that one field replaced, so the
intake accepts and refuses exactly what the parser does ("85-265 V" is a universal input
everywhere). Everything that touches the database here runs off the GUI thread.
"""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.engine import start_diagnosis
from fixbench.knowledge import KnowledgeBase
from fixbench.physics.ratings import UNIVERSAL_WORDS, parse_ratings
from fixbench.quantities import ReadingError
from fixbench.store import StoreInputError, cases, people, priors
from fixbench.store.case_record import load_case_record
from fixbench.store.database import Store
from fixbench.store.intake_lookups import KnownModel, find_device, known_models, ticket_taken
from fixbench.workflows.bench import Loaded, case_view, keep, warm

# A label every rule of the parser accepts, to read one typed field against.
REFERENCE_LABEL = {"mains": "230 V", "output": "5 V", "current": "1 A"}

__all__ = ["REFERENCE_LABEL", "IntakeForm", "KnownModel", "TicketInUse", "is_universal",
           "known_models", "label_ratings", "open_new_case", "read_rating_field", "ticket_in_use"]


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
    return mains_text.strip().lower() in UNIVERSAL_WORDS


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
    family = knowledge.family(form.family_id)
    # The engine is started before anything is kept: ratings the family cannot describe (an
    # output below its reference) are refused here, not kept as a case that never opens.
    state = start_diagnosis(family, parse_ratings(form.ratings),
                            priors.confirmed_fault_counts(store, family.id))
    device_id = find_device(store, form.make, form.model, form.serial)
    if device_id is None:
        device_id = people.add_device(store, make=form.make.strip(), model=form.model.strip(),
                                      kind=form.kind, label_ratings=form.ratings,
                                      serial=form.serial.strip() or None)
    case_id = cases.open_case(store, ticket_ref=form.ticket.strip(), device_id=device_id,
                              technician_id=technician_id, family_id=family.id,
                              ratings=form.ratings, notes=form.notes)
    for check_id in form.symptoms:
        state = warm(state.with_reading(check_id, "yes"))
        keep(store, case_id, state.readings[-1], state)
    record = load_case_record(store, case_id)
    return Loaded(case_view(record, family), warm(state), notice="Case opened.")
