"""`--board FILE.toml` on expect, simulate and diagnose: the board's own values and designators.

The issue's three examples, measured on the family's typical values first (the reproduction: a
healthy board read against the family flags its good part), then with the board's profile.
"""

import json

import pytest

from fixbench.cli import main
from fixbench.quantities import parse_quantity

START_CHAIN = """family = "primary_side"
[parts.R1]
designator = "R3 + R4"
value = "2 x 2.2 Mohm"
[parts.C3]
designator = "C9"
value = "1000 uF 10 V"
"""
FUSIBLE_22 = """[parts.F1]
designator = "FR1"
value = "22R"
"""


@pytest.fixture
def board(tmp_path):
    def write(text: str):
        path = tmp_path / "board.toml"
        path.write_text(text, encoding="utf-8")
        return str(path)
    return write


def _cold(capsys, family: str, *extra: str) -> dict[str, dict]:
    assert main(["expect", "--family", family, "--cold", "--json", *extra]) == 0
    return {r["check"]: r for r in json.loads(capsys.readouterr().out)}


def _healthy_readings(capsys, family: str, *extra: str) -> dict[str, float]:
    assert main(["simulate", "--family", family, "--fault", "no_fault", "--exact", "--json", *extra]) == 0
    case = json.loads(capsys.readouterr().out)
    return case, {r["check"]: parse_quantity(r["value"]).value for r in case["readings"]
                  if r["value"][0].isdigit()}


def _inside(row: dict, value: float) -> bool:
    return (row["low"] is None or row["low"] <= value) and (row["high"] is None or value <= row["high"])


@pytest.mark.parametrize("family, text, check, part_value", [
    ("primary_side", START_CHAIN, "start_resistor", 4.4e6),  # 2 x 2.2 Mohm in series
    ("primary_side", START_CHAIN, "output_cap_capacitance", 1000e-6),
    ("self_oscillating", FUSIBLE_22, "fuse_resistance", 22.0),  # a 22 ohm fusible resistor
])
def test_a_healthy_board_with_its_own_values_is_in_range_only_with_its_profile(capsys, board, family, text,
                                                                              check, part_value):
    path = board(text)
    _, readings = _healthy_readings(capsys, family, "--board", path)
    reading = readings[check]
    typical = _cold(capsys, family)[check]
    # The reproduction: read against the family's typical part, the good part is flagged.
    assert not _inside(typical, reading)
    own = _cold(capsys, family, "--board", path)[check]
    assert _inside(own, reading)
    assert own["part_value"] == pytest.approx(part_value) and own["marked"] is True
    assert typical["marked"] is False


def test_the_board_designators_name_the_parts_and_the_others_are_said_typical(capsys, board):
    rows = _cold(capsys, "primary_side", "--board", board(START_CHAIN))
    assert rows["start_resistor"]["designator"] == "R3 + R4"
    assert rows["output_cap_esr"]["designator"] == "C9"
    # The family's R3 and R4 are other parts on this board.
    assert rows["sense_resistor"]["designator"] == "R3 (typical)"
    assert rows["gate_resistor"]["designator"] == "R2"


def test_a_simulated_board_diagnoses_healthy_on_its_own_profile(capsys, board, tmp_path):
    case, _ = _healthy_readings(capsys, "primary_side", "--board", board(START_CHAIN))
    assert case["board"]["parts"]["R1"]["value"] == "2 x 2.2 Mohm"
    path = tmp_path / "case.json"
    path.write_text(json.dumps(case), encoding="utf-8")
    assert main(["diagnose", str(path), "--json"]) == 0
    report = json.loads(capsys.readouterr().out)
    assert report["suspects"][0]["fault"] == "no_fault"
    assert all(r["in_band"] for r in report["readings"])
    # The same readings on the family's typical values flag the good parts (the report).
    del case["board"]
    path.write_text(json.dumps(case), encoding="utf-8")
    assert main(["diagnose", str(path), "--json"]) == 0
    flagged = {r["check"] for r in json.loads(capsys.readouterr().out)["readings"] if not r["in_band"]}
    assert {"start_resistor", "output_cap_capacitance"} <= flagged


@pytest.mark.parametrize("text, says", [
    ("[parts.R11]\nvalue = '1k'", "no part 'R11'"),
    ("[parts.R1]\nvalue = '10 uF'", "part R1 (Start-up resistor)"),
    ("family = 'pwm_flyback'\n[parts.R1]\nvalue = '1M'", "for family 'pwm_flyback'"),
    ("[parts.R1\n", "not a TOML file"),
])
def test_a_board_file_that_does_not_fit_is_one_line_with_exit_2(capsys, board, text, says):
    assert main(["expect", "--family", "primary_side", "--cold", "--board", board(text)]) == 2
    err = capsys.readouterr().err
    assert says in err and err.count("\n") == 1


def test_a_missing_board_file_is_one_line(capsys, tmp_path):
    assert main(["expect", "--family", "primary_side", "--board", str(tmp_path / "none.toml")]) == 2
    assert "cannot read" in capsys.readouterr().err
