"""The one error a command raises for a mistake in how it was called or in a file it was given,
and the "did you mean" hint its messages carry.

Kept apart from :mod:`fixbench.cli`, which catches it, so the commands need not import the entry
point that imports them."""

from __future__ import annotations

import difflib
import sys
from collections.abc import Iterable
from pathlib import Path


class UsageError(Exception):
    """A mistake in how a command was called or in a file it was given; exit status 2."""


def near_matches(word: str, known: Iterable[str], limit: int = 5) -> str:
    """" (did you mean: a, b?)" naming the known names closest to ``word``, or "" when none is close.

    Close means difflib's ratio of at least 0.6 (its default), with a name that contains the word
    or starts like it also counted, so "C2" finds "C2.dried" and "C2.shorted"."""
    known = list(dict.fromkeys(known))
    lowered = word.lower()
    picked = [k for k in known if lowered and (lowered in k.lower() or k.lower().startswith(lowered))]
    picked += [k for k in difflib.get_close_matches(word, known, n=limit) if k not in picked]
    if not picked:
        return ""
    return f" (did you mean: {', '.join(picked[:limit])}?)"


def read_bounded(path_text: str, limit: int, what: str, stdin: bool = False) -> bytes:
    """The bytes of a file the user named (with ``stdin``, "-" is standard input), or a one-line
    error when it cannot be read or is larger than ``limit`` (``what``: what such a file is)."""
    try:
        if stdin and path_text == "-":
            raw = sys.stdin.buffer.read(limit + 1)
        else:
            with Path(path_text).open("rb") as handle:
                raw = handle.read(limit + 1)
    except OSError as err:
        raise UsageError(f"cannot read {path_text}: {err.strerror or err}") from None
    if len(raw) > limit:
        raise UsageError(f"{path_text}: larger than {limit // 1_000_000} MB; {what} is a few kilobytes")
    return raw
