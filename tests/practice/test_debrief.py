"""The debrief in plain words: what each step told beside the healthy value, the engine's choice at
that point and why, what settled the fault, the reading against a wrong verdict, telling and
wasted checks, each kind of slip once, and the engine's path with its reasons."""

from __future__ import annotations

import re

import pytest

from fixbench.practice.debrief import debrief_round
from fixbench.practice.engine_path import engine_path
from fixbench.practice.explain import healthy_words, predicted_words
from fixbench.practice.play import play_round
from fixbench.practice.round import PracticeRound, RoundError
from fixbench.practice.safety import MAINS_ON_SHORT, UNDISCHARGED
from fixbench.practice.levels import EASY
from fixbench.practice.scenario import Scenario, draw_scenario

RATINGS = (("current", "2 A"), ("mains", "230 V"), ("output", "12 V"))
SHORTED = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"), ("F1", "open")), "normal", 11, False)
FUSE_INTACT = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"),), "normal", 12, False)


def shown_words(debrief) -> list[str]:
    """Every sentence of a debrief that is shown to the trainee (ids and figures left out)."""
    words = [debrief.true_fault, debrief.named_fault, debrief.complaint_words, debrief.settled or "",
             debrief.engine_fault, *debrief.same_group, *debrief.misleading]
    for r in debrief.reviews:
        words += [r.shown, r.healthy, r.told, r.engine_title or "", r.engine_why, r.settled_by or ""]
    for s in debrief.engine.steps:
        words += [s.title, s.reading, s.healthy, s.reason]
    for lesson in debrief.lessons:
        words += [lesson.what, lesson.why]
    c = debrief.contradiction
    if c is not None:
        words += [c.where, c.check_title, c.reading, c.would_read, c.healthy]
    return [w for w in words if w]


def test_a_careful_round_is_right_and_each_step_says_what_it_told(flyback):
    played = play_round(flyback, SHORTED, ["look_fuse", "bulk_discharged", "fuse_resistance", "mosfet_drain_source"],
                        "Q1.short", {"Q1", "F1"})
    debrief = played.debrief
    assert debrief.right and debrief.engine_right
    assert debrief.true_fault == flyback.fault("Q1.short").title
    drain = debrief.reviews[3]
    assert drain.step.check_id == "mosfet_drain_source"
    # the healthy value beside it, as the engine's physics has it (in circuit, the cold network)
    assert drain.healthy == healthy_words(played.practice.opening, "mosfet_drain_source") and not drain.in_band
    assert "Raised Switching MOSFET shorted" in drain.told and "Ruled out" in drain.told
    assert drain.engine_title and drain.engine_why  # the engine's choice at that point, and why
    assert "mosfet_drain_source" in [r.step.check_id for r in debrief.most_telling]
    assert debrief.score.par == debrief.engine.minutes > 0
    assert debrief.settled is None and 0 < debrief.true_chance < 0.95  # not yet clear when committed


def test_the_first_reading_that_settled_the_fault_is_named(flyback):
    dried = draw_scenario(flyback, EASY, 5)
    assert dried.fault_id == "C3.dried"  # the premise
    planned = [s for s in engine_path(flyback, dried).steps if not s.careful]
    played = play_round(flyback, dried, [s.check_id for s in planned], "C3.dried", {"C3"})
    settled = played.debrief.settled
    assert settled is not None and played.debrief.true_chance >= 0.95
    number = int(settled.split(",")[0].removeprefix("step "))
    assert settled.startswith(f"step {number}, {planned[number - 1].title}: ")


def test_no_word_of_the_debrief_is_in_bits_or_an_internal_fault_id(flyback):
    # Reproduces the issue: results were given in bits, and the engine's reasons said "tells 0.42 bits".
    played = play_round(flyback, FUSE_INTACT, ["series_lamp", "mosfet_drain_source", "bulk_discharged",
                                               "mosfet_drain_source", "fuse_resistance"], "C3.dried", {"Q1"})
    words = shown_words(played.debrief)
    assert words and not [w for w in words if re.search(r"\bbits?\b", w)]
    ids = {f.id for f in flyback.faults}
    assert not [w for w in words if w in ids or any(f"{i} " in w or w.endswith(i) for i in ids)]


