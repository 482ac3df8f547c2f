import json

from fixbench.cli import main
from fixbench.quantities import parse_quantity


def test_same_seed_gives_the_same_readings(capsys):
    args = ["simulate", "--family", "primary_side", "--fault", "R1.open", "--mains", "universal",
            "--output", "5V", "--current", "2A", "--seed", "7", "--json"]
    assert main(args) == 0
    first = capsys.readouterr().out
    assert main(args) == 0
    assert capsys.readouterr().out == first


def test_open_start_resistor_unit_reads_zero_vcc_and_a_full_bulk_rail(capsys):
    assert main(["simulate", "--family", "pwm_flyback", "--fault", "R1.open", "--exact", "--json"]) == 0
    readings = {r["check"]: r["value"] for r in json.loads(capsys.readouterr().out)["readings"]}
    assert readings["vcc_voltage"] == "0 V"
    # In circuit an open start-up resistor reads only the junction leakage behind it: tens of megohm,
    # far above the resistor's band [cold network; practice: "reads OL or near it"].
    assert parse_quantity(readings["start_resistor"], "ohm").value > 5e6
    # 230 V mains: bulk at about 1.41 x 230 V less two diode drops [src: IEC 60038; trade primer section 6]
    assert readings["bulk_voltage"].endswith(" V") and 318 < float(readings["bulk_voltage"].split()[0]) < 326


def test_unknown_fault_is_refused(capsys):
    assert main(["simulate", "--family", "pwm_flyback", "--fault", "Z9.melted"]) == 2
    assert "unknown fault 'Z9.melted'" in capsys.readouterr().err


def test_an_unknown_fault_names_the_near_ones_and_where_to_list_them(capsys):
    assert main(["simulate", "--family", "pwm_flyback", "--fault", "C2"]) == 2
    err = capsys.readouterr().err
    assert "did you mean: C2.dried" in err and "fixbench families --faults pwm_flyback" in err
