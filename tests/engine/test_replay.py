"""Replaying readings typed earlier: the ones this build reads are taken in order, exactly as
taking them one by one; the others are set aside with the reason, never silently dropped."""

from __future__ import annotations

from fixbench.engine.replay import replay_readings

TYPED = (("symptom_dead", "yes"), ("fuse_resistance", "0R2"), ("bulk_discharged", "3 V"))


def test_readings_that_read_are_taken_as_one_by_one(start):
    replayed = replay_readings(start, TYPED)
    by_hand = start
    for check_id, typed in TYPED:
        by_hand = by_hand.with_reading(check_id, typed)
    assert replayed.refused == ()
    assert replayed.state.readings == by_hand.readings
    assert replayed.state.evidence == by_hand.evidence


def test_an_unknown_check_and_an_unreadable_text_are_set_aside_with_the_reason(start):
    typed = (("symptom_dead", "yes"), ("no_such_check", "1"), ("fuse_resistance", "3,3"),
             ("look_fuse", "no"))
    replayed = replay_readings(start, typed)
    assert [r.check for r in replayed.state.readings] == ["symptom_dead", "look_fuse"]
    unknown, unreadable = replayed.refused
    assert (unknown.index, unknown.unknown_check) == (1, True)
    assert "unknown check 'no_such_check'" in unknown.reason
    assert (unreadable.index, unreadable.check_id, unreadable.typed) == (2, "fuse_resistance", "3,3")
    assert not unreadable.unknown_check and "use a point for decimals" in unreadable.reason
