"""The plain-data and text views of a diagnosis state."""

import json

from fixbench.engine import start_diagnosis
from fixbench.engine.report import state_as_dict, state_text
from fixbench.knowledge import load_knowledge
from fixbench.physics.ratings import parse_ratings


def _state():
    family = load_knowledge().family("pwm_flyback")
    return start_diagnosis(family, parse_ratings({"mains": "230 V", "output": "5 V", "current": "1 A"}))


def test_state_as_dict_is_json_ready_and_ranked():
    data = state_as_dict(_state().with_reading("symptom_ticking", "yes"))
    json.dumps(data)
    probabilities = [s["probability"] for s in data["suspects"]]
    assert probabilities == sorted(probabilities, reverse=True)
    assert data["readings"] == [{"check": "symptom_ticking", "value": "yes", "outcome": "yes", "in_band": False}]
    assert data["next_check"]["check"]


def test_text_view_shows_the_next_step_with_its_healthy_value():
    state = _state().with_reading("symptom_dead", "yes").with_reading("look_fuse", "no")
    out = state_text(state)
    assert "Likely faults:" in out and "Next: " in out and "a healthy unit shows:" in out
