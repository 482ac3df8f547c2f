"""Removing a customer's name and contact on their request: owner only, with the name typed back.

Every job of the person stays, with its prices, parts, times, faults and outcomes; the person's
details leave the shop's database (backups made before keep them until they age out). The work is
:func:`fixbench.workflows.review.forget_customer`, run off the GUI thread like the amend dialog's.
"""

from __future__ import annotations

from PySide6.QtCore import Signal
from PySide6.QtWidgets import QFormLayout, QLabel, QLineEdit, QVBoxLayout, QWidget

from fixbench.ui.review.amend_dialog import OwnerActionDialog
from fixbench.workflows.review import Store, forget_customer


class ForgetCustomerDialog(OwnerActionDialog):
    forgotten = Signal(int)  # how many jobs were the person's

    def __init__(self, store: Store, customer_id: int, name: str,
                 parent: QWidget | None = None) -> None:
        super().__init__("Remove a customer's details", "&Remove the details", parent)
        self.store, self.customer_id, self.name = store, customer_id, name
        plain = name.split(" (")[0]
        self.plain_name = plain
        warning = QLabel(f"On the customer's request, remove <b>{plain}</b>'s name and contact "
                         "from the shop's record. Their jobs stay, with every figure; only the "
                         "person's details go. Backups made before keep them until they are "
                         "replaced.", wordWrap=True)
        self.typed_name = QLineEdit(placeholderText=plain)
        self.typed_name.setAccessibleName("Name typed back")
        form = QFormLayout()
        form.addRow("&Type the name to confirm:", self.typed_name)
        form.addRow("Owner's &passphrase:", self.passphrase)
        for label_for in (self.typed_name, self.passphrase):
            form.labelForField(label_for).setBuddy(label_for)
        layout = QVBoxLayout(self)
        layout.addWidget(warning)
        layout.addLayout(form)
        layout.addWidget(self.message)
        layout.addWidget(self.bar)
        layout.addWidget(self.buttons)
        self.setMinimumWidth(480)
        self.first_field = self.typed_name

    def attempt(self) -> None:
        if self.working:
            return
        if self.typed_name.text().strip().lower() != self.plain_name.lower():
            self.refuse(f"The name typed does not match {self.plain_name}; type it as shown.",
                        self.typed_name)
            return
        if not self.passphrase.text():
            self.refuse("Type the owner's passphrase.", self.passphrase)
            return
        store, customer_id, passphrase = self.store, self.customer_id, self.passphrase.text()
        self.run(lambda: forget_customer(store, customer_id, passphrase=passphrase))

    def _done(self, result) -> None:
        super()._done(result)
        self.forgotten.emit(int(result))
