"""One case's whole story, in the order it happened, and the same readings through today's engine.

:func:`load_case_story` reads the case with :func:`fixbench.store.case_record.load_case_record`
(the one case loader) and the knowledge base, and returns frozen entries the case window draws;
:func:`rerun_case` replays the standing readings as typed through the engine of this build
(:func:`fixbench.engine.replay.replay_readings`) and says whether its conclusion differs from the
one kept with the case.
Expected bands are the healthy unit's, from the fault model of the case's family and ratings.
An amended case is told as it was closed (the old value of each field's first amendment), then
each amendment with who, when and why; the card shows the values as they stand now. A job that
came back tells when and why (the customer's words at the return, and what was found then); a
warranty return names the job it came back from.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from datetime import datetime

from fixbench.engine import start_diagnosis
from fixbench.engine.fault_model import FaultModel, cached_fault_model
from fixbench.engine.readings import read
from fixbench.engine.replay import replay_readings
from fixbench.knowledge import KnowledgeBase
from fixbench.physics.ratings import describe_label, parse_ratings
from fixbench.quantities import ReadingError
from fixbench.store.amendments import AMENDABLE
from fixbench.store.case_record import CaseRecord, KeptAmendment, LinkedJob, load_case_record
from fixbench.store.database import Store
from fixbench.store.errors import StoreInputError
from fixbench.store.shop_terms import labour_cents, shop_terms
from fixbench.workflows.board_profiles import BoardProfile, board_of_model, family_on_board, named_on_board
from fixbench.workflows.money import money_text
from fixbench.workflows.trade_names import TradeNames, family_name, outcome_name

SUSPECTS_SHOWN = 3


@dataclass(frozen=True)
class Step:
    """One line of the timeline: when, what kind, a headline and the lines under it."""

    at: datetime
    kind: str  # intake, reading, skipped, repair, verification, closed, came_back, amendment
    headline: str
    details: tuple[str, ...] = ()
    in_band: bool | None = None  # readings and verifications: inside the healthy band?


@dataclass(frozen=True)
class CaseStory:
    case_id: int
    ticket: str
    title: str  # "Pellamor PM-65 laptop adapter"
    facts: tuple[tuple[str, str], ...]  # label, value: the case card
    steps: tuple[Step, ...]
    family_id: str
    ratings: dict
    readings: tuple[tuple[str, str], ...]  # (check id, typed) in the order taken
    kept_first_suspect: str | None
    confirmed_fault: str | None
    status: str = "closed"
    # The amendable fields as they stand now (store identifiers, not words), for the amend dialog.
    current: dict = field(default_factory=dict)
    amended: frozenset[str] = frozenset()  # fields changed by an amendment since closing
    customer_id: int | None = None  # for the customer's other jobs
    customer: str = ""  # the customer's name (and contact), or "" when none is kept
    return_of: tuple[int, str] | None = None  # (case id, ticket) this job came back from
    returns: tuple[tuple[int, str], ...] = ()  # (case id, ticket) of the jobs it came back as


@dataclass(frozen=True)
class Rerun:
    today_faults: tuple[str, ...]
    today_probability: float
    kept_first_suspect: str | None
    confirmed_fault: str | None
    changed: bool
    skipped: tuple[str, ...]  # readings today's engine could not take, and why
    summary: str


def _check_model(model: FaultModel | None, check_id: str):
    """The check a stored id names: itself, or the check that reads that signal."""
    if model is None:
        return None
    for candidate in model.checks:
        if candidate.check.id == check_id or candidate.check.target == f"signal:{check_id}":
            return candidate
    return None


def expected_band(model: FaultModel | None, check_id: str, typed: str) -> tuple[str, bool | None]:
    check_model = _check_model(model, check_id)
    if check_model is None:
        return "no band known for this check", None
    try:
        in_band = read(check_model, typed).in_band
    except ReadingError:
        in_band = None
    expected = (check_model.healthy.describe() if check_model.healthy is not None
                else str(check_model.healthy_outcome))
    return expected, in_band


def fault_model_of(kb: KnowledgeBase, case: CaseRecord, board: BoardProfile | None = None) -> FaultModel | None:
    """The fault model the case's readings are read against (on the board of its model, where the
    shop has a profile of it)."""
    try:
        family, ratings = family_on_board(kb.family(case.family_id), parse_ratings(dict(case.ratings)), board)
        return cached_fault_model(family, ratings)
    except (KeyError, ReadingError):
        return None  # shown as "no band known"; the record itself is still told in full


def shown_value(names: TradeNames, family_id: str, field_name: str, value) -> str:
    """A stored field value in the owner's words: an outcome's name, a fault's or part's title."""
    if value is None or value == "":
        return "none"
    if field_name == "outcome":
        return outcome_name(value)
    if field_name == "confirmed_fault":
        return names.fault_label(value, family_id)
    if field_name == "confirmed_part":
        return names.part_label(value, family_id)
    if field_name == "confirmed_stage":
        family = names.knowledge.families.get(family_id)
        known = family is not None and value in {s.id for s in family.stages}
        return family.stage(value).title if known else str(value)
    if field_name == "bench_minutes":
        return f"{value} min"
    if field_name == "price_cents":
        return money_text(value)
    return str(value)


def _came_back_step(names: TradeNames, closed_at: datetime | None, later: LinkedJob) -> Step:
    """The job came back: when, what the customer said then, and what was found."""
    days = "" if closed_at is None else f", {(later.opened_at - closed_at).days} days after it was handed back"
    lines = [f"The customer said: {later.notes}" if later.notes else "No complaint written down."]
    if later.confirmed_fault:
        lines.append("Found then: " + names.fault_label(later.confirmed_fault, later.family_id))
    elif later.outcome:
        lines.append("Outcome then: " + outcome_name(later.outcome))
    else:
        lines.append("Still in the workshop.")
    return Step(later.opened_at, "came_back",
                f"Came back under warranty as job {later.ticket}{days}", tuple(lines))


def _amendment_steps(names: TradeNames, family_id: str,
                     changes: tuple[KeptAmendment, ...]) -> list[Step]:
    """One step per amendment made: rows written together (a fault with its part and stage) share
    who, why and the moment, and are told as one."""
    groups: list[list[KeptAmendment]] = []
    for change in changes:
        last = groups[-1][-1] if groups else None
        if (last is not None
                and (last.amended_by, last.reason) == (change.amended_by, change.reason)
                and abs((change.amended_at - last.amended_at).total_seconds()) < 2):
            groups[-1].append(change)
        else:
            groups.append([change])

    def shown(change: KeptAmendment, value) -> str:
        return shown_value(names, family_id, change.field, value)

    steps = []
    for group in groups:
        fields = [change.field.replace("_", " ") for change in group]
        first = group[0]
        if len(group) == 1:
            lines = [f"Was: {shown(first, first.old_value)}",
                     f"Now: {shown(first, first.new_value)}"]
        else:
            lines = [f"{field_words.capitalize()} was {shown(c, c.old_value)}; "
                     f"now {shown(c, c.new_value)}" for field_words, c in zip(fields, group)]
        what = fields[0] if len(fields) == 1 else ", ".join(fields[:-1]) + " and " + fields[-1]
        steps.append(Step(first.amended_at, "amendment",
                          f"{what.capitalize()} amended by {first.amended_by}",
                          tuple(lines) + (f"Why: {first.reason}",)))
    return steps


def load_case_story(store: Store, kb: KnowledgeBase, case_id: int) -> CaseStory:
    names = TradeNames(kb)
    case = load_case_record(store, case_id)
    board = board_of_model(store, case.model, case.family_id)
    model = fault_model_of(kb, case, board)
    fam = case.family_id
    terms = shop_terms(store)
    intake_lines = [f"{case.make} {case.model} ({case.kind}), {family_name(fam)}",
                    "Label: " + describe_label(case.ratings)]
    if case.notes:
        intake_lines.append(f"The customer said: {case.notes}")
    if case.return_of is not None:
        intake_lines.append(f"Warranty return of job {case.return_of.ticket}, handed back "
                            f"{case.return_of.closed_at:%Y-%m-%d}")
    if case.quoted_cents is not None:
        intake_lines.append(f"Quoted {money_text(case.quoted_cents, terms.currency)}")
    steps = [Step(case.opened_at, "intake", f"Taken in by {case.technician}", tuple(intake_lines))]
    steps.extend(_came_back_step(names, case.closed_at, later) for later in case.returns)
    previous: list[str] = []
    for reading in case.readings:
        if not reading.standing:
            steps.append(Step(reading.entered_at, "reading",
                              f"{reading.seq}. {names.check(reading.check_id, fam)} (taken back)",
                              (f"Read: {reading.typed}; taken back at "
                               f"{reading.withdrawn_at:%H:%M} and left out of the diagnosis",)))
            continue
        expected, in_band = expected_band(model, reading.check_id, reading.typed)
        ranked = [s.fault_id for s in reading.suspects]
        lines = [f"Read {reading.typed}; a healthy unit: {expected}",
                 "Suspects: " + "; ".join(f"{names.fault_label(s.fault_id, fam)} "
                                           f"{s.probability:.0%}"
                                           for s in reading.suspects[:SUSPECTS_SHOWN])]
        if previous and ranked and ranked[0] != previous[0]:
            lines.append(f"Most likely fault changed from {names.fault_label(previous[0], fam)} "
                         f"to {names.fault_label(ranked[0], fam)}")
        previous = ranked or previous
        steps.append(Step(reading.entered_at, "reading",
                          f"{reading.seq}. {names.check(reading.check_id, fam)}",
                          tuple(lines), in_band))
    for repair in case.repairs:
        steps.append(Step(repair.done_at, "repair",
                          f"{repair.action.capitalize()}: "
                          f"{named_on_board(names.part_label(repair.part_id, fam), repair.part_id, board)}",
                          (f"Parts cost {money_text(repair.cost_cents, terms.currency)}",)
                          + ((f"Fitted: {repair.value_fitted}",) if repair.value_fitted else ())
                          + ((f"Test before power-up: {'passed' if repair.test_passed else 'failed'}",)
                             if repair.test_passed is not None else ())
                          + ((repair.note,) if repair.note else ())))
    for skip in case.skipped:
        steps.append(Step(skip.skipped_at, "skipped",
                          f"Could not measure: {names.check(skip.check_id, fam)}"))
    for check in case.verifications:
        expected, in_band = expected_band(model, check.check_id, check.typed)
        steps.append(Step(check.entered_at, "verification",
                          f"Verified {names.check(check.check_id, fam)}: "
                          f"{'passed' if check.passed else 'FAILED'}",
                          (f"Read {check.typed}; a healthy unit: {expected}",), in_band))
    current = {name: getattr(case, name) for name in AMENDABLE}
    as_closed = {name: case.as_closed(name) for name in AMENDABLE}
    amended = frozenset(change.field for change in case.amendments)
    if case.closed_at is not None:
        closed_lines = [f"Bench time {as_closed['bench_minutes']} min"]
        rate = terms.labour_rate_cents if case.labour_rate_cents is None else case.labour_rate_cents
        labour = labour_cents((as_closed["bench_minutes"] or 0) * rate)
        closed_lines.append(
            f"Charged {money_text(as_closed['price_cents'], terms.currency)}; parts "
            f"{money_text(case.parts_cents, terms.currency)}, labour "
            f"{money_text(labour, terms.currency)}")
        if as_closed["confirmed_fault"]:
            closed_lines.append("Confirmed fault: "
                                + names.fault_label(as_closed["confirmed_fault"], fam))
        if amended:
            closed_lines.append("As closed; amended since (below): "
                                + ", ".join(sorted(f.replace("_", " ") for f in amended)))
        steps.append(Step(case.closed_at, "closed",
                          f"Outcome: {outcome_name(as_closed['outcome'])}", tuple(closed_lines)))
    steps.extend(_amendment_steps(names, fam, case.amendments))

    def card(name: str, value: str) -> str:
        return f"{value} (amended)" if value and name in amended else value

    customer = ""
    if case.customer_name:
        customer = case.customer_name + (f" ({case.customer_contact})"
                                         if case.customer_contact else "")
    facts = (("Ticket", case.ticket), ("Customer", customer),
             ("Technician", case.technician), ("Family", family_name(fam)),
             ("Serial", case.serial or ""),
             ("Outcome", card("outcome", outcome_name(case.outcome, case.status))),
             ("Confirmed fault", card("confirmed_fault",
                                      names.fault_label(case.confirmed_fault, fam))),
             ("Confirmed part", card("confirmed_part", "" if not case.confirmed_part else
                                     shown_value(names, fam, "confirmed_part",
                                                 case.confirmed_part))),
             ("Bench minutes", card("bench_minutes", "" if case.bench_minutes is None
                                    else str(case.bench_minutes))),
             ("Price", card("price_cents", "" if case.price_cents is None
                            else money_text(case.price_cents, terms.currency))),
             ("Warranty return of", "" if case.return_of is None else case.return_of.ticket),
             ("Came back as", ", ".join(r.ticket for r in case.returns)),
             ("Notes", card("notes", case.notes)))
    return CaseStory(case_id, case.ticket, f"{case.make} {case.model} {case.kind}", facts,
                     tuple(sorted(steps, key=lambda s: s.at)), fam, dict(case.ratings),
                     tuple((r.check_id, r.typed) for r in case.standing_readings),
                     case.top_suspect_fault, case.confirmed_fault, case.status, current,
                     amended, case.customer_id, customer,
                     None if case.return_of is None else (case.return_of.id,
                                                          case.return_of.ticket),
                     tuple((r.id, r.ticket) for r in case.returns))


def rerun_case(kb: KnowledgeBase, story: CaseStory) -> Rerun:
    """The case's readings through today's engine; ``changed`` if its first suspect differs."""
    try:
        start = start_diagnosis(kb.family(story.family_id), parse_ratings(story.ratings))
    except (KeyError, ReadingError) as err:
        raise StoreInputError(f"today's engine cannot take this case: {err}") from None
    replayed = replay_readings(start, story.readings)
    skipped = [f"{r.check_id} '{r.typed}': {r.reason}" for r in replayed.refused]
    conclusion = replayed.state.final_conclusion()
    today = conclusion.faults
    changed = story.kept_first_suspect is not None and story.kept_first_suspect not in today[:1]
    names = TradeNames(kb)
    verdict = "would change" if changed else "would stay the same"
    summary = (f"Today's engine names {names.fault_label(today[0], story.family_id)} "
               f"({conclusion.probability:.0%}); the case kept "
               f"{names.fault_label(story.kept_first_suspect, story.family_id) or 'no suspect'}. "
               f"The conclusion {verdict}.")
    if story.confirmed_fault:
        right = story.confirmed_fault in today
        summary += (f" The confirmed fault was "
                    f"{names.fault_label(story.confirmed_fault, story.family_id)}: today's engine "
                    f"{'agrees' if right else 'does not name it first'}.")
    return Rerun(today, conclusion.probability, story.kept_first_suspect, story.confirmed_fault,
                 changed, tuple(skipped), summary)
