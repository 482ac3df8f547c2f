"""The one error a command raises for a mistake in how it was called or in a file it was given.

Kept apart from :mod:`fixbench.cli`, which catches it, so the commands need not import the entry
point that imports them."""

from __future__ import annotations


class UsageError(Exception):
    """A mistake in how a command was called or in a file it was given; exit status 2."""
