"""Errors the store raises, split by who can fix them.

A person can fix a :class:`StoreFileError` (point at another file, restore a backup), an
:class:`OwnerRequired` (ask the owner) or a :class:`StoreInputError` (retype the text). A
:class:`ClosedCaseError` means a caller tried to rewrite history; the ui should have offered an
amendment instead, so it is a programmer's mistake as much as a person's.
"""

from __future__ import annotations

from pathlib import Path


class StoreError(Exception):
    """Base class for everything the store raises on purpose."""


class StoreFileError(StoreError):
    """The database file is damaged or is not a fixbench database; it was left untouched.

    ``newest_backup`` is the newest backup proven readable (see :mod:`fixbench.store.health`),
    never merely the newest file in the backup folder."""

    def __init__(self, path: Path, problem: str, newest_backup: Path | None):
        self.path = path
        self.problem = problem
        self.newest_backup = newest_backup
        if newest_backup is not None:
            offer = (f"The newest good backup is {newest_backup}; restore it with "
                     f"`fixbench restore {newest_backup}`.")
        else:
            offer = "No good backup of it was found; open another file with --db."
        super().__init__(f"{path} {problem}. It has not been changed. {offer}")


class NewerSchema(StoreError):
    """The database was written by a newer fixbench; it was left untouched."""

    def __init__(self, where: str, revision: str, head: str):
        self.revision = revision
        super().__init__(f"{where} is from a newer fixbench (its records are at schema {revision}; "
                         f"this fixbench knows up to {head}). It has not been changed: open it with "
                         "the newer fixbench.")


class StoreLocationError(StoreError):
    """The database named cannot be opened: a folder or a device instead of a file, a name the file
    system refuses, a URL that does not parse, a driver that is not installed, a server that does
    not answer, or no database where one was expected."""


class ShopInUse(StoreError):
    """Other benches are using the shop, and the action needs it to themselves (a restore)."""


class StoreInputError(StoreError):
    """Text or a value that cannot be kept as given (the message says what to change)."""


class CaseNotFound(StoreInputError):
    """No case has the id or ticket reference asked for."""


class OwnerRequired(StoreError):
    """An owner-only action was asked for without the right passphrase."""


class ClosedCaseError(StoreError):
    """A closed case was about to be changed other than by an amendment."""


def checked_text(value: str, what: str) -> str:
    """Return ``value`` if it can be kept on every backend; PostgreSQL text cannot hold U+0000."""
    if not isinstance(value, str):
        raise StoreInputError(f"{what} must be text, not {type(value).__name__}")
    if "\x00" in value:
        raise StoreInputError(f"{what} contains a NUL character (U+0000); remove it and try again")
    return value
