"""A small shop of jobs with prices, parts, customers and warranty returns, written through the
store's bench functions from a plain plan, so tests can recompute every figure from the plan
itself (never from SQL)."""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime, timedelta

from fixbench.store.cases import add_repair_action, close_case, open_case
from fixbench.store.customers import find_or_add_customer
from fixbench.store.people import add_device, add_technician
from tests.store.conftest import RATINGS

RATE_NOW = 3000  # cents per hour in the shop's settings now
TECHNICIANS = ("Wren Aldous", "Pim Castor")
MODELS = (("Quillon", "QX-5"), ("Tarnwick", "TW-9"))


@dataclass(frozen=True)
class Job:
    ticket: str
    tech: int  # index into TECHNICIANS
    unit: int  # index into UNITS
    opened: datetime
    hours: float  # from intake to handed back; None keeps the job open
    outcome: str
    minutes: int
    parts: tuple[int, ...]  # cents per part fitted
    price: int | None  # final price in cents
    rate: int | None  # labour rate per hour it was closed at (None: before rates were kept)
    fault: str | None = None
    family: str = "pwm_flyback"
    customer: int | None = None  # index into CUSTOMERS


CUSTOMERS = (("Odile Fenwright", "0171 555 0101"), ("Barnaby Quist", None))
# unit: (model index, serial)
UNITS = ((0, "S-100"), (0, "S-101"), (1, "S-200"), (1, None), (0, None), (1, None))
T0 = datetime(2024, 3, 4, 9, 0)

PLAN = (
    Job("M1", 0, 0, T0, 5.0, "repaired", 40, (150, 90), 4500, 2400, "Q1.short", customer=0),
    Job("M2", 1, 2, T0 + timedelta(days=2), 30.0, "repaired", 25, (300,), 3500, None,
        "C1.dried"),
    Job("M3", 0, 1, T0 + timedelta(days=9), 52.5, "no_fault_found", 15, (), 1500, 2400),
    Job("M4", 1, 3, T0 + timedelta(days=20), 3.0, "repaired", 55, (120,), None, 2400,
        "Q1.short", "self_oscillating", customer=1),
    # M1's unit back within the window: a warranty return, done for nothing.
    Job("M5", 1, 0, T0 + timedelta(days=40), 8.0, "repaired", 20, (95,), 0, 2400, "C2.dried",
        customer=0),
    # M2's unit back within the window: a return of M2, found not worth repairing this time.
    Job("M6", 0, 2, T0 + timedelta(days=45), 200.0, "not_economical", 10, (), 1000, 3600),
    # Barnaby's unnumbered TW-9 back: the same customer and model, a return of M4.
    Job("M7", 0, 5, T0 + timedelta(days=60), 26.0, "repaired", 35, (60, 60), 0, 3600,
        "R3.open", "self_oscillating", customer=1),
    # Odile's other QX-5, told apart from M1's by its serial: not a return.
    Job("M10", 1, 1, T0 + timedelta(days=50), 6.0, "repaired", 30, (80,), 3000, 3600,
        "C3.dried", customer=0),
    # The same unit back 147 days after M2's repair: a new job, not a return.
    Job("M8", 1, 2, T0 + timedelta(days=150), 4.0, "repaired", 45, (200,), 5000, 3600,
        "C1.dried"),
    Job("M9", 0, 4, T0 + timedelta(days=151), None, "", 0, (), None, None),  # still open
)
RETURNS = {"M5": "M1", "M6": "M2", "M7": "M4"}


def write_money_shop(store) -> dict[str, int]:
    """Write :data:`PLAN`; returns ticket -> case id."""
    people = [add_technician(store, name) for name in TECHNICIANS]
    customers = [find_or_add_customer(store, name, contact) for name, contact in CUSTOMERS]
    units = [add_device(store, make=MODELS[model][0], model=MODELS[model][1], kind="charger",
                        label_ratings=RATINGS, serial=serial) for model, serial in UNITS]
    ids = {}
    for job in PLAN:
        case_id = open_case(store, ticket_ref=job.ticket, device_id=units[job.unit],
                            technician_id=people[job.tech], family_id=job.family,
                            ratings=RATINGS, opened_at=job.opened,
                            customer_id=None if job.customer is None else customers[job.customer])
        ids[job.ticket] = case_id
        if job.hours is None:
            continue
        for cents in job.parts:
            add_repair_action(store, case_id, part_id="X1", action="replaced",
                              parts_cost_cents=cents, done_at=job.opened)
        part = None if job.fault is None else job.fault.split(".")[0]
        close_case(store, case_id, outcome=job.outcome, bench_minutes=job.minutes,
                   confirmed_fault=job.fault, confirmed_part=part,
                   closed_at=job.opened + timedelta(hours=job.hours), price_cents=job.price,
                   labour_rate_cents=job.rate)
    return ids


def closed_jobs() -> list[Job]:
    return [job for job in PLAN if job.hours is not None]


def labour(jobs) -> int:
    """Labour in cents as a shop would work it out: minutes x rate / 60, rounded half up."""
    cent_minutes = sum(job.minutes * (RATE_NOW if job.rate is None else job.rate) for job in jobs)
    return (cent_minutes + 30) // 60


def model_of(job: Job) -> tuple[str, str]:
    return MODELS[UNITS[job.unit][0]]
