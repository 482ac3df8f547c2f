"""The demo shop's history without its readings: people, customers, devices, dates, outcomes,
prices, comebacks, and when the trainees practise.

Everything here is fictional and deterministic for a seed: a made-up shop on 230 V 50 Hz mains
with four technicians and two trainees, invented customers (names made up, contacts at the
example.org domain that RFC 2606 keeps for examples), invented device makes and models (each
model built on one supply family, with the ratings on its label), about two years of cases
arriving on working days, faults drawn within the unit's family in proportion to the knowledge
base's prior weights, each technician's pace as a log-normal spread around their own speed
(repair times are commonly modelled as log-normal; Kline, "The Lognormal Distribution as a
Repair-Time Model", 1984), units waiting in the queue and at the counter for a few days, a price
quoted per kind of unit, some units that come back within 90 days (done again for nothing) and
some that are not worth repairing. The readings, repairs, verifications and bench minutes of each
case come from the engine, in :mod:`fixbench.demo.bench_play`; the practice rounds are played by
the practice package itself, in :mod:`fixbench.demo.practice_play`.
"""

from __future__ import annotations

import random
from dataclasses import dataclass, replace
from datetime import datetime, timedelta

SHOP_END = datetime(2025, 6, 30, 18, 0)
SHOP_DAYS = 730
SHOP_MAINS = "230 V"  # the bench supply of the fictional shop, 50 Hz
# name, pace: the technician's bench time as a multiple of the checks' and repairs' book minutes
TECHNICIANS = (("Mara Quellby", 0.85), ("Oskar Venn", 1.15), ("Ilse Farrow", 1.0),
               ("Teodor Malk", 1.35))
TRAINEES = ("Juno Pellory", "Ravi Ashcombe")
# The shop's terms of business: labour per hour of bench time, currency, tax wording.
LABOUR_RATE_CENTS = 2200  # what an hour at the bench costs the shop
CURRENCY = "EUR"
TAX_WORDING = "Prices include VAT at 21 %."
FIRST_NAMES = ("Odile", "Barnaby", "Wren", "Tamsin", "Corwin", "Ines", "Lorcan", "Maelis",
               "Pietro", "Saskia", "Hollis", "Yara", "Desmond", "Liesel", "Anouk", "Emrys",
               "Fenella", "Gideon", "Henrike", "Ottilie")
LAST_NAMES = ("Fenwright", "Quist", "Aldous", "Brackett", "Corlander", "Dunmore", "Eskew",
              "Farrant", "Gallow", "Hesketh", "Ilbury", "Jessop", "Kettering", "Lumley",
              "Marwood", "Nettleship", "Ormerod", "Pendry", "Quarrie", "Rudyard")
# The price quoted per kind of unit, and the bench fee for a unit found not worth repairing or
# with no fault in it (invented for the demo, like everything here).
QUOTE_CENTS = {"phone charger": 2900, "usb adapter": 3500, "router adapter": 4500,
               "monitor adapter": 4900, "laptop adapter": 6500}
BENCH_FEE_CENTS = 1000
REPEAT_CUSTOMER_CHANCE = 0.3  # a new unit brought by a customer seen before
UNIVERSAL = {"mains": "100-240 V", "frequency": "50 Hz"}
FIXED_230 = {"mains": "230 V", "frequency": "50 Hz"}


@dataclass(frozen=True)
class DemoModel:
    make: str
    model: str
    kind: str
    family_id: str
    label: dict  # the ratings printed on the unit's label
    share: float  # how often this model comes in, relative to the others


MODELS = (
    DemoModel("Zintrek", "Z-Mini", "phone charger", "self_oscillating",
              {**FIXED_230, "output": "5 V", "current": "1 A"}, 3.0),
    DemoModel("Quillon", "QX-5", "phone charger", "self_oscillating",
              {**FIXED_230, "output": "5 V", "current": "1 A"}, 2.0),
    DemoModel("Quillon", "QX-10", "phone charger", "primary_side",
              {**UNIVERSAL, "output": "5 V", "current": "2 A"}, 2.5),
    DemoModel("Tarnwick", "TW-20", "usb adapter", "primary_side",
              {**UNIVERSAL, "output": "5 V", "current": "2 A"}, 2.0),
    DemoModel("Tarnwick", "TW-5P", "usb adapter", "pwm_flyback",
              {**UNIVERSAL, "output": "5 V", "current": "2 A"}, 1.5),
    DemoModel("Halvenor", "HV-12", "router adapter", "pwm_flyback",
              {**UNIVERSAL, "output": "12 V", "current": "2 A"}, 1.5),
    DemoModel("Halvenor", "HV-12S", "monitor adapter", "pwm_flyback",
              {**UNIVERSAL, "output": "12 V", "current": "3 A"}, 1.0),
    DemoModel("Pellamor", "PM-65", "laptop adapter", "pwm_flyback",
              {**UNIVERSAL, "output": "19 V", "current": "3.4 A"}, 2.0),
)
OUTCOME_WEIGHTS = {"repaired": 80, "not_economical": 8, "no_fault_found": 6,
                   "returned_unrepaired": 6}
