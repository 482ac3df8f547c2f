"""The shop's terms of business, kept in its settings: the labour rate, the currency and the tax
wording printed on job reports, and the comeback window (how long a repair is under warranty).

Each is one shop setting (:mod:`fixbench.store.shop_settings`); this module reads them as one
typed value and checks them before they are kept.
"""

from __future__ import annotations

from dataclasses import dataclass

from sqlalchemy import select

from fixbench.store.case_flags import COMEBACK_DAYS
from fixbench.store.database import Store
from fixbench.store.errors import StoreInputError
from fixbench.store.models import ShopSetting

LABOUR_RATE = "labour_rate_cents"  # per hour of bench time
CURRENCY = "currency"
TAX_WORDING = "tax_wording"
COMEBACK_WINDOW = "comeback_days"
CURRENCY_MAX = 8
TAX_WORDING_MAX = 200
WINDOW_MAX_DAYS = 730


@dataclass(frozen=True)
class ShopTerms:
    labour_rate_cents: int = 0  # per hour of bench time
    currency: str = ""  # as the shop writes it before an amount: "EUR", "£", "$"
    tax_wording: str = ""  # printed under a job report's total: "Prices include VAT at 20 %"
    comeback_days: int = COMEBACK_DAYS

    def labour_cents(self, minutes: int) -> int:
        """The labour cost of ``minutes`` of bench time at this rate, to the cent."""
        return labour_cents(minutes * self.labour_rate_cents)


def labour_cents(cent_minutes: int) -> int:
    """Labour in cents from bench minutes times cents per hour: over 60, rounded half up (the one
    rounding of labour: the money figures sum cent-minutes and round once the same way)."""
    return (int(cent_minutes) + 30) // 60


def shop_terms(store: Store) -> ShopTerms:
    with store.reading() as session:
        kept = dict(session.execute(select(ShopSetting.key, ShopSetting.value).where(
            ShopSetting.key.in_((LABOUR_RATE, CURRENCY, TAX_WORDING, COMEBACK_WINDOW)))).all())
    default = ShopTerms()
    return ShopTerms(labour_rate_cents=int(kept.get(LABOUR_RATE, default.labour_rate_cents)),
                     currency=kept.get(CURRENCY, default.currency),
                     tax_wording=kept.get(TAX_WORDING, default.tax_wording),
                     comeback_days=int(kept.get(COMEBACK_WINDOW, default.comeback_days)))


def checked_terms(terms: ShopTerms) -> ShopTerms:
    """The terms if they can be kept; StoreInputError saying what to change otherwise."""
    if terms.labour_rate_cents < 0:
        raise StoreInputError("the labour rate cannot be negative")
    if not 1 <= terms.comeback_days <= WINDOW_MAX_DAYS:
        raise StoreInputError(f"the comeback window is 1 to {WINDOW_MAX_DAYS} days")
    if len(terms.currency.strip()) > CURRENCY_MAX:
        raise StoreInputError(f"write the currency in at most {CURRENCY_MAX} characters "
                              "(EUR, £, $)")
    if len(terms.tax_wording) > TAX_WORDING_MAX:
        raise StoreInputError(f"the tax wording is at most {TAX_WORDING_MAX} characters")
    return terms


def set_shop_terms(store: Store, terms: ShopTerms) -> None:
    terms = checked_terms(terms)
    values = {LABOUR_RATE: str(terms.labour_rate_cents), CURRENCY: terms.currency.strip(),
              TAX_WORDING: terms.tax_wording.strip(), COMEBACK_WINDOW: str(terms.comeback_days)}
    with store.session() as session:
        for key, value in values.items():
            row = session.get(ShopSetting, key)
            if row is None:
                session.add(ShopSetting(key=key, value=value))
            else:
                row.value = value
