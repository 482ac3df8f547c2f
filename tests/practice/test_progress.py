"""Progress from kept attempts, and what an attempt is kept as."""

from __future__ import annotations

from fixbench.practice.play import play_round
from fixbench.practice.progress import AttemptRecord, attempt_fields, progress_of
from fixbench.practice.scenario import Scenario
from fixbench.practice.scoring import NEARLY, PRACTISE, READY

RATINGS = (("current", "2 A"), ("mains", "230 V"), ("output", "12 V"))


def test_progress_compares_recent_rounds_with_earlier_ones():
    scores = [40, 50, 55, 90, 92, 95, 96, 99]
    attempts = [AttemptRecord(f"drawn:normal:pwm_flyback:Q1.short:s{i}", 5, 10.0, s, 0) for i, s in enumerate(scores)]
    progress = progress_of(attempts)
    assert progress.rounds == 8
    assert progress.recent_mean > progress.earlier_mean
    assert progress.ready_rounds == 5


def test_a_slip_or_the_coach_keeps_a_stored_round_out_of_the_top_band():
    assert AttemptRecord("drawn:normal:f:x:s1", 3, 5.0, 90.0, 1).band == NEARLY
    assert AttemptRecord("drawn:normal:f:x:s1", 3, 5.0, 90.0, 0).band == READY
    assert AttemptRecord("drawn:normal:f:x:s1", 3, 5.0, 90.0, 0, coach_used=True).band == NEARLY
    assert AttemptRecord("drawn:normal:f:x:s1", 3, 5.0, 90.0, 1, fuse_blown=True).band == PRACTISE


def test_an_attempt_is_kept_with_what_it_taught_and_its_record(flyback):
    scenario = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"), ("F1", "open")), "normal", 3, False)
    played = play_round(flyback, scenario, [("take", "look_fuse"), ("coach", ""), ("take", "bulk_discharged"),
                                            ("take", "mosfet_drain_source"), ("take", "mosfet_drain_source"),
                                            ("take", "mosfet_drain_source")],
                        "Q1.short", {"Q1", "F1"})
    fields = attempt_fields(played.practice, played.debrief)
    assert fields["scenario"] == "drawn:normal:pwm_flyback:Q1.short:s3"  # the id alone
    assert fields["coach_used"] and not fields["fuse_blown"]
    assert fields["checks_used"] == 5 and fields["safety_slips"] == 0
    assert fields["fault_right"] is True and fields["slip_kinds"] == "" and fields["checks_wasted"] == 1
    assert fields["record"]["actions"][1] == ["coach", ""]
    kept = AttemptRecord(**{k: v for k, v in fields.items() if k not in ("record", "slip_kinds")})
    assert kept.coach_used and kept.level == "normal" and kept.fault == "Q1.short"


def test_blowing_the_fuse_is_kept_so_progress_shows_the_bottom_band(flyback):
    scenario = Scenario("pwm_flyback", RATINGS, "Q1.short", (("Q1", "short"),), "normal", 3, False)
    played = play_round(flyback, scenario, ["bulk_voltage"], "Q1.short", {"Q1", "F1"})
    fields = attempt_fields(played.practice, played.debrief)
    assert fields["fuse_blown"] and fields["slip_kinds"] == "mains_on_short"
    kept = AttemptRecord(fields["scenario"], fields["checks_used"], fields["minutes"], fields["score"],
                         fields["safety_slips"], fields["coach_used"], fields["fuse_blown"])
    assert kept.band == PRACTISE