COMEBACK_CHANCE = 0.06
CASES_PER_WORKING_DAY = 1.1


@dataclass(frozen=True)
class FaultChoice:
    family_id: str
    fault_id: str
    part_id: str
    stage_id: str
    weight: float
    part_cost_cents: int


@dataclass(frozen=True)
class DemoCustomer:
    number: int
    name: str
    contact: str


@dataclass(frozen=True)
class DemoDevice:
    number: int
    make: str
    model: str
    kind: str
    family_id: str
    label_ratings: dict
    owner: DemoCustomer | None = None

    @property
    def bench_ratings(self) -> dict:
        """The ratings a case of this unit is diagnosed with: the label plus the shop's mains."""
        return {**self.label_ratings, "bench_mains": SHOP_MAINS}


@dataclass(frozen=True)
class DemoCase:
    ticket: str
    opened_at: datetime
    technician: str
    device: DemoDevice
    fault: FaultChoice
    outcome: str
    pace: float  # bench minutes per book minute for this case
    wait_minutes: int  # from intake to the first reading (the queue)
    comeback_of: str | None
    pickup_hours: float = 2.0  # from the last bench minute to handed back at the counter
    quote_cents: int = 0  # quoted at the counter
    complaint: str = ""  # the customer's words


@dataclass(frozen=True)
class DemoPractice:
    """A practice round to be played: who, when, on what, and how far along their training."""

    trainee: str
    attempted_at: datetime
    family_id: str
    level_id: str
    seed: int
    progress: float  # 0 at the start of the two years, 1 at the end


def catalogue_from_knowledge(kb) -> list[FaultChoice]:
    """Every fault of every family in the knowledge base, with its prior weight and part cost."""
    choices = []
    for family in kb.families.values():
        parts = {part.id: part for part in family.parts}
        for fault in family.faults:
            part = parts[fault.part]
            choices.append(FaultChoice(family.id, fault.id, part.id, part.stage, fault.weight,
                                       round(part.cost * 100)))
    return choices


def plan_shop(seed: int, catalogue: list[FaultChoice], days: int = SHOP_DAYS) -> list[DemoCase]:
    """The last ``days`` days of cases up to ``SHOP_END`` (about two years), oldest first."""
    rng = random.Random(seed)
    counter = random.Random(seed + 3)  # customers, queue, pickup and quotes: a stream of their own
    customers: list[DemoCustomer] = []
    devices: list[DemoDevice] = []
    cases: list[DemoCase] = []
    comebacks: dict[datetime, list[DemoCase]] = {}
    day = (SHOP_END - timedelta(days=days)).replace(hour=9, minute=0)
    while day < SHOP_END:
        if day.weekday() < 5:
            arrivals = [None] * _poisson(rng, CASES_PER_WORKING_DAY)
            arrivals += comebacks.pop(day.date(), [])
            for slot, earlier in enumerate(arrivals):
                opened = day + timedelta(minutes=35 * slot + rng.randrange(30))
                if earlier is None:
                    device = _new_device(rng, len(devices) + 1)
                    device = _owned(counter, device, customers)
                    devices.append(device)
                    fault = _family_fault(rng, device.family_id, catalogue)
                else:
                    device, fault = earlier.device, _comeback_fault(rng, earlier, catalogue)
                case = _at_the_counter(counter, _plan_case(rng, len(cases) + 1, opened, device,
                                                           fault, earlier))
                cases.append(case)
                if case.outcome == "repaired" and rng.random() < COMEBACK_CHANCE:
                    back = (opened + timedelta(days=rng.randrange(8, 85))).date()
                    comebacks.setdefault(back, []).append(case)
        day += timedelta(days=1)
    return cases


