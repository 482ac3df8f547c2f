"""Fixtures for the practice tests: the knowledge base and a seeded scenario helper."""

from __future__ import annotations

import pytest

from fixbench.knowledge import load_knowledge


@pytest.fixture(scope="session")
def knowledge():
    return load_knowledge()


@pytest.fixture(scope="session")
def flyback(knowledge):
    return knowledge.family("pwm_flyback")
