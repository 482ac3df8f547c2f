"""Telling the family from the board: the intake's questions single out every family in at most
three answers, and when no family fits, the closest ones are named with the reason."""

from __future__ import annotations

import re

import pytest

from fixbench.knowledge import KnowledgeError, load_knowledge
from fixbench.knowledge.identify import MAX_TELLING_ANSWERS, identify, telling_answers


@pytest.fixture(scope="module")
def knowledge():
    return load_knowledge()


def _identify(knowledge, **answers):
    return identify(list(knowledge.families.values()), knowledge.questions, answers)


def test_eight_pin_chip_without_optocoupler_or_tl431_asks_for_the_switch(knowledge):
    """Issue 13: on main, "8-pin chip, no optocoupler, no TL431" got "No single family fits". An
    8-pin chip is a controller chip; primary-side controllers come in 6- and 8-pin packages, with the
    MOSFET beside them or inside [practice]: both families fit, and the question that splits them is
    whether a separate power transistor sits beside the transformer."""
    found = _identify(knowledge, controller_chip="yes", optocoupler="no", tl431="no")
    assert {f.id for f in found.fitting} == {"primary_side", "integrated_primary_side"}
    assert found.deciding is not None and found.deciding.id == "separate_switch"
    assert "Answer this to tell them apart: A separate power transistor" in found.describe()


def test_a_chip_that_drives_the_transformer_itself_is_the_integrated_family(knowledge):
    found = _identify(knowledge, controller_chip="yes", separate_switch="no", optocoupler="no", tl431="no")
    assert found.family is not None and found.family.id == "integrated_primary_side"
    found = _identify(knowledge, controller_chip="yes", separate_switch="no", optocoupler="yes", tl431="yes")
    assert found.family is not None and found.family.id == "integrated_opto"


@pytest.mark.parametrize("family_id", sorted(load_knowledge().families))
def test_every_family_is_singled_out_by_at_most_three_answers(knowledge, family_id):
    families = list(knowledge.families.values())
    family = knowledge.family(family_id)
    answers = telling_answers(family, families, knowledge.questions)
    assert answers is not None and len(answers) <= MAX_TELLING_ANSWERS == 3
    found = identify(families, knowledge.questions, answers)
    assert found.family is family


def test_no_family_fits_names_the_closest_and_why(knowledge):
    # An integrated switch with an optocoupler but a Zener, not a TL431, on the output side.
    found = _identify(knowledge, controller_chip="yes", separate_switch="no", optocoupler="yes", tl431="no")
    assert found.family is None and not found.fitting
    assert [family.id for family, _ in found.closest] == ["integrated_opto", "integrated_primary_side"]
    text = found.describe()
    assert text.startswith("No single family fits those answers. Closest: Integrated controller and MOSFET")
    assert "with optocoupler and TL431: its boards have a TL431 near the output; you saw no TL431" in text
    assert ("no optocoupler: its boards have no optocoupler; you saw an optocoupler across the isolation "
            "slot") in text


def test_several_fitting_families_are_named_with_the_question_that_splits_them(knowledge):
    found = _identify(knowledge, controller_chip="yes")
    assert {f.id for f in found.fitting} == {"pwm_flyback", "primary_side", "integrated_opto",
                                             "integrated_primary_side", "pwm_pfc"}
    assert found.deciding is not None and found.deciding.id == "separate_switch"
    assert "5 families fit" in found.describe()


def test_a_boost_stage_before_the_bulk_capacitor_is_the_pfc_family(knowledge):
    found = _identify(knowledge, pfc_stage="yes")
    assert found.family is not None and found.family.id == "pwm_pfc"
    # an optocoupler board with a boost stage but no TL431: the PFC family is closest, and why
    found = _identify(knowledge, controller_chip="yes", separate_switch="yes", optocoupler="yes", tl431="no",
                      pfc_stage="yes")
    assert [family.id for family, _ in found.closest] == ["pwm_pfc"]
    assert "you saw no TL431" in found.describe()


def test_no_answer_says_nothing(knowledge):
    assert _identify(knowledge).describe() == ""


def test_every_family_answers_every_question(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("families/self_oscillating.toml", 'pfc_stage = "no"\n', "")
    with pytest.raises(KnowledgeError, match=re.escape(
            "self_oscillating.toml: identify.pfc_stage: missing: every family answers every intake question")):
        copy.load()


def test_an_answer_the_question_does_not_offer(knowledge_copy):
    copy = knowledge_copy("self_oscillating")
    copy.replace("families/self_oscillating.toml", 'tl431 = "no"', 'tl431 = "maybe"')
    with pytest.raises(KnowledgeError, match=re.escape(
            "self_oscillating.toml: identify.tl431: 'maybe' is not an answer to it (use yes, no)")):
        copy.load()


def test_a_family_whose_boards_vary_gives_several_answers(knowledge_copy):
    copy = knowledge_copy("self_oscillating", "pwm_flyback")
    copy.replace("families/self_oscillating.toml", 'tl431 = "no"', 'tl431 = ["no", "yes"]')
    loaded = copy.load()
    assert loaded.family("self_oscillating").identify["tl431"] == ("no", "yes")


def test_a_catalogue_with_two_families_the_questions_cannot_tell_apart(knowledge_copy):
    copy = knowledge_copy("self_oscillating", "primary_side")
    copy.replace("families/primary_side.toml", 'controller_chip = "yes"', 'controller_chip = "no"')
    copy.replace("families/primary_side.toml", 'optocoupler = "no"', 'optocoupler = "yes"')
    with pytest.raises(KnowledgeError, match=re.escape("identify: no 3 answers to the intake's questions single out")):
        copy.load()
