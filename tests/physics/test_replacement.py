"""What to buy for a replaced part: ratings from the unit's stresses, the board's marking first."""

import pytest

from fixbench.knowledge import load_knowledge
from fixbench.knowledge.board import BoardProfile, PartEntry, on_board
from fixbench.physics.ratings import parse_ratings
from fixbench.physics.replacement import bulk_max, replacement_spec

UNIVERSAL = parse_ratings({"mains": "universal", "output": "5 V", "current": "2 A"})
EUROPE = parse_ratings({"mains": "230 V", "output": "5 V", "current": "1 A"})
KB = load_knowledge()


def _spec(family_id: str, part_id: str, ratings=UNIVERSAL, board: BoardProfile | None = None):
    family = KB.family(family_id)
    if board is not None:
        family = on_board(family, board)
    return replacement_spec(family.part(part_id), ratings, family.design).text


def test_the_bulk_rail_peak_is_that_of_the_highest_mains():
    # 265 VAC gives 375 V DC [src: Power Integrations AN-17]; less two diode drops here.
    assert bulk_max(UNIVERSAL) == pytest.approx(375.0, abs=3.0)
    # 230 V +10 % is 253 V [src: IEC 60038 Table 1]: about 356 V.
    assert bulk_max(EUROPE) == pytest.approx(253 * 2**0.5 - 1.8, abs=0.5)


def test_a_universal_switch_is_bought_for_its_off_state_peak_with_margin():
    text = _spec("pwm_flyback", "Q1")
    # VDS = Vbulk_max + VOR + spike, VOR 135 V for universal input [src: Power Integrations AN-19]:
    # about 375 + 135 x 1.5 = 577 V; 20 % margin gives a 700 V part (600-800 V switches are the
    # trade's range, trade primer section 2).
    assert "off-state peak about 57" in text and "700 V or more" in text


def test_a_bulk_capacitor_for_universal_input_is_a_400_volt_part_and_105_degrees():
    # 375 V peak: a 400 V rating [practice; AN-17's 375 V], 105 C grade [practice]
    assert _spec("pwm_flyback", "C1").split("; ")[1:] == ["400 V or more (works at 373 V)", "105 \u00b0C"]


def test_the_boards_marking_wins_over_the_typical_value():
    board = BoardProfile(parts=(PartEntry("C1", "C5", "10 uF 400 V"),
                                PartEntry("R1", "R3 + R4", "2 x 2.2 Mohm", package="1206")))
    assert _spec("primary_side", "C1", EUROPE, board).startswith("10 uF; 400 V (as fitted) or more")
    chain = _spec("primary_side", "R1", EUROPE, board)
    # Two 1206 resistors share the 356 V peak: 178 V each, within a 1206 part's 200 V
    # [memory: thick-film chip resistor datasheets].
    assert chain.startswith("2 x 2.2 Mohm in series") and "178 V or more across each" in chain
    assert "1206 chip resistor's" not in chain and chain.endswith("package 1206")
    # One typical 1 Mohm resistor across the universal peak needs more than a 1206 part.
    assert "use 2 in series" in _spec("primary_side", "R1")


def test_fuse_diodes_and_output_capacitor_name_their_type():
    assert "time-lag (T)" in _spec("pwm_flyback", "F1")  # [src: IEC 60127-2; inrush: practice]
    assert _spec("pwm_flyback", "D4").startswith("Schottky")
    assert "fast or ultrafast" in _spec("pwm_flyback", "D3")
    assert "low-ESR" in _spec("pwm_flyback", "C3")
    assert "fusible" in _spec("self_oscillating", "F1")
    assert _spec("pwm_flyback", "U1") == "the same type as fitted"


@pytest.mark.parametrize("mains", ["120 V", "230 V", "universal"])
def test_every_part_of_every_family_has_a_spec(mains):
    ratings = parse_ratings({"mains": mains, "output": "12 V", "current": "1 A"})
    for family in KB.families.values():
        for part in family.parts:
            assert replacement_spec(part, ratings, family.design).text
