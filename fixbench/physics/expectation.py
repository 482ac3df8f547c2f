"""The value a healthy unit shows at one test point: a nominal figure, a band, and a unit."""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.quantities import format_band, format_quantity


@dataclass(frozen=True)
class Expectation:
    """Nominal value and band in SI base units. A bound is None where it does not apply."""

    nominal: float | None
    low: float | None
    high: float | None
    unit: str

    def __post_init__(self) -> None:
        if self.low is not None and self.high is not None and self.low > self.high:
            raise ValueError(f"band inverted: low {self.low} > high {self.high} ({self.unit})")

    def contains(self, value: float) -> bool:
        if self.low is not None and value < self.low:
            return False
        if self.high is not None and value > self.high:
            return False
        return True

    def describe(self) -> str:
        # A narrow band (a reference voltage) needs a fourth digit to be read against.
        narrow = (self.nominal and self.low is not None and self.high is not None
                  and (self.high - self.low) < 0.05 * abs(self.nominal))
        digits = 4 if narrow else 3
        nominal = format_quantity(self.nominal, self.unit, digits) if self.nominal is not None else None
        band = format_band(self.low, self.high, self.unit, digits)
        if nominal and band:
            return f"{nominal} ({band})"
        return nominal or band or "any"


def around(nominal: float, tolerance: float, unit: str) -> Expectation:
    """Nominal value with a symmetric relative tolerance, e.g. around(4700, 0.05, 'ohm')."""
    spread = abs(nominal) * tolerance
    return Expectation(nominal, nominal - spread, nominal + spread, unit)
