"""Fixtures for the owner's review screens: a shop database, copied fresh for each test.

The shop is the built demo shop (``demo_db/*.sqlite``) when it is there; otherwise a smaller
fictional shop is built once per run by :mod:`tests.ui.review.small_shop` through the store's own
write functions, with every case's readings and suspects produced by the engine.
"""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from fixbench.knowledge import load_knowledge
from fixbench.store import open_store
from fixbench.store.owner import has_owner_passphrase, require_owner, set_owner_passphrase
from fixbench.ui.context import AppContext

from .small_shop import PASSPHRASE, build_small_shop

DEMO_DIR = Path(__file__).resolve().parents[3] / "demo_db"


@pytest.fixture(scope="session")
def knowledge():
    return load_knowledge()


@pytest.fixture(scope="session")
def demo_shop_file(tmp_path_factory, knowledge) -> Path:
    built = sorted(DEMO_DIR.glob("*.sqlite")) if DEMO_DIR.is_dir() else []
    if built:
        return built[0]
    path = tmp_path_factory.mktemp("demo") / "demo-shop.sqlite"
    store = open_store(path)
    build_small_shop(store, knowledge)
    store.close()
    return path


@pytest.fixture
def demo_store(demo_shop_file, tmp_path):
    """A private copy of the demo shop for one test (tests may write settings or passphrases)."""
    copy = tmp_path / "shop.sqlite"
    shutil.copyfile(demo_shop_file, copy)
    store = open_store(copy)
    yield store
    store.close()


@pytest.fixture
def demo_context(demo_store, knowledge) -> AppContext:
    return AppContext(demo_store, knowledge)


@pytest.fixture
def owner_passphrase(demo_store) -> str:
    """The owner's passphrase of the test's copy (set on it if the shop has none yet)."""
    if not has_owner_passphrase(demo_store):
        set_owner_passphrase(demo_store, PASSPHRASE)
    require_owner(demo_store, PASSPHRASE)  # a shop built with another passphrase fails here
    return PASSPHRASE
