"""The owner's case filter's free text, on both backends."""

from __future__ import annotations

import pytest

from fixbench.store.case_filters import CaseFilter, filtered_count, filtered_page
from tests.store.conftest import START, record_case


@pytest.mark.parametrize("text", ["Q\x00", "\x00", "QX-5 \x00"])
def test_search_text_with_a_nul_finds_nothing_instead_of_failing(bench, text):
    # On PostgreSQL a NUL in the search pattern was a DataError from the driver (text cannot hold
    # U+0000); no kept text holds one, so the word simply matches no case.
    store, tech, device = bench
    record_case(store, tech, device, ticket="Q-1", opened=START)
    case_filter = CaseFilter(text=text)
    assert filtered_count(store, case_filter) == 0
    assert filtered_page(store, case_filter) == []
    assert filtered_count(store, CaseFilter(text="QX-5")) == 1
