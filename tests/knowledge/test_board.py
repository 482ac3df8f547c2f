"""Board profiles: markings read as printed, the family as the board has it, the profile file."""

import pytest

from fixbench.knowledge import load_knowledge
from fixbench.knowledge.board import (
    BoardError, BoardProfile, PartEntry, on_board, profile_from_toml, profile_to_toml, read_marking,
)


@pytest.fixture(scope="module")
def primary_side():
    return load_knowledge().family("primary_side")


def test_a_start_up_chain_is_read_as_its_resistors_in_series():
    # "2 x 2.2 Mohm", and the letter-for-point code 2M2 [src: IEC 60062, letter and digit code]
    for text in ("2 x 2.2 Mohm", "2x2M2", "2 \u00d7 2.2M in series"):
        marking = read_marking("resistor", text)
        assert marking.value == pytest.approx(4.4e6)
        assert marking.count == 2


def test_a_capacitor_marking_gives_value_voltage_and_temperature_grade():
    marking = read_marking("electrolytic", "1000uF/10V 105C")
    assert (marking.value, marking.rated_v, marking.temperature_c) == (pytest.approx(1e-3), 10.0, 105.0)
    # Electrolytics are printed in microfarads [practice]: a bare "10" on one is 10 uF.
    assert read_marking("electrolytic", "10 400V").value == pytest.approx(10e-6)
    # Film capacitors' three-digit code in picofarads: 104 is 100 nF [src: IEC 60062, 3-digit code]
    assert read_marking("film_capacitor", "104").value == pytest.approx(100e-9)
    # Two capacitors side by side are one capacitance to the meter.
    parallel = read_marking("electrolytic", "2 x 10 uF 400 V")
    assert (parallel.value, parallel.count) == (pytest.approx(20e-6), 1)


def test_a_fuse_marking_gives_rating_speed_and_voltage():
    # T: time-lag, F: fast-acting [src: IEC 60127-1, speed letters]
    marking = read_marking("fuse", "T2AL250V")
    assert (marking.value, marking.fuse_speed, marking.rated_v) == (2.0, "time-lag", 250.0)
    assert read_marking("fuse", "F500mA").value == pytest.approx(0.5)
    assert read_marking("zener", "5V1").value == pytest.approx(5.1)


def test_a_semiconductor_keeps_its_type_as_text():
    assert read_marking("fast_diode", "UF4007").value is None


@pytest.mark.parametrize("kind, text, says", [
    ("resistor", "10 uF", "marked with its value in ohm"),
    ("resistor", "2.2 m", "check the prefix"),  # 2.2 milliohm typed for 2.2 megohm
    ("electrolytic", "10 uF 400 V 450 V", "given twice"),
    ("fuse", "2 ohm", "as printed on it"),
    ("mosfet", "2 x 2N60", ""),  # bought by type: kept as text
    ("zener", "3 x 5V1", "only resistors"),
])
def test_a_marking_that_cannot_be_read_says_what_to_type(kind, text, says):
    if not says:
        assert read_marking(kind, text).value is None
        return
    with pytest.raises(BoardError, match=says):
        read_marking(kind, text)


def test_the_family_on_a_board_takes_its_values_and_leaves_the_family_as_loaded(primary_side):
    profile = BoardProfile("CH-5", "primary_side", (
        PartEntry("R1", designator="R3 + R4", value="2 x 2.2 Mohm"),
        PartEntry("C1", designator="C5", value="10 uF", rated="400 V", package="radial 10x16"),
    ))
    board = on_board(primary_side, profile)
    start = board.part("R1")
    assert (start.label, start.count, start.marked, start.marking) == ("R3 + R4", 2, True, "2 x 2.2 Mohm")
    assert board.part("C1").rated == "400.0 V" and board.part("C1").package == "radial 10x16"
    # The family's own R3 (sense) and R4 (clamp) are other parts on this board: not shown as R3, R4.
    assert board.part("R3").label == "R3 (typical)" and not board.part("R3").marked
    assert primary_side.part("R1").label == "R1" and primary_side.part("R1").value.startswith("rule:")
    assert on_board(primary_side, profile) is board  # one family per profile: caches stay warm
    assert on_board(primary_side, BoardProfile("CH-5")) is primary_side


def test_a_profile_naming_a_part_the_family_lacks_is_refused_with_near_matches(primary_side):
    with pytest.raises(BoardError, match=r"no part 'R11'.*did you mean R1"):
        on_board(primary_side, BoardProfile(parts=(PartEntry("R11", value="1k"),)))
    with pytest.raises(BoardError, match="part R1 .*in ohm"):
        on_board(primary_side, BoardProfile(parts=(PartEntry("R1", value="10 uF"),)))
    with pytest.raises(BoardError, match="R5 is given to both"):
        on_board(primary_side, BoardProfile(parts=(PartEntry("R1", designator="R5"),
                                                   PartEntry("R2", designator="r5"))))
    with pytest.raises(BoardError, match="for family 'pwm_flyback'"):
        on_board(primary_side, BoardProfile(family="pwm_flyback", parts=(PartEntry("R1", value="1M"),)))


def test_the_profile_file_reads_back_what_it_wrote():
    profile = BoardProfile('Acme "CH-5" \\ rev B', "primary_side", (
        PartEntry("C1", designator="C5", value="10 uF 400 V"),
        PartEntry("R1", designator="R3 + R4", value="2 x 2.2 Mohm", package="1206"),
    ))
    text = profile_to_toml(profile)
    assert "[parts.R1]" in text and 'designator = "R3 + R4"' in text
    assert profile_from_toml(text) == profile


@pytest.mark.parametrize("text, says", [
    ("model = 3", "'model' is text"),
    ("[parts.R1]\ncolour = 'red'", "unknown key 'colour'"),
    ("[parts.R1]\nvalue = 3", "every field is text"),
    ("parts = 1", "one table per part"),
    ("model = ", "not a TOML file"),
])
def test_a_broken_profile_file_is_refused_in_one_line(text, says):
    with pytest.raises(BoardError, match=says):
        profile_from_toml(text)
