"""Each level says, in plain words, what it changes: the damage hidden, the readings, the complaint."""

from __future__ import annotations

import pytest

from fixbench.practice.levels import LEVELS, level


def test_every_level_says_what_it_does_to_damage_readings_and_complaint():
    for each in LEVELS.values():
        assert [line.split(":")[0] for line in each.changes] == ["Damage", "Readings", "The customer's complaint"]
    assert "only the damage that nearly always goes" in LEVELS["easy"].changes[0]
    assert "hidden" in LEVELS["normal"].changes[0]
    assert "one in twenty" in LEVELS["hard"].changes[1] and "one in four" in LEVELS["hard"].changes[2]


def test_the_words_match_the_figures():
    assert LEVELS["easy"].exact and not LEVELS["easy"].collateral
    assert LEVELS["normal"].collateral and LEVELS["normal"].report_wrong_rate == 0.0
    assert LEVELS["hard"].wrong_rate == 1 / 20 and LEVELS["hard"].report_wrong_rate == 1 / 4


def test_an_unknown_level_is_named_in_the_error():
    with pytest.raises(KeyError, match="expert"):
        level("expert")
