"""Money as the shop reads and types it: the one formatter of amounts (with the shop's currency)
and the one reader of amounts typed at the counter ("45", "45.50", "45,50", "EUR 45.50").

Amounts are kept as whole cents everywhere below this; nothing is rounded twice.
"""

from __future__ import annotations

import re

from fixbench.store.errors import StoreInputError

_AMOUNT = re.compile(r"^(?P<whole>\d{1,7})(?:[.,](?P<cents>\d{1,2}))?$")
MAX_CENTS = 10_000_000 * 100


def money_text(cents: int | None, currency: str = "") -> str:
    """'EUR 1,234.50' (or '1,234.50' with no currency set); '-' for an amount not known."""
    if cents is None:
        return "-"
    sign = "-" if cents < 0 else ""
    amount = f"{sign}{abs(cents) // 100:,}.{abs(cents) % 100:02d}"
    return f"{currency} {amount}" if currency else amount


def read_amount(text: str, currency: str = "") -> int | None:
    """Cents from an amount as typed; None for an empty field. StoreInputError (with what to type)
    for anything else."""
    cleaned = text.strip()
    if currency:
        cleaned = cleaned.replace(currency, "")
    cleaned = cleaned.replace(" ", "").replace("\u00a0", "")
    if not cleaned:
        return None
    match = _AMOUNT.match(cleaned)
    if match is None:
        raise StoreInputError(f"'{text.strip()}' is not an amount: type it like 45 or 45.50")
    cents = int(match["whole"]) * 100 + int((match["cents"] or "0").ljust(2, "0"))
    if cents > MAX_CENTS:
        raise StoreInputError("that amount is too large for one job")
    return cents


def rate_text(cents_per_hour: int, currency: str = "") -> str:
    return f"{money_text(cents_per_hour, currency)} an hour"
