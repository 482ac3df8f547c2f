"""Stage files: a broken one fails loading with a message that names the stage file and the key,
whichever family uses it; a mistyped part role is refused rather than silently ignored."""

from __future__ import annotations

import re

import pytest

from fixbench.knowledge import KnowledgeError


def _fails(copy, *message_parts: str) -> str:
    with pytest.raises(KnowledgeError) as err:
        copy.load()
    for part in message_parts:
        assert part in str(err.value), str(err.value)
    return str(err.value)


def test_unbroken_copy_loads(knowledge_copy):
    assert list(knowledge_copy("self_oscillating").load().families) == ["self_oscillating"]


def test_part_value_without_a_unit(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/drive/feedback_winding.toml", 'value = "100 ohm"', 'value = "22"')
    message = _fails(copy, "stages/drive/feedback_winding.toml: parts[0].value: ")
    assert "'22'" in message and "unit" in message


def test_part_value_in_the_wrong_unit(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/drive/feedback_winding.toml", 'value = "100 ohm"', 'value = "100 uF"')
    _fails(copy, "stages/drive/feedback_winding.toml: parts[0].value: ", "farads")


def test_unknown_key_in_a_part(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/startup/base_bias.toml", 'role = "base_resistor"\n', 'role = "base_resistor"\ncolour = "red"\n')
    _fails(copy, "stages/startup/base_bias.toml: parts[0].colour: unknown key")


def test_mistyped_part_role_fails_naming_file_and_key(knowledge_copy):
    """Issue 18: a part role the operating model does not read used to load and be ignored, so an
    open emitter resistor would have changed nothing in the model."""
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/switch/npn.toml", 'role = "sense_resistor"\ntitle', 'role = "sense_resitor"\ntitle')
    _fails(copy, "stages/switch/npn.toml: parts[1].role: 'sense_resitor' is not one of: ")


def test_part_role_in_a_stage_of_another_role(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/bulk/electrolytic.toml", 'role = "bulk_capacitor"', 'role = "output_capacitor"')
    _fails(copy, "stages/bulk/electrolytic.toml: parts[0].role: a 'output_capacitor' part belongs in a "
                 "stage with role output_filter, not 'bulk'")


def test_unknown_stage_role(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/clamp/rcd.toml", 'role = "clamp"\n', 'role = "snubber"\n')
    _fails(copy, "stages/clamp/rcd.toml: role: 'snubber' is not one of: ")


def test_check_of_a_part_in_another_stage(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/clamp/rcd.toml", 'target = "part:R4"', 'target = "part:Q1"')
    _fails(copy, "stages/clamp/rcd.toml: checks[1].target: check 'clamp_resistor' names part 'Q1', "
                 "which is not a part of this stage")


def test_check_on_a_signal_the_model_does_not_produce(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/switch/npn.toml", 'target = "signal:base_voltage"', 'target = "signal:base_volts"')
    _fails(copy, "stages/switch/npn.toml: checks[3].target: 'signal:base_volts' names a signal")


def test_failing_part_without_a_cold_check(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/feedback/zener_opto.toml", 'target = "part:ZD1"', 'target = "part:U2"')
    _fails(copy, "stages/feedback/zener_opto.toml: faults[1].part: part 'ZD1' can fail but no cold check "
                 "in this stage tells its state")


def test_fault_mode_its_kind_does_not_have(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/clamp/rcd.toml", 'part = "R4"\nmode = "open"', 'part = "R4"\nmode = "dried"')
    _fails(copy, "stages/clamp/rcd.toml: faults[1].mode: 'dried' is not a failure mode of a resistor")


def test_collateral_probability_out_of_range(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/rectifier/four_diodes.toml", 'p = 0.95', 'p = 1.5')
    _fails(copy, "stages/rectifier/four_diodes.toml: faults[0].collateral[0].p: probability 1.5 must be in (0, 1]")


def test_a_broken_stage_file_no_family_uses_still_fails(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("stages/feedback/tl431_opto.toml", 'kind = "tl431"', 'kind = "tl432"')
    _fails(copy, "stages/feedback/tl431_opto.toml: parts[1].kind: 'tl432' is not one of")


def test_not_valid_toml(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.append("stages/clamp/rcd.toml", "\n[[parts]\n")
    with pytest.raises(KnowledgeError, match=re.escape("stages/clamp/rcd.toml: not valid TOML")):
        copy.load()
