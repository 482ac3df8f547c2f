"""Shop settings: short key/value texts kept for the whole shop (the footer of the owner's
reports, who was last at the bench). Read through a plain read transaction, written in one."""

from __future__ import annotations

from fixbench.store.database import Store
from fixbench.store.errors import StoreInputError, checked_text
from fixbench.store.models import ShopSetting

SETTING_KEY_MAX = 64


def get_setting(store: Store, key: str, default: str | None = None) -> str | None:
    with store.reading() as session:
        row = session.get(ShopSetting, key)
        return default if row is None else row.value


def set_setting(store: Store, key: str, value: str) -> None:
    key = checked_text(key, "setting name").strip()
    if not key or len(key) > SETTING_KEY_MAX:
        raise StoreInputError(f"a setting name is 1 to {SETTING_KEY_MAX} characters")
    value = checked_text(value, "setting")
    with store.session() as session:
        row = session.get(ShopSetting, key)
        if row is None:
            session.add(ShopSetting(key=key, value=value))
        else:
            row.value = value
