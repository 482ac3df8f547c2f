"""The review benchmark runs end to end on a small shop and reports what the bench command merges
(its speed is judged by `fixbench benchmark ui`, not here)."""

from __future__ import annotations

import pytest

from fixbench.ui.review.benchmark import measure_review


@pytest.mark.slow
def test_measure_review_reports_the_three_times(qapp):
    result = measure_review(600)
    assert result["review_cases"] == 600
    assert result["review_target_ms"] == 1000.0
    assert "cases" not in result and "target_ms" not in result
    for key in ("history_open_ms", "filter_ms", "figures_ms"):
        assert result[key] > 0
    assert 0 < result["filter_matched"] < 600
