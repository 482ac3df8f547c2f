"""Each kind of part as the meter sees it, healthy and failed: failures are netlist changes."""

from __future__ import annotations

import pytest

from fixbench.knowledge.model import KIND_MODES
from fixbench.physics.cold.junctions import ZENER_BREAKDOWN, ZENER_TEST_CURRENT
from fixbench.physics.cold.board_part import BoardPart
from fixbench.physics.cold.elements import Capacitor, Junction, Resistor, Winding
from fixbench.physics.cold.netlist import ColdNetlist
from fixbench.physics.cold.part_models import (
    DRIED_CAPACITANCE,
    DRIED_ESR,
    PINS,
    REQUIRED_PINS,
    SHORT_OHM,
    cold_elements,
)

VALUES = {"fuse": 2.0, "thermistor": 10.0, "resistor": 1e3, "lead": None, "electrolytic": 10e-6,
          "film_capacitor": 10e-9, "zener": 3.9, "transformer": 2.0, "inductor": 0.3}


def part_of(kind: str, mode: str = "ok") -> BoardPart:
    pins = tuple((pin, f"n_{pin}") for pin in PINS[kind])
    return BoardPart("X1", kind, pins, VALUES.get(kind), mode=mode, extra=(("esr_ohm", 1.0),))


@pytest.mark.parametrize("kind", sorted(KIND_MODES))
def test_every_kind_has_a_cold_model_in_every_mode_the_knowledge_names(kind):
    healthy = cold_elements(part_of(kind))
    assert healthy, f"a healthy {kind} shows the meter something"
    for mode in KIND_MODES[kind]:
        failed = cold_elements(part_of(kind, mode))
        if mode != "dead":
            assert failed != healthy, f"{kind} {mode} changes what the meter sees"


@pytest.mark.parametrize("kind", sorted(k for k, modes in KIND_MODES.items() if "short" in modes))
def test_a_short_is_a_low_resistance(kind):
    shorts = [e for e in cold_elements(part_of(kind, "short")) if isinstance(e, Resistor)]
    assert shorts and all(e.ohm < 10.0 for e in shorts)


def test_dried_capacitor_keeps_a_quarter_of_its_value_and_gains_esr():
    (dried,) = cold_elements(part_of("electrolytic", "dried"))
    assert isinstance(dried, Capacitor)
    assert dried.farad == pytest.approx(10e-6 * DRIED_CAPACITANCE)
    assert dried.esr_ohm == pytest.approx(1.0 * DRIED_ESR)


def test_mosfet_is_its_body_diode_from_source_to_drain():
    (body,) = cold_elements(part_of("mosfet"))
    assert isinstance(body, Junction) and (body.anode, body.cathode) == ("n_source", "n_drain")
    (short,) = cold_elements(part_of("mosfet", "short"))
    assert short == Resistor("X1.short", "n_drain", "n_source", SHORT_OHM)


def test_zener_breaks_down_at_its_voltage_at_the_test_current():
    forward, breakdown = cold_elements(part_of("zener"))
    assert (forward.anode, forward.cathode) == ("n_anode", "n_cathode")
    assert (breakdown.anode, breakdown.cathode) == ("n_cathode", "n_anode")
    assert breakdown.offset_v + ZENER_BREAKDOWN.drop(ZENER_TEST_CURRENT) == pytest.approx(3.9)  # [textbook: Vz at its test current]


def test_bridge_failures_hit_one_diode():
    healthy = cold_elements(part_of("bridge"))
    assert len(healthy) == 4 and all(isinstance(e, Junction) for e in healthy)
    assert len(cold_elements(part_of("bridge", "open"))) == 3
    shorted = cold_elements(part_of("bridge", "short"))
    assert sum(isinstance(e, Resistor) for e in shorted) == 1


def test_transformer_gives_the_windings_it_has_pins_for():
    part = BoardPart("T1", "transformer", (("primary_a", "b"), ("primary_b", "d"), ("secondary_a", "s"),
                                           ("secondary_b", "g")), 2.0)
    assert [e.name for e in cold_elements(part)] == ["T1.primary", "T1.secondary"]
    assert all(isinstance(e, Winding) for e in cold_elements(part))
    assert [e.name for e in cold_elements(BoardPart(**{**part.__dict__, "mode": "open"}))] == ["T1.secondary"]
    assert REQUIRED_PINS["transformer"] == ("primary_a", "primary_b")


def test_wrong_pins_and_modes_are_programmer_errors_that_name_the_part():
    with pytest.raises(ValueError, match="X1 .resistor.: pins must be a, b; unknown c; missing b"):
        cold_elements(BoardPart("X1", "resistor", (("a", "n1"), ("c", "n2")), 1.0))
    with pytest.raises(ValueError, match="X1: a resistor has no failure mode 'short'"):
        cold_elements(part_of("resistor", "short"))
    with pytest.raises(ValueError, match="no pin 'gate' to lift"):
        BoardPart("X1", "resistor", (("a", "n1"), ("b", "n2")), 1.0, lifted="gate")
    with pytest.raises(ValueError, match="named more than once"):
        ColdNetlist((part_of("resistor"), part_of("resistor")))


def test_lifted_pin_floats_on_its_own_node():
    net = ColdNetlist((part_of("resistor"),)).with_lifted("X1", "b")
    (resistor,) = net.elements
    assert (resistor.a, resistor.b) == ("n_a", "X1.b(lifted)")


def test_a_boost_inductor_is_a_winding_and_open_shows_nothing():
    (choke,) = cold_elements(part_of("inductor"))
    assert isinstance(choke, Winding) and choke.ohm == 0.3
    assert cold_elements(part_of("inductor", "open")) == ()


def test_a_shorted_integrated_switch_shorts_drain_to_source_and_its_supply_pin():
    shorts = {(e.a, e.b) for e in cold_elements(part_of("integrated_controller", "short")) if isinstance(e, Resistor)}
    assert shorts == {("n_drain", "n_source"), ("n_vcc", "n_source")}
    healthy = cold_elements(part_of("integrated_controller"))
    body = [e for e in healthy if isinstance(e, Junction) and e.name.endswith("body")]
    assert len(body) == 1 and (body[0].anode, body[0].cathode) == ("n_source", "n_drain")
