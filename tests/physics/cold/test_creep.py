"""How a reading creeps while capacitors charge from the meter, against ngspice transients."""

from __future__ import annotations

import math

import pytest

from fixbench.physics.cold.creep import SETTLED_SHARE, creep
from fixbench.physics.cold.meter import HANDHELD
from fixbench.physics.cold.readings import diode_test, ohms
from fixbench.physics.cold.solve import operating_point
from tests.physics.cold import boards
from tests.support.cold_spice import Probe, run_transient

pytestmark = pytest.mark.slow

PS = boards.primary_side()
TL = boards.opto_tl431()
CASES = [
    pytest.param(PS, "out", "sec", "diode_test", id="output-rectifier-reversed"),
    pytest.param(PS, "sec", "out", "diode_test", id="output-rectifier-forward"),
    pytest.param(TL, "ref", "sgnd", "ohmmeter", id="tl431-divider-lower"),
    pytest.param(PS, "vcc", "pgnd", "ohmmeter", id="vcc-to-ground"),
    pytest.param(PS, "bulk", "pgnd", "ohmmeter", id="bulk-capacitor"),
]
# Backward Euler on 20 steps a decade against ngspice's adaptive trapezoidal steps: within 3 %.
TRACE_REL = 0.03


def _source(net, red, black, instrument):
    return HANDHELD.diode_test if instrument == "diode_test" else ohms(net, red, black).source


@pytest.mark.parametrize("net, red, black, instrument", CASES)
def test_creep_follows_ngspice_transient(net, red, black, instrument, ngspice, tmp_path):
    source = _source(net, red, black, instrument)
    trace = creep(net, red, black, source, instrument)
    picked = [k for k in range(0, len(trace.times), 5) if 1e-3 <= trace.times[k] <= 4 * trace.settle_s]
    spice = run_transient(Probe(net, red, black, source), [trace.times[k] for k in picked], tmp_path)
    for k, volts in zip(picked, spice):
        assert trace.volts[k] == pytest.approx(volts, rel=TRACE_REL, abs=1e-7)  # [src: ngspice .tran uic, same board and meter]


@pytest.mark.parametrize("net, red, black, instrument", CASES)
def test_creep_starts_at_the_touch_reading_and_ends_at_the_settled_one(net, red, black, instrument):
    source = _source(net, red, black, instrument)
    trace = creep(net, red, black, source, instrument)
    settled = diode_test(net, red, black) if instrument == "diode_test" else ohms(net, red, black)
    touch = operating_point(net.elements, red, black, source, discharged=True)
    assert trace.volts[0] == pytest.approx(touch.volts, rel=1e-6, abs=1e-12)
    assert trace.volts[-1] == pytest.approx(settled.point.volts, rel=1e-4)
    assert trace.settle_s > 0.1  # a capacitor is in reach in every case


def test_reversed_output_rectifier_reaches_over_range_in_about_two_seconds():
    # 680 uF charged from a 3 V source behind 2.4 kohm: it passes the 2 V display limit after
    # R C ln(3 / (3 - 2)) = 1.79 s [closed form: RC charging].
    trace = creep(PS, "out", "sec", HANDHELD.diode_test, "diode_test")
    expected = HANDHELD.diode_test.source_ohm * 680e-6 * math.log(3.0 / (3.0 - 2.0))
    assert trace.settle_s == pytest.approx(expected, rel=0.15)  # [closed form: RC charging; 20 steps a decade]
    assert 0 < SETTLED_SHARE < 0.1
