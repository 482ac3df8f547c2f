import json

import pytest

from fixbench.cli import main
from fixbench.knowledge import load_knowledge


def _case(tmp_path, case: dict):
    path = tmp_path / "case.json"
    path.write_text(json.dumps(case), encoding="utf-8")
    return str(path)


def test_simulated_case_pipes_into_diagnose_and_names_the_fault(tmp_path, capsys):
    assert main(["simulate", "--family", "pwm_flyback", "--fault", "C2.dried", "--mains", "230",
                 "--output", "5V", "--current", "2A", "--seed", "3", "--json"]) == 0
    case = json.loads(capsys.readouterr().out)
    family = load_knowledge().family("pwm_flyback")
    assert case["family"] == "pwm_flyback" and len(case["readings"]) == len(family.checks)
    assert main(["diagnose", _case(tmp_path, case), "--json"]) == 0
    result = json.loads(capsys.readouterr().out)
    assert result["suspects"][0]["fault"] == "C2.dried"
    assert {"fault", "part", "stage", "probability"} <= set(result["suspects"][0])
    assert result["next_check"] is None
    assert "C2" in [a["part"] for a in result["conclusion"]["replace"]]


def test_a_fresh_case_proposes_a_check_with_expected_value_and_cautions(tmp_path, capsys):
    path = _case(tmp_path, {"family": "pwm_flyback", "ratings": {"mains": "230 V", "output": "5 V", "current": "1 A"},
                            "readings": [{"check": "symptom_dead", "value": "yes"},
                                         {"check": "fuse_resistance", "value": "0.1 ohm"}]})
    assert main(["diagnose", path, "--json"]) == 0
    result = json.loads(capsys.readouterr().out)
    step = result["next_check"]
    assert {"check", "title", "power", "expected", "minutes", "cautions"} <= set(step)
    assert result["conclusion"] is None
    probabilities = [s["probability"] for s in result["suspects"]]
    assert probabilities == sorted(probabilities, reverse=True)


@pytest.mark.parametrize("content, message", [
    ("{not json", "not valid JSON"),
    ('{"ratings": {}}', "'family' is missing"),
    ('{"family": "pwm_flyback", "ratings": {"mains": "230 V", "output": "5 V", "current": "1 A"}, '
     '"readings": [{"check": "no_such_check", "value": "1"}]}', "unknown check 'no_such_check'"),
    ('{"family": "pwm_flyback", "ratings": {"mains": "230 V", "output": "5 V", "current": "1 A"}, '
     '"readings": [{"check": "fuse_resistance", "value": "325 V"}]}', "readings[0] (fuse_resistance)"),
    ('{"family": "pwm_flyback", "ratings": {"mains": "230 V", "output": "5 V"}}', "rating 'current' is missing"),
    # Each of these was a traceback.
    ('{"family": [], "ratings": {}}', "the family must be an id as text"),
    ('{"family": {"id": 1}, "ratings": {}}', "the family must be an id as text"),
    ('{"family": "pwm_flyback", "ratings": {"mains": "230 V", "output": "2 V", "current": "1 A"}}',
     "reference of the TL431"),
    ('{"family": "pwm_flyback", "ratings": {"mains": "230 V", "frequency": " ", "output": "5 V", '
     '"current": "1 A"}, "readings": [{"check": ["bulk_voltage"], "value": "1"}]}', "'check' is an id"),
    ('{"family": "pwm_flyback", "ratings": {"mains": "230 V", "output": "5 V", "current": "1 A"}, '
     '"readings": [{"check": "bulk_voltag", "value": "325 V"}]}', "did you mean: bulk_voltage"),
    ("[" * 100_000 + "]" * 100_000, "nested too deeply"),
    ('{"family": ' + "[" * 100_000 + "]" * 100_000 + ', "ratings": {}}', "nested too deeply"),
])
def test_bad_case_files_exit_2_with_a_line_naming_the_problem(tmp_path, capsys, content, message):
    path = tmp_path / "bad.json"
    path.write_text(content, encoding="utf-8")
    assert main(["diagnose", str(path)]) == 2
    err = capsys.readouterr().err
    assert message in err and len(err.strip().splitlines()) == 1


def test_missing_file_is_a_usage_error(tmp_path, capsys):
    assert main(["diagnose", str(tmp_path / "absent.json")]) == 2
    assert "cannot read" in capsys.readouterr().err


CASE = {"family": "pwm_flyback", "ratings": {"mains": "230 V", "output": "5 V", "current": "1 A"},
        "readings": [{"check": "fuse_resistance", "value": "0.1 ohm"}]}


@pytest.mark.parametrize("encoding", ["utf-8-sig", "utf-16", "utf-16-le-bom", "utf-16-be-bom"])
def test_a_case_file_with_a_byte_order_mark_is_simply_read(tmp_path, capsys, encoding):
    # UTF-8 with a BOM was refused as "not valid JSON" and UTF-16 (what Windows PowerShell 5 writes
    # for `simulate --json > case.json`) was a UnicodeDecodeError traceback.
    text = json.dumps(CASE)
    raw = {"utf-16-le-bom": b"\xff\xfe" + text.encode("utf-16-le"),
           "utf-16-be-bom": b"\xfe\xff" + text.encode("utf-16-be")}.get(encoding) or text.encode(encoding)
    path = tmp_path / "case.json"
    path.write_bytes(raw)
    assert main(["diagnose", str(path), "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["suspects"]


def test_a_file_in_another_encoding_is_one_line_naming_the_byte(tmp_path, capsys):
    path = tmp_path / "latin1.json"
    path.write_bytes(json.dumps(CASE).replace("230 V", "230 V\u00b1").encode("latin-1"))
    assert main(["diagnose", str(path)]) == 2
    err = capsys.readouterr().err
    assert "not text in UTF-8 (byte 0xb1" in err and len(err.strip().splitlines()) == 1


def test_a_case_file_past_the_reading_cap_is_refused_before_the_engine_runs(tmp_path, capsys):
    from fixbench.commands.diagnose import MAX_READINGS

    case = dict(CASE, readings=CASE["readings"] * (MAX_READINGS + 1))
    path = tmp_path / "huge.json"
    path.write_text(json.dumps(case), encoding="utf-8")
    assert main(["diagnose", str(path)]) == 2
    assert f"a case file holds at most {MAX_READINGS}" in capsys.readouterr().err


def test_a_case_file_at_the_reading_cap_is_taken(tmp_path, capsys):
    from fixbench.commands.diagnose import MAX_READINGS

    case = dict(CASE, readings=CASE["readings"] * MAX_READINGS)
    path = tmp_path / "long.json"
    path.write_text(json.dumps(case), encoding="utf-8")
    assert main(["diagnose", str(path), "--json"]) == 0
    assert len(json.loads(capsys.readouterr().out)["readings"]) == MAX_READINGS
