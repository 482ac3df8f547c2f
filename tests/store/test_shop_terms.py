"""The shop's terms: labour rate, currency, tax wording and comeback window, kept and checked."""

from __future__ import annotations

import pytest

from fixbench.store.errors import StoreInputError
from fixbench.store.shop_terms import ShopTerms, set_shop_terms, shop_terms


def test_terms_default_to_a_ninety_day_window_and_no_rate(store):
    assert shop_terms(store) == ShopTerms(0, "", "", 90)


def test_terms_are_kept_and_read_back(store):
    terms = ShopTerms(labour_rate_cents=4200, currency="EUR",
                      tax_wording="Prices include VAT at 21 %", comeback_days=60)
    set_shop_terms(store, terms)
    assert shop_terms(store) == terms
    assert terms.labour_cents(25) == 1750  # 25 min at 42.00 an hour


@pytest.mark.parametrize("bad", [ShopTerms(labour_rate_cents=-1), ShopTerms(comeback_days=0),
                                 ShopTerms(comeback_days=1000), ShopTerms(currency="Euro money")])
def test_terms_that_cannot_be_right_are_refused(store, bad):
    with pytest.raises(StoreInputError):
        set_shop_terms(store, bad)
    assert shop_terms(store) == ShopTerms()
