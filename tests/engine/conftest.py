"""Fixtures for the engine tests: the PWM flyback family on a 230 V, 5 V / 2 A charger.

pwm_flyback is the largest family and the one the engine's figures are held to; the other families
are looped over only where a test is about every family alike.
"""

from __future__ import annotations

import pytest

from fixbench.engine import start_diagnosis
from fixbench.knowledge import load_knowledge
from fixbench.physics.ratings import parse_ratings

CHARGER = {"mains": "230 V", "output": "5 V", "current": "2 A"}


@pytest.fixture(scope="session")
def knowledge():
    return load_knowledge()


@pytest.fixture(scope="session")
def family(knowledge):
    return knowledge.family("pwm_flyback")


@pytest.fixture(scope="session")
def ratings():
    return parse_ratings(CHARGER)


@pytest.fixture(scope="session")
def start(family, ratings):
    """The state before any reading."""
    return start_diagnosis(family, ratings)


@pytest.fixture(scope="session")
def model(start):
    return start.model
