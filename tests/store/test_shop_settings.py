"""Shop settings are kept, replaced and read back with a default; an old database gains them."""

from __future__ import annotations

import pytest

from fixbench.store import open_store
from fixbench.store.errors import StoreInputError
from fixbench.store.migrate import current_revision, head_revision, upgrade
from fixbench.store.shop_settings import get_setting, set_setting


def test_setting_is_kept_replaced_and_defaults_when_missing(store):
    assert get_setting(store, "report_footer") is None
    assert get_setting(store, "report_footer", "none yet") == "none yet"
    set_setting(store, "report_footer", "Brightwater Repairs, bench 2")
    set_setting(store, "report_footer", "Brightwater Repairs, bench 3")
    assert get_setting(store, "report_footer") == "Brightwater Repairs, bench 3"
    with pytest.raises(StoreInputError):
        set_setting(store, "", "x")
    with pytest.raises(StoreInputError):
        set_setting(store, "k" * 65, "x")


def test_database_at_0003_upgrades_to_the_bench_tables(tmp_path):
    store = open_store(tmp_path / "old.sqlite", migrate=False)
    upgrade(store, "0003")
    upgrade(store, "head")
    with store.engine.connect() as connection:
        assert current_revision(connection) == head_revision()
        tables = {r[0] for r in connection.exec_driver_sql(
            "SELECT name FROM sqlite_master WHERE type = 'table'")}
    assert {"shop_settings", "withdrawn_readings", "skipped_checks",
            "caution_acknowledgements"} <= tables
    set_setting(store, "report_footer", "kept")
    assert get_setting(store, "report_footer") == "kept"
    store.close()
