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
    (["--family", "pwm_flyback", "--mains", "5 A"], "rating 'mains'"),
    (["--family", "pwm_flyback", "--output", "3,3"], "use a point"),
])
def test_bad_arguments_exit_2_with_one_line(capsys, args, message):
    assert main(["expect", *args]) == 2
    err = capsys.readouterr().err
    assert message in err and len(err.strip().splitlines()) == 1
