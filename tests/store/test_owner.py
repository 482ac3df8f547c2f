"""The owner's passphrase: a salted scrypt hash only, and a wrong guess reveals nothing."""

from __future__ import annotations

import pytest
from sqlalchemy import select

from fixbench.store.errors import OwnerRequired, StoreInputError
from fixbench.store.models import OwnerSecret
from fixbench.store.owner import require_owner, set_owner_passphrase

PASS = "copper kettle 42"


def test_passphrase_is_kept_only_as_salted_scrypt_hash(store):
    set_owner_passphrase(store, PASS)
    with store.session() as session:
        secret = session.scalar(select(OwnerSecret))
    assert PASS.encode() not in secret.digest and len(secret.salt) == 16
    assert (secret.n, secret.r, secret.p) == (2**15, 8, 1)
    require_owner(store, PASS)


def test_same_passphrase_set_twice_gets_a_new_salt_and_hash(store):
    set_owner_passphrase(store, PASS)
    with store.session() as session:
        first = session.scalar(select(OwnerSecret))
    set_owner_passphrase(store, PASS, current=PASS)
    with store.session() as session:
        second = session.scalar(select(OwnerSecret))
    assert first.salt != second.salt and first.digest != second.digest


def test_wrong_guess_fails_with_the_same_message_as_no_guess(store):
    set_owner_passphrase(store, PASS)
    messages = set()
    for guess in ("copper kettle 41", "", None, PASS[:-1], PASS + " "):
        with pytest.raises(OwnerRequired) as err:
            require_owner(store, guess)
        messages.add(str(err.value))
    assert messages == {"the owner's passphrase was not accepted"}


def test_changing_passphrase_needs_the_current_one(store):
    set_owner_passphrase(store, PASS)
    with pytest.raises(OwnerRequired):
        set_owner_passphrase(store, "a new passphrase", current="not it at all")
    require_owner(store, PASS)


def test_short_passphrase_is_refused(store):
    with pytest.raises(StoreInputError, match="at least 8"):
        set_owner_passphrase(store, "short")


def test_owner_actions_refused_before_any_passphrase_is_set(store):
    with pytest.raises(OwnerRequired, match="must set one first"):
        require_owner(store, "anything at all")
