"""The cold-network solve against ngspice operating points on in-circuit set-ups.

For each set-up fixbench picks the range (autorange) and reads; ngspice solves the same whole board
with the same meter source on that range, and on the range below, where it must find the reading
over full scale too (so ngspice confirms the range choice); the two run as copies in one deck.
"""

from __future__ import annotations

import math

import pytest

from fixbench.physics.cold.meter import HANDHELD
from fixbench.physics.cold.readings import diode_test, ohms
from tests.physics.cold.configurations import SETUPS, Setup
from tests.support.cold_spice import Probe, run_op

pytestmark = pytest.mark.slow

VOLT_REL = 1e-4  # both solve the same equations; ngspice's 1e12 ohm node shunts move a few ppm
VOLT_ABS = 1e-7


def fixbench_reading(setup: Setup):
    if setup.instrument == "diode_test":
        return diode_test(setup.netlist, setup.red, setup.black)
    return ohms(setup.netlist, setup.red, setup.black, low_voltage=setup.instrument == "low_voltage_ohms")


def range_below(setup: Setup, reading):
    if setup.instrument == "diode_test":
        return None
    ranges = HANDHELD.ranges(setup.instrument == "low_voltage_ohms")
    k = ranges.index(reading.source)
    return ranges[k - 1] if k > 0 else None


@pytest.fixture(scope="module")
def ngspice_points(ngspice, tmp_path_factory):
    """ngspice's red-probe voltage per set-up on fixbench's range and on the range below."""
    points = {}
    for setup in SETUPS:
        reading = fixbench_reading(setup)
        probes = [Probe(setup.netlist, setup.red, setup.black, reading.source)]
        keys = [(setup.name, "chosen")]
        below = range_below(setup, reading)
        if below is not None:
            probes.append(Probe(setup.netlist, setup.red, setup.black, below))
            keys.append((setup.name, "below"))
        volts = run_op(probes, tmp_path_factory.mktemp(setup.name))
        points.update({key: (probe.source, v) for key, probe, v in zip(keys, probes, volts)})
    return points


def display(setup: Setup, source, volts: float) -> float:
    if setup.instrument == "diode_test":
        return volts if volts <= source.full_scale else math.inf
    amps = (source.open_circuit_v - volts) / source.source_ohm
    value = volts / amps if amps > 0 else math.inf
    return value if value <= source.full_scale else math.inf


def test_there_are_at_least_twenty_setups_with_every_issue_example():
    assert len(SETUPS) >= 20
    issue = [s.name for s in SETUPS if s.why.startswith("issue 10")]
    for example in ("ps_fb_upper", "ps_output_rectifier", "ps_vcc_red_on_ground", "ps_vcc_aux_diode_shorted",
                    "ps_mosfet_body_forward_ohms", "ps_clamp_resistor_diode_forward", "ps_shorted_mosfet_from_bulk",
                    "tl_fb_lower", "tl_fb_upper", "bridge_open_diode"):
        assert example in issue


@pytest.mark.parametrize("setup", SETUPS, ids=[s.name for s in SETUPS])
def test_solve_matches_ngspice_operating_point(setup, ngspice_points):
    reading = fixbench_reading(setup)
    source, spice_volts = ngspice_points[(setup.name, "chosen")]
    assert reading.point.volts == pytest.approx(spice_volts, rel=VOLT_REL, abs=VOLT_ABS)  # [src: ngspice .op, same board and meter source]
    spice_display = display(setup, source, spice_volts)
    if math.isinf(spice_display):
        assert math.isinf(reading.value)  # [src: ngspice .op: over full scale]
    else:
        assert reading.value == pytest.approx(spice_display, rel=10 * VOLT_REL)  # [src: ngspice .op, V / I]


@pytest.mark.parametrize("setup", [s for s in SETUPS if s.instrument != "diode_test"],
                         ids=[s.name for s in SETUPS if s.instrument != "diode_test"])
def test_range_below_the_chosen_one_is_over_range_in_ngspice(setup, ngspice_points):
    if (setup.name, "below") not in ngspice_points:
        assert fixbench_reading(setup).source == HANDHELD.ranges(setup.instrument == "low_voltage_ohms")[0]
        return
    source, volts = ngspice_points[(setup.name, "below")]
    assert math.isinf(display(setup, source, volts))  # [src: ngspice .op on the next lower range: over full scale]


def _family_legs():
    from fixbench.knowledge import load_knowledge
    from fixbench.physics.cold.family_board import family_board, probing_of
    from fixbench.physics.ratings import parse_ratings

    ratings = parse_ratings({"mains": "230 V", "output": "5 V", "current": "2 A"})
    legs = []
    for family in load_knowledge().families.values():
        board = family_board(family, ratings)
        for check in family.checks:
            if not check.probes or check.instrument not in ("ohmmeter", "diode_test"):
                continue
            probing = probing_of(check)
            for k, (red, black) in enumerate(probing.legs()):
                legs.append(pytest.param(probing.board(board), red, black, check.instrument,
                                         id=f"{family.id}-{check.id}-{k}"))
    return legs


@pytest.mark.parametrize("board, red, black, instrument", _family_legs())
def test_every_family_cold_check_matches_ngspice(board, red, black, instrument, ngspice, tmp_path):
    reading = diode_test(board, red, black) if instrument == "diode_test" else ohms(board, red, black)
    (volts,) = run_op([Probe(board, red, black, reading.source)], tmp_path)
    assert reading.point.volts == pytest.approx(volts, rel=VOLT_REL, abs=VOLT_ABS)  # [src: ngspice .op on the family's whole board]
