"""The workflows are tested on the same shops as the owner's screens: the built demo shop (or the
small fictional one), copied fresh for each test."""

from tests.ui.review.conftest import demo_shop_file, demo_store, knowledge, owner_passphrase  # noqa: F401
