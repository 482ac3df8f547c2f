"""Asking for the owner's passphrase at the terminal, for the owner-only commands.

getpass reads from the terminal, or from standard input when there is none (a script piping it
in); with neither, the command ends with one line instead of an EOFError trace.
"""

from __future__ import annotations

import getpass

from fixbench.commands.usage import UsageError


def ask_owner_passphrase(why: str) -> str:
    try:
        return getpass.getpass(f"Owner's passphrase ({why}): ")
    except (EOFError, KeyboardInterrupt, OSError):
        raise UsageError(f"the owner's passphrase is needed to {why}; none was given") from None
