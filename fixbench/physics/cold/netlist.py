"""A board's cold netlist: its parts with their pins on named nodes, and the elements they show a
meter.

A ``BoardPart`` is one part of the board: its kind, where each pin sits, its value (the family's
generic one or the board's own marking, with the number of resistors in a chain), and its state
(healthy, a failure mode, a lifted leg). A ``ColdNetlist`` is the board; faults, lifted legs and a
board's own values are new netlists made with ``with_mode``, ``with_lifted`` and ``with_value``.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from functools import cached_property

from fixbench.physics.cold.board_part import BoardPart
from fixbench.physics.cold.elements import Element
from fixbench.physics.cold.part_models import cold_elements


@dataclass(frozen=True)
class ColdNetlist:
    """The board's parts; compared and hashed by value, so a netlist can key a cache."""

    parts: tuple[BoardPart, ...]
    _index: dict = field(default_factory=dict, compare=False, hash=False, repr=False)

    def __post_init__(self) -> None:
        self._index.update({p.id: i for i, p in enumerate(self.parts)})
        if len(self._index) != len(self.parts):
            ids = [p.id for p in self.parts]
            duplicated = sorted({i for i in ids if ids.count(i) > 1})
            raise ValueError(f"parts named more than once: {', '.join(duplicated)}")

    def part(self, part_id: str) -> BoardPart:
        try:
            return self.parts[self._index[part_id]]
        except KeyError:
            raise KeyError(f"no part '{part_id}' in the cold netlist") from None

    def _replaced(self, part: BoardPart) -> ColdNetlist:
        parts = list(self.parts)
        parts[self._index[part.id]] = part
        return ColdNetlist(tuple(parts))

    def with_mode(self, part_id: str, mode: str) -> ColdNetlist:
        """The board with one part in a failure mode ("ok" restores it)."""
        return self._replaced(replace(self.part(part_id), mode=mode))

    def with_modes(self, modes: dict[str, str]) -> ColdNetlist:
        netlist = self
        for part_id, mode in sorted(modes.items()):
            netlist = netlist.with_mode(part_id, mode)
        return netlist

    def with_lifted(self, part_id: str, pin: str) -> ColdNetlist:
        """The board with one leg of a part lifted off its pad."""
        return self._replaced(replace(self.part(part_id), lifted=pin))

    def with_value(self, part_id: str, value: float, count: int = 1,
                   spread: tuple[float, float] | None = None) -> ColdNetlist:
        """The board with a part's own value, e.g. from the board's marking (with the spread of
        a part so marked)."""
        part = self.part(part_id)
        return self._replaced(replace(part, value=value, count=count, spread=spread or part.spread))

    def only(self, part_ids: frozenset[str]) -> ColdNetlist:
        """The board cut down to some of its parts."""
        return ColdNetlist(tuple(p for p in self.parts if p.id in part_ids))

    def with_part(self, part: BoardPart) -> ColdNetlist:
        """The board with one part replaced by ``part`` (same id)."""
        return self._replaced(part)

    @cached_property
    def elements(self) -> tuple[Element, ...]:
        return tuple(e for part in self.parts for e in cold_elements(part))

    @cached_property
    def owners(self) -> dict[str, str]:
        """Element name -> the id of the part it belongs to."""
        return {e.name: part.id for part in self.parts for e in cold_elements(part)}

    @cached_property
    def nodes(self) -> frozenset[str]:
        return frozenset(n for e in self.elements for n in e.nodes)
