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
