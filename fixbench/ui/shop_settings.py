"""Shop settings: the footer printed on customer job reports, the shop's terms of business (labour
rate, currency and tax wording on job reports, how long a repair is under warranty), and the
owner's passphrase that guards deleting and amending cases and exporting everything.

The passphrase is set here the first time (the owner does this when the shop starts using
fixbench); changing it afterwards needs the current one. Only a salted scrypt hash is kept.
"""

from __future__ import annotations

from PySide6.QtWidgets import (QDialog, QDialogButtonBox, QFormLayout, QGroupBox, QLabel, QLineEdit,
                               QPlainTextEdit, QSpinBox, QVBoxLayout)

from fixbench.store.errors import StoreError
from fixbench.ui.context import AppContext
from fixbench.workflows.money import read_amount
from fixbench.workflows.shop import (ShopTerms, has_owner_passphrase, set_owner_passphrase,
                                     set_shop_footer, set_shop_terms, shop_footer, shop_terms)


class ShopSettingsDialog(QDialog):
    def __init__(self, context: AppContext, parent=None) -> None:
        super().__init__(parent)
        self.context = context
        self.setWindowTitle("Shop settings")
        store = context.store
        self.footer = QPlainTextEdit(shop_footer(store))
        self.footer.setPlaceholderText("shop name, address, phone, warranty terms: printed at the foot of "
                                       "every customer job report")
        self.footer.setTabChangesFocus(True)
        self.footer.setFixedHeight(70)
        terms = shop_terms(store)
        self.rate = QLineEdit(f"{terms.labour_rate_cents / 100:.2f}")
        self.rate.setPlaceholderText("per hour of bench time, e.g. 22.00")
        self.rate.setToolTip("What an hour at the bench costs the shop: with each job's bench "
                             "minutes it gives the job's labour in the figures")
        self.currency = QLineEdit(terms.currency)
        self.currency.setPlaceholderText("as written before an amount: EUR, £, $")
        self.currency.setMaxLength(8)
        self.tax = QLineEdit(terms.tax_wording)
        self.tax.setPlaceholderText("printed under a job report's total, e.g. Prices include VAT")
        self.window_days = QSpinBox(minimum=1, maximum=730, suffix=" days")
        self.window_days.setValue(terms.comeback_days)
        self.window_days.setToolTip("A unit back within this many days of its repair is taken in "
                                    "as a warranty return of that job")
        money = QGroupBox("Terms of business")
        money_form = QFormLayout(money)
        money_form.addRow("Labour rate (per bench hour)", self.rate)
        money_form.addRow("Currency", self.currency)
        money_form.addRow("Tax wording", self.tax)
        money_form.addRow("Comeback window", self.window_days)
        self.has_passphrase = has_owner_passphrase(store)
        self.current = QLineEdit()
        self.new = QLineEdit()
        self.repeat = QLineEdit()
        for field in (self.current, self.new, self.repeat):
            field.setEchoMode(QLineEdit.EchoMode.Password)
        owner = QGroupBox("Owner's passphrase" + (" (set: fill in to change it)" if self.has_passphrase
                                                  else " (not set yet)"))
        form = QFormLayout(owner)
        if self.has_passphrase:
            form.addRow("Current passphrase", self.current)
        else:
            self.current.setVisible(False)
        form.addRow("New passphrase", self.new)
        form.addRow("New passphrase again", self.repeat)
        form.addRow(QLabel("Needed to delete or amend a case and to export all cases. "
                           "Leave the new passphrase empty to keep things as they are."))
        self.message = QLabel()
        self.message.setWordWrap(True)
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Save | QDialogButtonBox.StandardButton.Cancel)
        buttons.accepted.connect(self.save)
        buttons.rejected.connect(self.reject)
        layout = QVBoxLayout(self)
        layout.addWidget(QLabel("<b>Footer on customer job reports</b>"))
        layout.addWidget(self.footer)
        layout.addWidget(money)
        layout.addWidget(owner)
        layout.addWidget(self.message)
        layout.addWidget(buttons)
        self.resize(640, 520)

    def save(self) -> None:
        """Keep the footer; set or change the passphrase if a new one was typed. Messages stay
        in the dialog; nothing half-saved is left behind for a passphrase that was refused."""
        store = self.context.store
        try:
            terms = ShopTerms(labour_rate_cents=read_amount(self.rate.text()) or 0,
                              currency=self.currency.text().strip(),
                              tax_wording=self.tax.text().strip(),
                              comeback_days=self.window_days.value())
        except StoreError as err:
            self.message.setText(f"\u26a0 Labour rate: {err}")
            self.rate.setFocus()
            return
        new, repeat = self.new.text(), self.repeat.text()
        if new or repeat:
            if new != repeat:
                self.message.setText("\u26a0 The two new passphrases differ: type them again.")
                self.repeat.clear()
                self.repeat.setFocus()
                return
            try:
                set_owner_passphrase(store, new, self.current.text() if self.has_passphrase else None)
            except StoreError as err:
                self.message.setText(f"\u26a0 {err}. Nothing was changed.")
                self.current.clear() if self.has_passphrase else self.new.clear()
                return
        try:
            set_shop_footer(store, self.footer.toPlainText().strip())
            set_shop_terms(store, terms)
        except StoreError as err:
            self.message.setText(f"\u26a0 {err}")
            return
        self.accept()