def test_a_check_that_told_nothing_names_the_reading_that_had_settled_it(flyback):
    # Reproduces the issue: "told nothing" did not say which earlier reading had settled it.
    played = play_round(flyback, SHORTED, ["bulk_discharged"] + ["mosfet_drain_source"] * 3 + ["look_bulged"],
                        "Q1.short", {"Q1", "F1"})
    nothing = {r.step.number: r.settled_by for r in played.debrief.told_nothing}
    assert nothing[4].startswith("step 3, the same check (")
    assert 5 in nothing and nothing[5].startswith("step ")


def test_a_wrong_verdict_is_linked_to_the_reading_that_contradicts_it(flyback):
    played = play_round(flyback, SHORTED, ["look_fuse", "bulk_discharged", "mosfet_drain_source"], "C3.dried", {"C3"})
    c = played.debrief.contradiction
    assert not played.debrief.right and c is not None
    assert (c.where, c.check_title) == ("Step 3", "MOSFET drain to source")
    opening = played.practice.opening
    assert c.would_read == predicted_words(opening, "mosfet_drain_source", "C3.dried")
    assert c.healthy == healthy_words(opening, "mosfet_drain_source") and c.would_read != c.reading


def test_a_wrong_verdict_with_no_telling_reading_of_ones_own_is_linked_to_the_engines(flyback):
    played = play_round(flyback, SHORTED, [], "C3.dried", {"C3"})
    c = played.debrief.contradiction
    assert c is not None and (c.where.startswith("The engine's step") or c.where == "The customer's complaint")


def test_an_unsafe_live_reading_is_not_among_the_checks_that_told_the_most(flyback):
    # Reproduces the issue: plain mains on a shorted unit topped "Checks that told the most".
    played = play_round(flyback, FUSE_INTACT, ["bulk_voltage", "bulk_discharged", "fuse_resistance"],
                        "Q1.short", {"Q1", "F1"})
    assert played.debrief.reviews[0].narrowing > 0.1  # it did narrow the fault...
    assert [s.kind for s in played.debrief.slips] == [MAINS_ON_SHORT]
    assert "bulk_voltage" not in [r.step.check_id for r in played.debrief.most_telling]  # ...but is not praised
    assert "F1" in played.debrief.score.parts_needed  # the fuse the trainee blew must be replaced too


def test_a_kind_of_slip_is_explained_once_with_every_stop(flyback):
    # Reproduces the issue: the same slip paragraph stood three times.
    played = play_round(flyback, SHORTED, ["series_lamp", "mosfet_drain_source", "sense_resistor",
                                           "gate_resistor", "bulk_discharged"], "Q1.short", {"Q1", "F1"})
    lessons = played.debrief.lessons
    assert [(lesson.kind, lesson.steps, lesson.shouts) for lesson in lessons] == [(UNDISCHARGED, (2,), 3)]
    assert played.debrief.score.slip_points == 10.0


def test_a_procedure_step_is_never_a_waste_and_a_collateral_check_is_careful(flyback):
    played = play_round(flyback, SHORTED, ["bulk_discharged", "mosfet_drain_source", "fuse_resistance",
                                           "series_lamp", "bulk_discharged"], "Q1.short", {"Q1", "F1"})
    reviews = {r.step.check_id: r for r in played.debrief.reviews}
    assert "safety step" in reviews["bulk_discharged"].told and not reviews["bulk_discharged"].told_nothing
    assert reviews["fuse_resistance"].told.startswith("A check before power-up: F1")


def test_the_engines_path_gives_a_reason_for_every_step(flyback):
    path = engine_path(flyback, SHORTED)
    assert path.steps and all(s.reason and s.healthy for s in path.steps)


def test_coach_use_is_in_the_debrief(flyback):
    practice = PracticeRound(flyback, SHORTED)
    practice.take("look_fuse")
    practice.coach()
    practice.commit("Q1.short", {"Q1", "F1"})
    debrief = debrief_round(practice, engine_path(flyback, SHORTED))
    assert debrief.coach_looks == 1 and debrief.coach_first_after == 1
    assert debrief.score.coach_points > 0


def test_no_debrief_before_a_commit(flyback):
    practice = PracticeRound(flyback, SHORTED)
    with pytest.raises(RoundError):
        debrief_round(practice, engine_path(flyback, SHORTED))
