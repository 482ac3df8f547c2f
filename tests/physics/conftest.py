"""Fixtures shared by the physics tests."""

from __future__ import annotations

import pytest

from tests.support.ngspice import ngspice_binary


@pytest.fixture(scope="session")
def ngspice() -> str:
    """Path of the ngspice binary; skips the test (with the reason) only when it is not installed."""
    binary = ngspice_binary()
    if binary is None:
        pytest.skip("ngspice binary not found on PATH: install the Debian package 'ngspice' to run "
                    "the bridge-rectifier reference simulations")
    return binary
