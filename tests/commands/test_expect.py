import json

import pytest

from fixbench.cli import main


def _rows(capsys, *args):
    assert main(["expect", *args, "--json"]) == 0
    return {r["check"] or r["title"]: r for r in json.loads(capsys.readouterr().out)}


def test_usb_charger_at_120_volts_has_the_rectified_peak_and_usb_window(capsys):
    rows = _rows(capsys, "--family", "pwm_flyback", "--mains", "120", "--output", "5V", "--current", "2A")
    for row in rows.values():
        assert {"point", "title", "unit", "nominal", "low", "high"} <= set(row)
        if row["low"] is not None and row["high"] is not None:
            assert row["low"] <= row["high"]
    # 120 V: sqrt(2) * 120 = 169.7 V less two diode drops [src: IEC 60038 nominal 120 V; textbook bridge]
    assert rows["bulk_voltage"]["nominal"] == pytest.approx(169.7 - 1.8, abs=0.5)
    # USB 2.0 VBUS 4.75-5.25 V [src: USB 2.0 specification, table 7-7]
    assert (rows["output_board"]["low"], rows["output_board"]["high"]) == (4.75, 5.25)


def test_laptop_adapter_on_universal_input_reads_its_bench_mains(capsys):
    rows = _rows(capsys, "--family", "pwm_flyback", "--mains", "universal", "--output", "19V", "--current", "3.4A")
    # Bench mains 230 V by default: about 325 V peak [src: IEC 60038 Table 1]
    assert 320 < rows["bulk_voltage"]["nominal"] < 326
    assert rows["output_board"]["nominal"] == 19.0
    # UC3842-class start/stop 16 V / 10 V [src: onsemi/ST UC3842 datasheet]
    assert rows["Controller start threshold (Vcc rising)"]["nominal"] == 16.0
    assert rows["Controller stop threshold (Vcc falling)"]["nominal"] == 10.0


def test_self_oscillating_charger_at_230_volts_has_no_controller_thresholds(capsys):
    rows = _rows(capsys, "--family", "self_oscillating", "--mains", "230", "--output", "5V", "--current", "1A")
    assert "vcc_voltage" not in rows
    assert rows["output_plug"]["nominal"] == 5.0


def test_text_table_shows_units_and_bands(capsys):
    assert main(["expect", "--family", "pwm_flyback", "--mains", "230", "--output", "5V", "--current", "1A"]) == 0
    out = capsys.readouterr().out
    assert "Bulk capacitor voltage, no load" in out and " V to " in out and "kohm" in out


@pytest.mark.parametrize("args, message", [
    (["--family", "nonesuch"], "unknown supply family"),
    (["--family", "pwm_flybak"], "did you mean: pwm_flyback?"),
    (["--family", "pwm_flyback", "--mains", "5 A"], "rating 'mains'"),
    (["--family", "pwm_flyback", "--output", "3,3"], "use a point"),
    # Each of these was a traceback or an impossible table with exit 0.
    (["--family", "pwm_flyback", "--output", "2V"], "2.495 V reference of the TL431"),
    (["--family", "self_oscillating", "--output", "1V"], "zener voltage rule gives -0.1 V"),
    (["--family", "pwm_flyback", "--frequency", " "], "--frequency is empty"),
    (["--family", "pwm_flyback", "--mains", "universal", "--bench-mains", "4k7"], "rating 'bench_mains'"),
    (["--family", "pwm_flyback", "--switching", "1Hz"], "rating 'switching'"),
    (["--family", "pwm_flyback", "--switching", "100GHz"], "rating 'switching'"),
    (["--family", "pwm_flyback", "--bulk", "1pF"], "rating 'bulk'"),
    (["--family", "pwm_flyback", "--bulk", "10F"], "rating 'bulk'"),
    (["--family", "pwm_flyback", "--output", "1e400V"], "too large a number"),
])
def test_bad_arguments_exit_2_with_one_line(capsys, args, message):
    assert main(["expect", *args]) == 2
    err = capsys.readouterr().err
    assert message in err and len(err.strip().splitlines()) == 1


def _cold_rows(capsys, *args):
    assert main(["expect", *args, "--cold", "--json"]) == 0
    return {r["check"]: r for r in json.loads(capsys.readouterr().out)}


def test_good_upper_fb_resistor_is_in_range_at_its_in_circuit_value(capsys):
    # Issue 10 measured on main: `fixbench expect --family primary_side --mains 120 --output 5V
    # --current 2A` expected the upper FB resistor at 37.6-49.4 kohm, its value out of circuit, so a
    # good part, which reads about R_upper || R_lower on the board, was flagged.
    rows = _cold_rows(capsys, "--family", "primary_side", "--mains", "120", "--output", "5V", "--current", "2A")
    upper = rows["fb_divider_upper"]
    assert upper["part_value"] == pytest.approx(47e3)
    lower = rows["fb_divider_lower"]["part_value"]
    in_circuit = 1.0 / (1.0 / 47e3 + 1.0 / (lower + 1.0))  # the lower resistor through the winding [closed form: parallel]
    assert upper["low"] <= in_circuit <= upper["high"]
    assert upper["high"] < 0.80 * 47e3  # the old out-of-circuit band would not hold it
    lifted = rows["fb_divider_upper_lifted"]
    assert lifted["lift"] == "R5.b" and lifted["low"] <= 47e3 <= lifted["high"]


@pytest.mark.parametrize("family", ["primary_side", "pwm_flyback", "self_oscillating"])
def test_cold_rows_list_every_cold_part_check_with_its_part_value(capsys, family):
    rows = _cold_rows(capsys, "--family", family, "--mains", "230", "--output", "5V", "--current", "2A")
    assert rows
    for row in rows.values():
        assert {"check", "nominal", "low", "high", "part_value"} <= set(row)
        assert row["power"] == "cold"
        if row["nominal"] is not None and row["low"] is not None and row["high"] is not None:
            assert row["low"] <= row["nominal"] <= row["high"]
    resistors = [r for r in rows.values() if r["instrument"] == "ohmmeter" and r["part_value"] is not None]
    assert resistors and all(r["part_value"] > 0 for r in resistors)
    diodes = [r for r in rows.values() if r["instrument"] == "diode_test"]
    assert diodes and all(r["part_value"] is None for r in diodes if r["part"].startswith("D"))


def test_bridge_check_tells_an_open_diode(capsys):
    # Issue 10: "enter the lowest forward reading" hid an open bridge diode.
    assert main(["simulate", "--family", "pwm_flyback", "--fault", "BD1.open", "--exact", "--json"]) == 0
    readings = {r["check"]: r["value"] for r in json.loads(capsys.readouterr().out)["readings"]}
    assert readings["bridge_diode_test"] == "OL"


def test_an_exponent_with_a_prefix_reads_as_written(capsys):
    # "5e3mV" was a ValueError from float("5e3e-3").
    assert main(["expect", "--family", "pwm_flyback", "--output", "5e3mV", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)
    assert next(r for r in rows if r["check"] == "output_plug")["nominal"] == pytest.approx(5.0)
