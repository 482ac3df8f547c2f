"""The healthy band of a cold check: what a good board may read, from the spread of its good parts
and what the meter adds.

Each uncertain figure of a part in reach (a resistor's value within its tolerance, a capacitor's
capacitance and ESR, a junction's drop within its type's spread, a fuse's or conductor's
resistance) is set to its low and its high end in turn; the band adds up the worst-case shift of
every figure [textbook worst-case tolerance analysis, first order], then the meter's own error.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from fixbench.physics.cold.board_part import BoardPart
from fixbench.physics.cold.meter import HANDHELD, Meter
from fixbench.physics.cold.netlist import ColdNetlist
from fixbench.physics.cold.part_models import JUNCTION_KINDS
from fixbench.physics.cold.probing import Probing, parts_in_reach, reading_in_reach
from fixbench.physics.cold.readings import diode_test, ohms
from fixbench.physics.cold.solve import branch_currents, measured_block

# A new electrolytic reads from a quarter of the table's worst case up to twice it before it is
# suspect [src: glodark ESR chart for the worst case; practice for the factors].
ESR_SPREAD = (0.25, 2.0)
# A good fuse or cable conductor reads anywhere under an ohm [practice].
CONDUCTOR_OHM_SPREAD = (1e-3, 1.0)
# Capacitance ranges and ESR meters: (relative, absolute) error [memory: handheld capacitance ranges
# about +/-3 %; ESR meters about +/-5 % plus a few hundredths of an ohm].
AC_ACCURACY = {"capacitance": (0.03, 0.0), "esr": (0.05, 0.02)}
CARRYING_SHARE = 0.01


@dataclass(frozen=True)
class Band:
    """Nominal reading and the band of a good board, SI; a bound is None where open-ended (an OL
    reading has no upper bound)."""

    nominal: float
    low: float | None
    high: float | None


def _variants(part: BoardPart) -> list[tuple[BoardPart, BoardPart]]:
    """The part at the low and at the high end of each of its uncertain figures."""
    pairs = []
    low, high = part.spread
    if part.value is not None and (low, high) != (1.0, 1.0):
        pairs.append((replace(part, value=part.value * low), replace(part, value=part.value * high)))
    extra = dict(part.extra)

    def with_extra(name: str, value: float) -> BoardPart:
        return replace(part, extra=tuple({**extra, name: value}.items()))

    if part.kind == "electrolytic" and extra.get("esr_ohm"):
        esr = extra["esr_ohm"]
        pairs.append((with_extra("esr_ohm", esr * ESR_SPREAD[0]), with_extra("esr_ohm", esr * ESR_SPREAD[1])))
    if part.kind in ("fuse", "lead"):
        pairs.append((with_extra("ohm", CONDUCTOR_OHM_SPREAD[0]), with_extra("ohm", CONDUCTOR_OHM_SPREAD[1])))
    if part.kind in JUNCTION_KINDS:
        spread = JUNCTION_KINDS[part.kind].spread_v
        pairs.append((with_extra("drop_shift_v", -spread), with_extra("drop_shift_v", spread)))
    return pairs


def _accuracy(instrument: str, meter: Meter) -> tuple[float, float]:
    if instrument == "ohmmeter":
        return meter.ohms_accuracy
    if instrument == "diode_test":
        return meter.diode_accuracy
    return AC_ACCURACY[instrument]


def _carrying(netlist: ColdNetlist, probing: Probing, meter: Meter) -> list[str]:
    """Parts whose figures can move the reading: for the AC instruments every part in a leg's
    measured block; for ohms and diode test those carrying at least CARRYING_SHARE of the meter's
    current in some leg. A resistance carrying a share s of the test current moves the reading by
    s squared times its own change [src: Tellegen's theorem, the sensitivity of a driving-point
    resistance], a junction by about s times its drop's change, so the others add nothing visible."""
    board = probing.board(netlist)
    owners = board.owners
    if probing.instrument in ("capacitance", "esr"):
        return sorted({owners[e.name] for red, black in probing.legs()
                       for e in measured_block(board.elements, red, black, True)})
    carrying: set[str] = set()
    for red, black in probing.legs():
        shown = ohms(board, red, black, meter, touch=False) if probing.instrument == "ohmmeter" else \
            diode_test(board, red, black, meter, touch=False)
        if shown.point.amps <= 0.0:
            continue
        currents = branch_currents(measured_block(board.elements, red, black), shown.point)
        carrying.update(owners[name] for name, amps in currents.items()
                        if abs(amps) >= CARRYING_SHARE * shown.point.amps)
    return sorted(carrying)


def healthy_band(netlist: ColdNetlist, probing: Probing, meter: Meter = HANDHELD) -> Band:
    """What a good board reads on this check: nominal and worst-case band."""
    reach = parts_in_reach(netlist, probing)
    nominal = reading_in_reach(netlist, probing, reach, meter)
    down = up = 0.0
    reaches_ol = math.isinf(nominal)
    lowest_finite = math.inf if reaches_ol else nominal
    for part_id in _carrying(netlist.only(reach), probing, meter):
        part = netlist.part(part_id)
        for low_part, high_part in _variants(part):
            shifted = [reading_in_reach(netlist.with_part(p), probing, reach, meter) for p in (low_part, high_part)]
            if any(math.isinf(v) for v in shifted):
                reaches_ol = True
            lowest_finite = min([lowest_finite] + [v for v in shifted if not math.isinf(v)])
            if math.isinf(nominal):
                continue
            deltas = [v - nominal for v in shifted if not math.isinf(v)]
            down += min([0.0] + deltas)
            up += max([0.0] + deltas)
    relative, absolute = _accuracy(probing.instrument, meter)
    if math.isinf(nominal):
        low = None if math.isinf(lowest_finite) else lowest_finite * (1 - relative) - absolute
        return Band(nominal, low, None)
    low = max((nominal + down) * (1 - relative) - absolute, 0.0)
    high = None if reaches_ol else (nominal + up) * (1 + relative) + absolute
    return Band(nominal, low, high)
