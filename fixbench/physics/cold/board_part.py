"""One part of a board as the cold network takes it: kind, pins on nodes, value and state."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class BoardPart:
    """One part on the board.

    ``pins`` maps the kind's pin names (see part_models.PINS) to nodes. ``value`` is in SI units: ohm
    for resistive parts and a transformer's primary, farad for capacitors, volt for a Zener, None
    where a value means nothing. ``count`` resistors of ``value / count`` each make a chain (a
    board's "2 x 2.2 Mohm" start-up resistor is value 4.4 Mohm, count 2); a controller's value is
    its supply pin's internal resistance to ground. ``spread`` gives the lowest and highest a good
    part's value may be, as factors on ``value`` (0.95, 1.05 for a 5 % resistor; wide where the
    value is the family's guess rather than the board's marking). ``extra`` carries kind-specific
    figures as (name, value) pairs: a capacitor's ``esr_ohm``, a fuse's or conductor's ``ohm``, a
    transformer's ``aux_ohm``, ``secondary_ohm`` and ``<winding>_henry``, and
    ``drop_shift_v``, how far a part's junctions sit from their type's typical drop."""

    id: str
    kind: str
    pins: tuple[tuple[str, str], ...]
    value: float | None = None
    count: int = 1
    spread: tuple[float, float] = (1.0, 1.0)
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
