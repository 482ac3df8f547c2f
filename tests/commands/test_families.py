import json

from fixbench.cli import main


def test_families_json_lists_the_three_families_with_id_and_title(capsys):
    assert main(["families", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)
    assert {r["id"] for r in rows} >= {"self_oscillating", "pwm_flyback", "primary_side"}
    assert all(r["title"] for r in rows)


def test_families_table_has_a_header_and_a_row_per_family(capsys):
    assert main(["families"]) == 0
    lines = capsys.readouterr().out.splitlines()
    assert lines[0].split()[:2] == ["id", "title"]
    assert sum(1 for line in lines if line.startswith("pwm_flyback")) == 1


def test_faults_of_a_family_are_listed_with_their_ids(capsys):
    assert main(["families", "--faults", "pwm_flyback", "--json"]) == 0
    rows = json.loads(capsys.readouterr().out)
    assert {"C2.dried", "Q1.short", "F1.open"} <= {r["id"] for r in rows}
    assert all(r["part"] and r["stage"] for r in rows)


def test_faults_of_an_unknown_family_name_the_near_ones(capsys):
    assert main(["families", "--faults", "flyback"]) == 2
    assert "did you mean: pwm_flyback?" in capsys.readouterr().err
