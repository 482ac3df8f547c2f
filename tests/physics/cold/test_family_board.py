"""A family's board as the cold network: every part on its nodes with the value the ratings give it,
and a board's own value in place of the family's."""

from __future__ import annotations

import pytest

from fixbench.knowledge import load_knowledge
from fixbench.physics.capacitors import esr_new_max
from fixbench.physics.cold.family_board import family_board, probing_of
from fixbench.physics.cold.probing import reading
from fixbench.physics.part_values import rated_voltage, value_of
from fixbench.physics.ratings import parse_ratings

RATINGS = parse_ratings({"mains": "120 V", "output": "5 V", "current": "2 A"})


@pytest.fixture(scope="module")
def knowledge():
    return load_knowledge()


@pytest.mark.parametrize("family_id", ["primary_side", "pwm_flyback", "self_oscillating"])
def test_every_part_of_every_family_is_on_the_board_with_its_value(knowledge, family_id):
    family = knowledge.family(family_id)
    board = family_board(family, RATINGS)
    assert [p.id for p in board.parts] == [p.id for p in family.parts]
    for part in family.parts:
        on_board = board.part(part.id)
        assert on_board.pins == part.pins
        if part.kind in ("resistor", "thermistor", "electrolytic", "film_capacitor", "zener"):
            assert on_board.value == pytest.approx(value_of(part, RATINGS, family.design))
        if part.kind == "electrolytic":
            esr = esr_new_max(on_board.value, rated_voltage(part, RATINGS, family.design))
            assert dict(on_board.extra)["esr_ohm"] == pytest.approx(esr)  # [src: glodark ESR chart, via physics.capacitors]
    assert board.elements  # every kind has a cold model


def test_board_profile_value_changes_the_in_circuit_reading(knowledge):
    # A board whose start-up resistor is a chain of 2 x 2.2 Mohm rather than the family's value.
    family = knowledge.family("primary_side")
    check = family.check("start_resistor")
    board = family_board(family, RATINGS)
    generic = reading(board, probing_of(check))
    chain = reading(board.with_value("R1", 4.4e6, count=2, spread=(0.95, 1.05)), probing_of(check))
    assert chain > 3 * generic
    assert chain < 4.4e6  # the controller and bridge behind it still pull it down a little in circuit


def test_a_check_with_no_probes_is_not_a_cold_probing(knowledge):
    with pytest.raises(ValueError, match="no probes"):
        probing_of(knowledge.family("pwm_flyback").check("bulk_voltage"))
