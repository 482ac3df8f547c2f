"""Mistakes a person makes in every entry field are refused with a short message beside the field,
and nothing already typed is lost."""

from __future__ import annotations

import pytest
from PySide6.QtCore import Qt
from sqlalchemy import func, select

from fixbench.store.models import Case, ReadingRow, RepairAction, Verification
from tests.ui.bench.conftest import (acknowledge, fill_intake, open_intake, settle, type_into,
                                     type_reading)

CHARGER = {"mains": "230 V", "output": "5 V", "current": "2 A"}


def _count(store, model):
    with store.session() as session:
        return session.scalar(select(func.count()).select_from(model))


@pytest.mark.parametrize("key, typed, says", [
    ("output", "3,3", "use a point for decimals"),
    ("output", "5 A", "this check reads volts"),
    ("output", "5000 V", "outside what fixbench models"),
    ("current", "", "needed"),
    ("mains", "12 V", "not a mains voltage"),
    ("current", "2 kohm", "this check reads amps"),
    ("bulk", "-22 uF", "positive"),
])
def test_intake_rating_refused_beside_its_field_keeping_the_form(qtbot, bench, store, key, typed, says):
    ratings = dict(CHARGER, **{key: typed})
    intake = fill_intake(qtbot, bench, ticket="BW-2001", make="Quillon", model="QX-5",
                         family="pwm_flyback", ratings=ratings, symptoms=("symptom_dead",))
    open_intake(qtbot, bench, intake)
    assert bench.page == "intake"
    assert says in intake.ratings[key].message_text
    assert intake.ticket.text() == "BW-2001" and intake.model.text() == "QX-5"
    assert intake.ratings[key].text() == typed
    assert intake.symptoms["symptom_dead"].isChecked()
    assert _count(store, Case) == 0


def test_intake_needs_ticket_make_model_family_and_a_fresh_ticket(qtbot, bench, store):
    qtbot.keyClick(bench.panels["cases"].table, Qt.Key.Key_N, Qt.KeyboardModifier.ControlModifier)
    intake = bench.panels["intake"]
    type_into(qtbot, intake.ratings["output"].edit, "5 V", enter=False)
    intake.submit()
    assert "needed" in intake.ticket.message_text
    assert "needed" in intake.make.message_text and "needed" in intake.model.message_text
    assert "choose the supply family" in intake.family.message.text()
    assert intake.ratings["output"].text() == "5 V"
    # Enter on an empty ticket stays on it with the message, instead of moving on.
    type_into(qtbot, intake.ticket.edit, "")
    assert intake.ticket.edit.hasFocus() and intake.ticket.message_text
    # A ticket already used is refused.
    first = fill_intake(qtbot, bench, ticket="BW-2002", make="Quillon", model="QX-5",
                        family="pwm_flyback", ratings=CHARGER)
    open_intake(qtbot, bench, first)
    bench.controller.back_to_cases()
    again = fill_intake(qtbot, bench, ticket="BW-2002", make="Quillon", model="QX-5",
                        family="pwm_flyback", ratings=CHARGER)
    open_intake(qtbot, bench, again)
    assert "already a case" in again.ticket.message_text
    assert _count(store, Case) == 1


def test_model_from_history_fills_family_and_ratings(qtbot, bench):
    first = fill_intake(qtbot, bench, ticket="BW-2003", make="Larkspur", model="LP-19",
                        family="self_oscillating", ratings={"mains": "120 V", "output": "9 V",
                                                            "current": "1 A"})
    open_intake(qtbot, bench, first)
    bench.controller.back_to_cases()
    qtbot.keyClick(bench.panels["cases"].table, Qt.Key.Key_N, Qt.KeyboardModifier.ControlModifier)
    intake = bench.panels["intake"]
    type_into(qtbot, intake.make.edit, "Larkspur")
    type_into(qtbot, intake.model.edit, "LP-19")
    # The shop's record is read off the GUI thread: the form fills as soon as it is in.
    qtbot.waitUntil(lambda: "earlier case of this model" in intake.filled_note.text(), timeout=5000)
    assert intake.family.family_id() == "self_oscillating"
    assert intake.ratings["output"].text() == "9 V" and intake.ratings["mains"].text() == "120 V"
    assert "earlier case of this model" in intake.filled_note.text()


