"""The demo trainees' rounds are played and scored by the practice package itself: the figures
kept are practice's own debrief of each round, so they never contradict the scoring rules (the
issue: a random "100 with a slip" in the demo's history)."""

from __future__ import annotations

import pytest

from fixbench.demo.plan import plan_practice
from fixbench.demo.practice_play import habits, play_round, practice_attempts
from fixbench.practice.progress import AttemptRecord, attempt_fields
from fixbench.practice.scoring import READY

EVERY = 12  # rounds sampled across the two years


@pytest.fixture(scope="module")
def knowledge():
    from fixbench.knowledge import load_knowledge

    return load_knowledge()


@pytest.fixture(scope="module")
def sampled(knowledge):
    planned = plan_practice(1)[::EVERY]
    return planned, practice_attempts(knowledge, planned)


def test_each_round_is_practices_own_debrief_of_the_round_played(knowledge, sampled):
    planned, attempts = sampled
    for plan, kept in zip(planned[:6], attempts):
        practice, debrief = play_round(knowledge, plan)  # the same plan plays the same round
        assert kept == {**attempt_fields(practice, debrief), "attempted_at": plan.attempted_at}
        assert kept["score"] == debrief.score.total  # practice's own score of the round
        assert kept["safety_slips"] == len(debrief.slips) == len(practice.slips)


def test_no_round_with_a_slip_is_kept_as_bench_ready(sampled):
    _planned, attempts = sampled
    kept = ("scenario", "checks_used", "minutes", "score", "safety_slips", "coach_used",
            "fuse_blown")
    records = [AttemptRecord(**{k: a[k] for k in kept}) for a in attempts]
    assert any(r.safety_slips for r in records)
    for record in records:
        if record.safety_slips or record.fuse_blown:
            assert record.band != READY
        if record.fuse_blown:
            assert record.safety_slips > 0


def test_trainees_improve_over_the_two_years(sampled):
    planned, attempts = sampled
    half = len(attempts) // 2
    early, late = attempts[:half], attempts[half:]

    def mean(rows, key):
        return sum(float(r[key]) for r in rows) / len(rows)

    assert mean(late, "score") > mean(early, "score")
    assert mean(late, "safety_slips") < mean(early, "safety_slips")
    assert habits(1.0).follows_plan > habits(0.0).follows_plan


def test_the_shipped_demo_shop_holds_the_rounds_as_practice_plays_them(knowledge):
    """The built demo shop's practice history is what practice gives for its planned rounds
    today (so a change to the scoring shows as a demo to rebuild, never as stale numbers)."""
    import sqlite3
    from pathlib import Path

    shipped = Path(__file__).resolve().parents[2] / "demo_db" / "fixbench-demo.sqlite"
    if not shipped.exists():
        pytest.skip("no built demo shop in this copy")
    connection = sqlite3.connect(f"file:{shipped}?mode=ro", uri=True)
    try:
        kept = {(str(at)[:19], scenario): (score, slips, bool(blown))
                for at, scenario, score, slips, blown in connection.execute(
                    "SELECT attempted_at, scenario, score, safety_slips, fuse_blown "
                    "FROM practice_attempts")}
    finally:
        connection.close()
    planned = plan_practice(1)[::25]
    compared = 0
    for played in practice_attempts(knowledge, planned):
        key = (played["attempted_at"].isoformat(sep=" "), played["scenario"])
        if key[0] < min(at for at, _ in kept):
            continue  # before the shop's first case: not kept
        assert kept[key] == (played["score"], played["safety_slips"], played["fuse_blown"]), key
        compared += 1
    assert compared >= 6