def _owned(counter: random.Random, device: DemoDevice,
           customers: list[DemoCustomer]) -> DemoDevice:
    """The device with its owner: a customer seen before, or a new one."""
    if customers and counter.random() < REPEAT_CUSTOMER_CHANCE:
        owner = counter.choice(customers)
    else:
        first, last = counter.choice(FIRST_NAMES), counter.choice(LAST_NAMES)
        owner = DemoCustomer(len(customers) + 1, f"{first} {last}",
                             f"{first.lower()}.{last.lower()}{len(customers) + 1}@example.org")
        customers.append(owner)
    return replace(device, owner=owner)


COMPLAINTS = ("dead, no light", "stopped charging", "dead after a storm", "smells burnt",
              "works when warm", "ticks and will not start", "output keeps dropping out",
              "charges very slowly", "dead, fuse looks black")


def _at_the_counter(counter: random.Random, case: DemoCase) -> DemoCase:
    """The queue before the bench, the wait for the customer to collect, the quote and the
    customer's words; a warranty return is quoted nothing."""
    # Whole days in the queue and at the counter, so the bench works in the day as it would.
    return replace(case, wait_minutes=counter.randrange(10, 240)
                   + 24 * 60 * counter.choice((0, 0, 1, 1, 2)),
                   pickup_hours=round(counter.uniform(2.0, 8.0)
                                      + 24 * counter.choice((0, 1, 1, 2, 3)), 2),
                   quote_cents=0 if case.comeback_of else QUOTE_CENTS[case.device.kind],
                   complaint=counter.choice(COMPLAINTS))


def price_cents(case: DemoCase, outcome: str) -> int:
    """What the customer paid: the quote for a repair, the bench fee for a unit not worth
    repairing or with no fault, nothing for a unit taken back unrepaired or a warranty return."""
    if case.comeback_of is not None or outcome == "returned_unrepaired":
        return 0
    return case.quote_cents if outcome == "repaired" else BENCH_FEE_CENTS


def _poisson(rng: random.Random, mean: float) -> int:
    # Knuth's multiplication method (TAOCP vol. 2, 3.4.1): fine for a mean near 1.
    limit, count, product = pow(2.718281828459045, -mean), 0, rng.random()
    while product > limit:
        count += 1
        product *= rng.random()
    return count


def _new_device(rng: random.Random, number: int) -> DemoDevice:
    model = rng.choices(MODELS, [m.share for m in MODELS])[0]
    return DemoDevice(number, model.make, model.model, model.kind, model.family_id,
                      dict(model.label))


def _family_fault(rng: random.Random, family_id: str, catalogue: list[FaultChoice]) -> FaultChoice:
    same_family = [c for c in catalogue if c.family_id == family_id]
    return rng.choices(same_family, [c.weight for c in same_family])[0]


def _comeback_fault(rng: random.Random, earlier: DemoCase, catalogue: list[FaultChoice]):
    # A comeback is often the same weak spot failing again, else any fault of the same family.
    if rng.random() < 0.5:
        return earlier.fault
    return _family_fault(rng, earlier.device.family_id, catalogue)


def _plan_case(rng, number, opened, device, fault, earlier) -> DemoCase:
    name, pace = rng.choice(TECHNICIANS)
    outcome = rng.choices(list(OUTCOME_WEIGHTS), list(OUTCOME_WEIGHTS.values()))[0]
    return DemoCase(ticket=f"W{opened:%y%m}-{number:04d}", opened_at=opened, technician=name,
                    device=device, fault=fault, outcome=outcome,
                    pace=round(pace * rng.lognormvariate(0, 0.25), 3),
                    wait_minutes=rng.randrange(10, 240),
                    comeback_of=None if earlier is None else earlier.ticket)


def plan_practice(seed: int) -> list[DemoPractice]:
    """Trainees' practice rounds: weekly, on a family each, easy for the first quarter of the two
    years and normal after; how they go is played by :mod:`fixbench.demo.practice_play`."""
    rng = random.Random(seed + 1)
    families = sorted({model.family_id for model in MODELS})
    rounds = []
    start = SHOP_END - timedelta(days=SHOP_DAYS)
    weeks = SHOP_DAYS // 7
    for week in range(weeks):
        progress = week / weeks
        for number, trainee in enumerate(TRAINEES):
            rounds.append(DemoPractice(
                trainee=trainee, attempted_at=start + timedelta(weeks=week, days=4,
                                                                hours=16 + number),
                family_id=rng.choice(families), level_id="easy" if progress < 0.25 else "normal",
                seed=seed * 100_000 + week * 10 + number, progress=progress))
    return rounds
