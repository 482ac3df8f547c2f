"""The small ticket printed for a unit at intake: its ticket number, make and model, the customer's
complaint, the date, and a QR code the bench scans to open the case.

The code holds the ticket reference alone, as plain text: a scanner at the bench types it into
the open-cases search like a keyboard would. It is a full QR code (not a Micro QR, which many
handheld scanners do not read) at error correction level M, made by segno (ISO/IEC 18004); the ui
draws its modules as it is given them.
"""

from __future__ import annotations

from dataclasses import dataclass
from datetime import datetime

import segno

from fixbench.store.case_record import load_case_record
from fixbench.store.database import Store

COMPLAINT_CHARS = 160


@dataclass(frozen=True)
class IntakeTicket:
    ticket: str
    unit: str  # make, model and kind
    complaint: str  # the customer's words at intake, shortened to fit
    taken_in: datetime
    warranty: str  # "" or "Warranty return of job ..."
    code_text: str  # what the QR code holds
    modules: tuple[tuple[bool, ...], ...]  # the QR code's dark (True) and light modules, rows


def qr_modules(text: str) -> tuple[tuple[bool, ...], ...]:
    code = segno.make_qr(text, error="m")
    return tuple(tuple(bool(bit) for bit in row) for row in code.matrix)


def intake_ticket(store: Store, case_id: int) -> IntakeTicket:
    case = load_case_record(store, case_id)
    complaint = " ".join(case.notes.split())
    if len(complaint) > COMPLAINT_CHARS:
        complaint = complaint[:COMPLAINT_CHARS - 1].rstrip() + "\u2026"
    warranty = "" if case.return_of is None else (
        f"Warranty return of job {case.return_of.ticket}")
    return IntakeTicket(case.ticket, f"{case.make} {case.model} ({case.kind})",
                        complaint or "(no complaint written down)", case.opened_at, warranty,
                        case.ticket, qr_modules(case.ticket))
