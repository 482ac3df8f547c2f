"""Asking for the owner's passphrase before an owner-only action (the store checks it)."""

from __future__ import annotations

from PySide6.QtWidgets import QInputDialog, QLineEdit, QWidget


def ask_owner_passphrase(parent: QWidget, action: str) -> str | None:
    """The passphrase typed, or None if the person cancelled."""
    text, accepted = QInputDialog.getText(
        parent, "Owner's passphrase", f"{action} is for the shop owner.\nOwner's passphrase:",
        QLineEdit.EchoMode.Password)
    return text if accepted else None
