"""Intake through the real window: a universal label typed as "85-265 V" opens the case (it was
refused before though the ratings parser reads it), and the shop's record is read off the GUI
thread while the technician types."""

from __future__ import annotations

import threading

from sqlalchemy import select

from fixbench.store.models import Case
from fixbench.ui.bench import intake as intake_module
from tests.ui.bench.conftest import fill_intake, open_intake, type_into

UNIVERSAL_LABEL = {"mains": "85-265 V", "bench_mains": "230 V", "output": "12 V", "current": "2 A"}


def test_a_universal_label_written_85_265_v_opens_the_case(qtbot, bench, store):
    intake = fill_intake(qtbot, bench, ticket="BW-3001", make="Halvenor", model="HV-12",
                         family="pwm_flyback", ratings=UNIVERSAL_LABEL, symptoms=("symptom_dead",))
    assert intake.ratings["mains"].message_text == ""
    open_intake(qtbot, bench, intake)
    assert bench.page == "cautions"
    with store.session() as session:
        assert session.scalar(select(Case.ratings)) == UNIVERSAL_LABEL


def test_intake_reads_the_shop_record_off_the_gui_thread(qtbot, bench, monkeypatch):
    on_gui_thread = []

    def watched(real):
        def call(*args):
            on_gui_thread.append(threading.current_thread() is threading.main_thread())
            return real(*args)
        return call

    monkeypatch.setattr(intake_module, "known_models", watched(intake_module.known_models))
    monkeypatch.setattr(intake_module, "ticket_in_use", watched(intake_module.ticket_in_use))
    intake = fill_intake(qtbot, bench, ticket="BW-3002", make="Halvenor", model="HV-12",
                         family="pwm_flyback", ratings=UNIVERSAL_LABEL)
    type_into(qtbot, intake.ticket.edit, "BW-3002")
    qtbot.waitUntil(lambda: len(on_gui_thread) >= 3, timeout=5000)  # models, ticket twice
    assert not any(on_gui_thread)
