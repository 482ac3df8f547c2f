"""What the customer's one-page job report says, in the customer's words, from the case record.

Titled by what happened to the unit (a repair, a test that found no fault, an inspection of a unit
not worth repairing). Parts fitted are listed under what was replaced; parts only checked before
power-up are listed apart with their result, never as replaced. The charges add up: parts, labour
(bench minutes at the shop's rate), and, where the agreed price differs, the line that brings them
to it (a warranty return is covered by the job it came back from); the total is the price charged,
in the shop's currency, with its tax wording. The labour line is the rest of the agreed price after
the parts (the shop's own hourly cost stays in the shop's figures); a job kept without a price is
billed at the shop's labour rate. The supply's engineering family is left out: the customer knows
their unit by its make, model and kind.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime

from fixbench.knowledge import KnowledgeBase
from fixbench.physics.ratings import describe_label
from fixbench.store.case_record import CaseRecord, load_case_record
from fixbench.store.database import Store
from fixbench.store.shop_terms import ShopTerms, labour_cents, shop_terms
from fixbench.workflows.board_profiles import board_of_model, named_on_board
from fixbench.workflows.case_story import expected_band, fault_model_of
from fixbench.workflows.money import money_text, rate_text
from fixbench.workflows.trade_names import TradeNames, outcome_name

TITLES = {"repaired": "Repair report", "no_fault_found": "Test report: no fault found",
          "not_economical": "Inspection report: not worth repairing",
          "returned_unrepaired": "Inspection report: returned unrepaired"}
FOUND_NO_FAULT = ("We tested the power supply under load and found no fault in it. If the device "
                  "still does not charge or run, the fault is likely in the device itself or its "
                  "cable; we have not changed anything.")


@dataclass(frozen=True)
class JobReportContent:
    title: str
    ticket: str
    customer: str | None
    opened_at: datetime
    closed_at: datetime | None
    device: tuple[str, str, str, str]  # make and model, kind, serial, label
    found: str  # what was found, in words
    outcome: str
    warranty: str  # "" or a sentence on the job this one came back from
    replaced: tuple[tuple[str, str, str], ...]  # part, value fitted, parts cost (text)
    checked: tuple[tuple[str, str], ...]  # part checked before power-up, its result
    charges: tuple[tuple[str, str], ...]  # each line of the bill, the amount (text)
    total: str  # the total charged (text with currency)
    total_cents: int
    tax_wording: str
    measured: tuple[tuple[str, str, str, str], ...]  # check, reading, expected, result


def _charges(case: CaseRecord, terms: ShopTerms) -> tuple[list[tuple[str, int]], int]:
    """The bill's lines in cents, and the total: the price charged (or, with none kept, parts and
    labour at the shop's rate). A warranty return lists what the work was worth and takes it off."""
    rate = terms.labour_rate_cents if case.labour_rate_cents is None else case.labour_rate_cents
    minutes = case.bench_minutes or 0
    parts = case.parts_cents
    at_rate = labour_cents(minutes * rate)
    if case.return_of is not None and not case.price_cents:
        return [("Parts", parts), (f"Labour: {minutes} min at the bench", at_rate),
                (f"Covered by the warranty of job {case.return_of.ticket}",
                 -(parts + at_rate))], 0
    if case.price_cents is None:
        return [("Parts", parts), (f"Labour: {minutes} min at {rate_text(rate, terms.currency)}",
                                   at_rate)], parts + at_rate
    labour = max(0, case.price_cents - parts)
    lines = [("Parts", parts), (f"Labour: {minutes} min at the bench", labour)]
    if parts + labour != case.price_cents:  # parts dearer than the price agreed
        lines.append(("Taken off to keep to the price agreed", case.price_cents - parts - labour))
    return lines, case.price_cents


def job_report_content(store: Store, kb: KnowledgeBase, case_id: int) -> JobReportContent:
    """For the customer: the device, what was found, replaced, checked, measured and charged."""
    names = TradeNames(kb)
    terms = shop_terms(store)
    case = load_case_record(store, case_id)
    fam = case.family_id
    board = board_of_model(store, case.model, fam)
    part = lambda part_id: named_on_board(names.part_label(part_id, fam), part_id, board)
    if case.outcome == "no_fault_found":
        found = FOUND_NO_FAULT
    elif case.confirmed_fault:
        found = (f"{names.fault_label(case.confirmed_fault, fam)}: the "
                 f"{named_on_board(names.part_label(case.confirmed_part, fam).lower(), case.confirmed_part, board)} "
                 "had failed.")
    else:
        found = "No single faulty part was confirmed."
    model = fault_model_of(kb, case, board)
    replaced = tuple((part(r.part_id), r.value_fitted or "",
                      money_text(r.cost_cents, terms.currency))
                     for r in case.repairs if r.action == "replaced")
    checked = tuple((part(r.part_id),
                     "tested good, kept" if r.test_passed else
                     "failed its test, replaced (above)" if r.test_passed is False else "tested")
                    for r in case.repairs if r.action == "tested")
    measured = tuple((names.check(v.check_id, fam), v.typed,
                      expected_band(model, v.check_id, v.typed)[0],
                      "passed" if v.passed else "failed") for v in case.verifications)
    lines, total = _charges(case, terms)
    warranty = "" if case.return_of is None else (
        f"This unit came back under the warranty of job {case.return_of.ticket}, taken in on "
        f"{case.return_of.opened_at:%d %B %Y}.")
    return JobReportContent(
        title=TITLES.get(case.outcome, "Job report: still in the workshop"),
        ticket=case.ticket, customer=case.customer_name, opened_at=case.opened_at,
        closed_at=case.closed_at,
        device=(f"{case.make} {case.model}", case.kind, case.serial or "-",
                describe_label(case.ratings)),
        found=found, outcome=outcome_name(case.outcome, case.status), warranty=warranty,
        replaced=replaced, checked=checked,
        charges=tuple((label, money_text(cents, terms.currency)) for label, cents in lines),
        total=money_text(total, terms.currency), total_cents=total,
        tax_wording=terms.tax_wording, measured=measured)
