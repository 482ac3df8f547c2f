"""Shop settings: the report footer and the owner's passphrase, set and changed through the dialog."""

import pytest
from PySide6.QtCore import Qt

from fixbench.store import OwnerRequired, open_store
from fixbench.store.shop_settings import get_setting
from fixbench.store.owner import has_owner_passphrase, require_owner
from fixbench.ui.context import AppContext
from fixbench.ui.shop_settings import ShopSettingsDialog


@pytest.fixture
def store(tmp_path):
    store = open_store(tmp_path / "shop.sqlite")
    yield store
    store.close()


def _dialog(qtbot, store):
    dialog = ShopSettingsDialog(AppContext(store))
    qtbot.addWidget(dialog)
    dialog.show()
    return dialog


def test_first_passphrase_and_footer_are_kept(qtbot, store, tmp_path):
    dialog = _dialog(qtbot, store)
    qtbot.keyClicks(dialog.footer, "Solder & Sons Bench Repairs, 3 Capstan Row")
    qtbot.keyClicks(dialog.new, "brass kettle 42")
    qtbot.keyClicks(dialog.repeat, "brass kettle 42")
    assert dialog.grab().save(str(tmp_path / "shop-settings.png"))
    qtbot.keyClick(dialog.repeat, Qt.Key.Key_Return)
    assert dialog.result() == dialog.DialogCode.Accepted
    assert get_setting(store, "report_footer") == "Solder & Sons Bench Repairs, 3 Capstan Row"
    require_owner(store, "brass kettle 42")


def test_mismatched_repeat_is_refused_in_the_dialog(qtbot, store):
    dialog = _dialog(qtbot, store)
    qtbot.keyClicks(dialog.new, "brass kettle 42")
    qtbot.keyClicks(dialog.repeat, "brass kettle 43")
    qtbot.keyClick(dialog.repeat, Qt.Key.Key_Return)
    assert "differ" in dialog.message.text()
    assert dialog.isVisible() and not has_owner_passphrase(store)


def test_changing_it_needs_the_current_one(qtbot, store):
    from fixbench.store.owner import set_owner_passphrase

    set_owner_passphrase(store, "brass kettle 42")
    dialog = _dialog(qtbot, store)
    qtbot.keyClicks(dialog.current, "wrong guess here")
    qtbot.keyClicks(dialog.new, "copper teapot 7")
    qtbot.keyClicks(dialog.repeat, "copper teapot 7")
    qtbot.keyClick(dialog.repeat, Qt.Key.Key_Return)
    assert "Nothing was changed" in dialog.message.text()
    require_owner(store, "brass kettle 42")
    with pytest.raises(OwnerRequired):
        require_owner(store, "copper teapot 7")


def test_terms_of_business_are_kept_and_a_wrong_rate_is_told(qtbot, store):
    from fixbench.store.shop_terms import ShopTerms, shop_terms

    dialog = _dialog(qtbot, store)
    for field, text in ((dialog.rate, "22,50"), (dialog.currency, "EUR"),
                        (dialog.tax, "Prices include VAT at 21 %")):
        field.clear()
        qtbot.keyClicks(field, text)
    dialog.window_days.setValue(60)
    dialog.save()
    assert dialog.result() == dialog.DialogCode.Accepted
    assert shop_terms(store) == ShopTerms(2250, "EUR", "Prices include VAT at 21 %", 60)

    again = _dialog(qtbot, store)
    assert again.rate.text() == "22.50" and again.window_days.value() == 60
    again.rate.clear()
    qtbot.keyClicks(again.rate, "cheap")
    again.save()
    assert "not an amount" in again.message.text() and again.isVisible()
    assert shop_terms(store).labour_rate_cents == 2250
