"""The owner's passphrase: kept only as a salted scrypt hash, checked in constant time.

scrypt cost n=2**15, r=8, p=1 needs 32 MiB and takes about 0.1 s here: slow for a guesser, quick
for the owner. RFC 7914 section 2 gives the parameter meanings; the hash length and salt size
follow its section 12 test vectors (64-byte key) and NIST SP 800-132 (salt of at least 128 bits).
The parameters are kept beside the hash, so they can be raised later without locking anyone out.
"""

from __future__ import annotations

import hashlib
import hmac
import secrets

from sqlalchemy import select

from fixbench.store.cases import utc_now
from fixbench.store.database import Store
from fixbench.store.errors import OwnerRequired, StoreInputError
from fixbench.store.models import OwnerSecret

SCRYPT_N = 2**15
SCRYPT_R = 8
SCRYPT_P = 1
SALT_BYTES = 16
KEY_BYTES = 64
MIN_LENGTH = 8
# hashlib's default limit (32 MiB) is exactly 128*n*r; leave room for its bookkeeping.
MAX_MEMORY = 64 * 1024 * 1024

WRONG = "the owner's passphrase was not accepted"


def _derive(passphrase: str, salt: bytes, n: int, r: int, p: int) -> bytes:
    return hashlib.scrypt(passphrase.encode("utf-8"), salt=salt, n=n, r=r, p=p,
                          maxmem=MAX_MEMORY, dklen=KEY_BYTES)


def has_owner_passphrase(store: Store) -> bool:
    with store.reading() as session:
        return session.scalar(select(OwnerSecret.id)) is not None


def set_owner_passphrase(store: Store, new: str, current: str | None = None) -> None:
    """Set the passphrase; changing an existing one needs the current one."""
    if len(new) < MIN_LENGTH:
        raise StoreInputError(f"the passphrase needs at least {MIN_LENGTH} characters")
    if has_owner_passphrase(store):
        require_owner(store, current)
    salt = secrets.token_bytes(SALT_BYTES)
    digest = _derive(new, salt, SCRYPT_N, SCRYPT_R, SCRYPT_P)
    with store.session() as session:
        for old in session.scalars(select(OwnerSecret)):
            session.delete(old)
        session.add(OwnerSecret(salt=salt, n=SCRYPT_N, r=SCRYPT_R, p=SCRYPT_P, digest=digest,
                                set_at=utc_now()))


def require_owner(store: Store, passphrase: str | None) -> None:
    """Return quietly for the right passphrase; otherwise raise :class:`OwnerRequired`.

    The message is the same whether no passphrase is set, none was given, or a guess was wrong,
    and a wrong guess pays the same scrypt cost as a right one.
    """
    with store.reading() as session:
        secret = session.scalar(select(OwnerSecret))
    if secret is None:
        raise OwnerRequired("no owner passphrase is set for this shop; the owner must set one first")
    candidate = _derive(passphrase or "", secret.salt, secret.n, secret.r, secret.p)
    if not hmac.compare_digest(candidate, secret.digest) or not passphrase:
        raise OwnerRequired(WRONG)
