"""The order in which to replace suspect parts when measuring further costs more than trying.

With mutually exclusive candidate faults of probability p_i and repair cost c_i, trying them in
decreasing p_i / c_i minimises the expected cost of repair [src: Kadane & Simon, Optimal strategies
for a class of constrained sequential problems, Annals of Statistics 5, 1977; applied to
troubleshooting by Heckerman, Breese & Rommelse, Decision-theoretic troubleshooting, CACM 38(3),
1995]. Expected cost of an order: sum over k of c_k times the chance the unit is still faulty before
step k.
"""

from __future__ import annotations

from dataclasses import dataclass

REPLACE_MINUTES = 10.0  # desolder, fit, clean: one through-hole part [practice]
MINUTES_PER_MONEY = 1.0  # a part's cost in bench minutes at the shop's rate (one unit per minute) [practice]


@dataclass(frozen=True)
class RepairStep:
    fault: str
    part: str
    probability: float
    cost: float  # minutes, parts counted at the shop rate

    @property
    def ratio(self) -> float:
        return self.probability / self.cost


def order_by_ratio(steps: list[RepairStep]) -> list[RepairStep]:
    return sorted(steps, key=lambda s: (-s.ratio, s.fault))


def expected_cost(order: list[RepairStep]) -> float:
    """Expected cost of trying repairs in this order until the unit works."""
    total, still_faulty = 0.0, 1.0
    for step in order:
        total += step.cost * still_faulty
        still_faulty -= step.probability
    return total
