"""One part of a board as the cold network takes it: kind, pins on nodes, value and state."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class BoardPart:
    """One part on the board.

    ``pins`` maps the kind's pin names (see part_models.PINS) to nodes. ``value`` is in SI units: ohm
    for resistive parts and a transformer's primary, farad for capacitors, volt for a Zener, None
    where a value means nothing. ``count`` resistors of ``value / count`` each make a chain (a
    board's "2 x 2.2 Mohm" start-up resistor is value 4.4 Mohm, count 2). ``tolerance`` is the
    relative spread of the value between good parts. ``extra`` carries kind-specific figures (a
    capacitor's ESR, a transformer's other windings) as (name, value) pairs."""

    id: str
    kind: str
    pins: tuple[tuple[str, str], ...]
    value: float | None = None
    count: int = 1
    tolerance: float = 0.0
    mode: str = "ok"
    lifted: str | None = None
    extra: tuple[tuple[str, float], ...] = ()

    def __post_init__(self) -> None:
        if self.count < 1:
            raise ValueError(f"{self.id}: a chain has at least one resistor, not {self.count}")
        if self.lifted is not None and self.lifted not in dict(self.pins):
            raise ValueError(f"{self.id}: no pin '{self.lifted}' to lift (pins: {', '.join(dict(self.pins))})")

    def node(self, pin: str) -> str:
        """The node a pin sits on; a lifted pin sits on a node of its own."""
        if pin == self.lifted:
            return lifted_node(self.id, pin)
        try:
            return dict(self.pins)[pin]
        except KeyError:
            raise KeyError(f"{self.id} ({self.kind}) has no pin '{pin}'") from None

    def figure(self, name: str, default: float) -> float:
        return dict(self.extra).get(name, default)


def lifted_node(part_id: str, pin: str) -> str:
    """Name of the node a lifted pin floats on: the probe goes on the lifted leg itself."""
    return f"{part_id}.{pin}(lifted)"