def _to_first_step(qtbot, bench):
    intake = fill_intake(qtbot, bench, ticket="BW-2100", make="Quillon", model="QX-5",
                         family="pwm_flyback", ratings=CHARGER, symptoms=("symptom_dead",))
    open_intake(qtbot, bench, intake)
    acknowledge(qtbot, bench)
    return bench.panels["guided"].card


@pytest.mark.parametrize("typed, says", [
    ("", "empty"),
    ("3,3 V", "use a point for decimals"),
    ("325 ohm", "this check reads"),
    ("lots", "cannot read"),
    ("-5 kohm", "cannot be negative"),
    ("9 MV", "more than 2 kV"),
])
def test_reading_refused_beside_the_field_and_nothing_kept(qtbot, bench, store, typed, says):
    card = _to_first_step(qtbot, bench)
    # Take a numeric check: the fuse (ohms) or, for the volts mistakes, the bulk discharge check.
    check = "bulk_discharged" if typed in ("9 MV", "3,3 V", "325 ohm") else "fuse_resistance"
    bench.controller.choose_check(check)
    before = _count(store, ReadingRow)
    type_reading(qtbot, bench, typed)
    assert says in card.field.message_text
    assert card.field.text() == typed  # kept for correcting
    assert _count(store, ReadingRow) == before
    assert bench.controller.current_check_id() == check


def test_outcome_step_refuses_words_it_does_not_take(qtbot, bench, store):
    card = _to_first_step(qtbot, bench)
    type_reading(qtbot, bench, "maybe")
    assert "is not an answer here" in card.field.message_text
    assert card.field.text() == "maybe"


def _to_repair(qtbot, bench):
    card = _to_first_step(qtbot, bench)
    qtbot.keyClick(card, Qt.Key.Key_R, Qt.KeyboardModifier.AltModifier)
    assert bench.page == "repair"
    return bench.panels["repair"]


@pytest.mark.parametrize("typed, says", [
    ("1,20", "use a point"), ("-3", "cannot be negative"), ("abc", "not an amount"),
    ("250000", "more than a supply's parts can cost"),
])
def test_repair_cost_refused_keeping_the_value_fitted(qtbot, bench, store, typed, says):
    repair = _to_repair(qtbot, bench)
    type_into(qtbot, repair.value.edit, "22 uF 400 V")
    type_into(qtbot, repair.cost.edit, typed)
    assert says in repair.cost.message_text
    assert repair.value.text() == "22 uF 400 V" and repair.cost.text() == typed
    settle(qtbot, bench)
    assert _count(store, RepairAction) == 0


def test_verification_and_close_refuse_bad_entries(qtbot, bench, store):
    repair = _to_repair(qtbot, bench)
    type_into(qtbot, repair.value.edit, "T2AL fuse")
    type_into(qtbot, repair.cost.edit, "0.30")
    settle(qtbot, bench)
    qtbot.keyClick(repair, Qt.Key.Key_V, Qt.KeyboardModifier.AltModifier)
    verify = bench.panels["verify"]
    type_into(qtbot, verify.field.edit, "sort of")
    assert "is not an answer here" in verify.field.message_text
    assert _count(store, Verification) == 0
    qtbot.keyClick(verify, Qt.Key.Key_L, Qt.KeyboardModifier.AltModifier)
    close = bench.panels["close"]
    for typed, says in (("abc", "is not a number of minutes"), ("-5", "is not a bench time"), ("", "type the bench minutes")):
        type_into(qtbot, close.minutes.edit, typed)
        assert says in close.minutes.message_text
        assert bench.page == "close"
    with store.session() as session:
        assert session.scalar(select(Case.status)) == "repairing"


def test_technician_name_must_not_be_empty(qtbot, bench, store):
    picker = bench.technician
    type_into(qtbot, picker.new_name.edit, "   ")
    assert "type a name" in picker.new_name.message_text
    type_into(qtbot, picker.new_name.edit, "Juno Marr")
    assert picker.combo.currentText() == "Juno Marr"
    assert bench.context.technician_id is not None
