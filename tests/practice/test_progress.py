"""Progress from kept attempts, and what an attempt is kept as."""

from __future__ import annotations

from fixbench.practice.debrief import debrief_round
from fixbench.practice.engine_path import engine_path
from fixbench.practice.progress import AttemptRecord, attempt_fields, progress_of
from fixbench.practice.round import PracticeRound
from fixbench.practice.scenario import Scenario
from fixbench.practice.scoring import NEARLY, PRACTISE, READY


def test_progress_compares_recent_rounds_with_earlier_ones():
    scores = [40, 50, 55, 90, 92, 95, 96, 99]
    attempts = [AttemptRecord(f"drawn:normal:pwm_flyback:Q1.short:s{i}", 5, 10.0, s, 0) for i, s in enumerate(scores)]
    progress = progress_of(attempts)
    assert progress.rounds == 8
    assert progress.recent_mean > progress.earlier_mean
    assert progress.ready_rounds == 5


def test_a_slip_keeps_a_stored_round_out_of_the_top_band():
    assert AttemptRecord("drawn:normal:f:x:s1", 3, 5.0, 90.0, 1).band == NEARLY
    assert AttemptRecord("drawn:normal:f:x:s1", 3, 5.0, 90.0, 0).band == READY
    assert AttemptRecord("drawn:normal:f:x:s1", 3, 5.0, 90.0, 1, fuse_blown=True).band == PRACTISE


def test_an_attempt_is_kept_with_its_scenario_and_the_coach_asked(flyback):
    scenario = Scenario("pwm_flyback", (("current", "2 A"), ("mains", "230 V"), ("output", "12 V")),
                        "Q1.short", (("Q1", "short"), ("F1", "open")), "normal", 3, False)
    practice = PracticeRound(flyback, scenario)
    practice.take("look_fuse")
    practice.coach()
    practice.take("mosfet_drain_source")
    practice.commit("Q1.short", {"Q1", "F1"})
    fields = attempt_fields(practice, debrief_round(practice, engine_path(flyback, scenario)))
    assert fields["scenario"] == "drawn:normal:pwm_flyback:Q1.short:s3"  # the id alone
    assert fields["coach_used"] and not fields["fuse_blown"]
    assert fields["checks_used"] == 2 and fields["safety_slips"] == 0
    assert AttemptRecord(**fields).coach_used and AttemptRecord(**fields).level == "normal"


def test_blowing_the_fuse_is_kept_so_progress_shows_the_bottom_band(flyback):
    scenario = Scenario("pwm_flyback", (("current", "2 A"), ("mains", "230 V"), ("output", "12 V")),
                        "Q1.short", (("Q1", "short"),), "normal", 3, False)
    practice = PracticeRound(flyback, scenario)
    practice.take("bulk_voltage")
    practice.commit("Q1.short", {"Q1", "F1"})
    fields = attempt_fields(practice, debrief_round(practice, engine_path(flyback, scenario)))
    assert fields["scenario"] == "drawn:normal:pwm_flyback:Q1.short:s3"
    assert fields["fuse_blown"] and not fields["coach_used"]
    assert AttemptRecord(**fields).band == PRACTISE and not AttemptRecord(**fields).coach_used
