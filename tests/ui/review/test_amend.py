"""The owner amends and deletes cases from the case window, typed as a person would, on a fresh
copy of the shop for each test."""

from __future__ import annotations

import json

import pytest
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QApplication
from sqlalchemy import text

from fixbench.store.amendments import amendments_of, original_value
from fixbench.ui.review.case_story import CaseStoryWindow
from fixbench.ui.review.history import HistoryScreen
from fixbench.workflows.trade_names import OUTCOME_WORDS

from .helpers import settle

WHO = "Maren Oskby"  # invented
WHY = "Customer declined the quote; closed under the wrong outcome"


def _closed_case(store, where: str = "1 = 1") -> tuple[int, str, str]:
    with store.engine.connect() as connection:
        return tuple(connection.execute(text(
            "SELECT id, ticket_ref, outcome FROM cases WHERE status = 'closed' AND " + where
            + " ORDER BY id LIMIT 1")).one())


def _case_row(store, case_id: int):
    with store.engine.connect() as connection:
        return connection.execute(text("SELECT outcome, bench_minutes, confirmed_fault, "
                                       "confirmed_part, confirmed_stage FROM cases WHERE id = :c"),
                                  {"c": case_id}).one_or_none()


def _window(qtbot, context, case_id: int) -> CaseStoryWindow:
    window = CaseStoryWindow(context, case_id)
    qtbot.addWidget(window)
    window.resize(1366, 768)
    window.show()
    settle(qtbot, lambda: window.story is not None)
    return window


def _open_amend(qtbot, window, by_keyboard: bool = False):
    assert window.amend_button.isEnabled()
    if by_keyboard:
        qtbot.waitUntil(lambda: QApplication.activeWindow() is window)
        qtbot.keyClick(window.timeline, Qt.Key.Key_A, Qt.KeyboardModifier.AltModifier)
        qtbot.waitUntil(lambda: window.amend_dialog is not None)  # a mnemonic clicks after ~100 ms
    else:
        qtbot.mouseClick(window.amend_button, Qt.MouseButton.LeftButton)
    dialog = window.amend_dialog
    assert dialog is not None and dialog.isVisible()
    qtbot.waitUntil(lambda: QApplication.activeWindow() is dialog)
    assert dialog.field.hasFocus()  # the person types from the first field on
    return dialog


def _type(qtbot, field, words: str) -> None:
    field.setFocus()  # as a click or Tab would
    qtbot.keyClicks(field, words)


def _type_who_why_passphrase(qtbot, dialog, passphrase: str) -> None:
    _type(qtbot, dialog.who, WHO)
    _type(qtbot, dialog.why, WHY)
    _type(qtbot, dialog.passphrase, passphrase)
    qtbot.keyClick(dialog.passphrase, Qt.Key.Key_Return)


def test_owner_amends_a_closed_outcome_and_the_timeline_tells_it(qtbot, demo_context, demo_store,
                                                                 owner_passphrase):
    case_id, ticket, before = _closed_case(demo_store, "outcome != 'not_economical'")
    window = _window(qtbot, demo_context, case_id)
    dialog = _open_amend(qtbot, window)
    assert dialog.chosen_field() == "outcome"
    assert dialog.now.text() == OUTCOME_WORDS[before]
    dialog.choice.setFocus()
    qtbot.keyClicks(dialog.choice, "Not")
    assert dialog.choice.currentData() == "not_economical"
    _type_who_why_passphrase(qtbot, dialog, owner_passphrase)
    settle(qtbot, lambda: not dialog.isVisible() and window.amend_dialog is None
           and window.story is not None and "outcome" in window.story.amended)

    shown = window.timeline.toPlainText()
    assert f"Outcome amended by {WHO}" in shown
    assert f"Was: {OUTCOME_WORDS[before]}" in shown  # the value it was closed with stays in view
    assert "Now: Not worth repairing" in shown
    assert f"Why: {WHY}" in shown
    assert f"Closed Outcome: {OUTCOME_WORDS[before]}" in " ".join(shown.split())
    assert "Not worth repairing (amended)" in window.facts.text()

    kept = amendments_of(demo_store, case_id)
    assert [(a.field, json.loads(a.old_value), json.loads(a.new_value), a.amended_by, a.reason)
            for a in kept] == [("outcome", before, "not_economical", WHO, WHY)]
    assert _case_row(demo_store, case_id).outcome == "not_economical"
    assert original_value(demo_store, case_id, "outcome") == before
    stamp = f"{kept[0].amended_at:%Y-%m-%d %H:%M}"
    assert f"{stamp} Amendment Outcome amended by {WHO}" in " ".join(shown.split())


def test_a_wrong_passphrase_is_refused_in_the_dialog_and_nothing_changes(qtbot, demo_context,
                                                                         demo_store,
                                                                         owner_passphrase):
    case_id, _ticket, before = _closed_case(demo_store, "outcome != 'returned_unrepaired'")
    row_before = _case_row(demo_store, case_id)
    window = _window(qtbot, demo_context, case_id)
    dialog = _open_amend(qtbot, window, by_keyboard=True)
    qtbot.keyClick(dialog.field, Qt.Key.Key_Tab)
    assert dialog.choice.hasFocus()
    qtbot.keyClicks(dialog.choice, "Ret")
    assert dialog.choice.currentData() == "returned_unrepaired"
    _type_who_why_passphrase(qtbot, dialog, owner_passphrase + "x")
    settle(qtbot, lambda: dialog.message.text() and not dialog.working)

    assert dialog.isVisible()
    assert "passphrase was not accepted" in dialog.message.text()
    assert "Nothing was changed" in dialog.message.text()
    assert "Traceback" not in dialog.message.text()
    assert dialog.passphrase.text() == "" and dialog.passphrase.hasFocus()
    assert amendments_of(demo_store, case_id) == []
    assert _case_row(demo_store, case_id) == row_before
    assert "Amendment" not in window.timeline.toPlainText()


def test_a_refused_value_or_a_missing_reason_is_told_and_nothing_changes(qtbot, demo_context,
                                                                        demo_store,
                                                                        owner_passphrase):
    case_id, _ticket, _before = _closed_case(demo_store)
    row_before = _case_row(demo_store, case_id)
    window = _window(qtbot, demo_context, case_id)
    dialog = _open_amend(qtbot, window)
    dialog.field.setFocus()
    qtbot.keyClicks(dialog.field, "Bench")
    assert dialog.chosen_field() == "bench_minutes"
    assert dialog.value.currentWidget() is dialog.typed
    dialog.typed.clear()
    qtbot.keyClicks(dialog.typed, "-5")
    _type_who_why_passphrase(qtbot, dialog, owner_passphrase)
    assert "not a bench time" in dialog.message.text()
    assert dialog.typed.hasFocus() and dialog.isVisible()

    dialog.typed.clear()
    qtbot.keyClicks(dialog.typed, "30")
    dialog.why.clear()
    qtbot.keyClick(dialog.passphrase, Qt.Key.Key_Return)
    assert dialog.message.text() == "Say why the case is being amended."
    assert dialog.why.hasFocus()
    QApplication.processEvents()
    assert amendments_of(demo_store, case_id) == []
    assert _case_row(demo_store, case_id) == row_before


def test_amending_the_confirmed_fault_brings_its_part_and_stage(qtbot, demo_context, demo_store,
                                                                knowledge, owner_passphrase,
                                                                tmp_path):
    case_id, _ticket, _before = _closed_case(demo_store, "confirmed_fault IS NOT NULL")
    row = _case_row(demo_store, case_id)
    window = _window(qtbot, demo_context, case_id)
    family = knowledge.family(window.story.family_id)
    dialog = _open_amend(qtbot, window)
    dialog.field.setFocus()
    qtbot.keyClicks(dialog.field, "Confirmed f")
    assert dialog.chosen_field() == "confirmed_fault"
    assert dialog.choice.currentData() == row.confirmed_fault
    other = next(f for f in family.faults if f.part != row.confirmed_part)
    dialog.choice.setFocus()
    qtbot.keyClick(dialog.choice, Qt.Key.Key_Home)
    for _ in range(dialog.choice.count()):
        if dialog.choice.currentData() == other.id:
            break
        qtbot.keyClick(dialog.choice, Qt.Key.Key_Down)
    assert dialog.choice.currentData() == other.id
    assert "part and its stage" in dialog.follows.text()
    assert dialog.grab().save(str(tmp_path / "amend-fault-dialog.png"))
    _type_who_why_passphrase(qtbot, dialog, owner_passphrase)
    settle(qtbot, lambda: not dialog.isVisible() and window.story is not None
           and "confirmed_fault" in window.story.amended)

    after = _case_row(demo_store, case_id)
    assert (after.confirmed_fault, after.confirmed_part, after.confirmed_stage) == (
        other.id, other.part, family.part(other.part).stage)
    assert {a.field for a in amendments_of(demo_store, case_id)} == {
        "confirmed_fault", "confirmed_part", "confirmed_stage"}
    shown = window.timeline.toPlainText()
    assert f"Confirmed fault, confirmed part and confirmed stage amended by {WHO}" in shown
    assert f"; now {other.title}" in shown
    assert other.id not in shown  # the fault by its name, not the engine's identifier
    was = family.fault(row.confirmed_fault).title
    assert f"Confirmed fault: {was}" in shown  # the closing step, as closed
    window.timeline.verticalScrollBar().setValue(window.timeline.verticalScrollBar().maximum())
    QApplication.processEvents()
    assert window.grab().save(str(tmp_path / "case-fault-amended.png"))


@pytest.fixture
def history(qtbot, demo_context):
    screen = HistoryScreen(demo_context)
    qtbot.addWidget(screen)
    screen.resize(1366, 768)
    screen.show()
    settle(qtbot, lambda: screen.model.rows and not screen.controller.loading)
    return screen


def test_deleting_a_case_closes_its_window_and_the_count_drops(qtbot, history, demo_store,
                                                               owner_passphrase, tmp_path):
    before = history.model.total
    story = history.open_case(0)
    settle(qtbot, lambda: story.story is not None and story.delete_button.isEnabled())
    case_id, ticket = story.case_id, story.story.ticket
    qtbot.mouseClick(story.delete_button, Qt.MouseButton.LeftButton)
    dialog = story.delete_dialog
    assert dialog is not None and dialog.isVisible()
    qtbot.waitUntil(lambda: QApplication.activeWindow() is dialog)
    assert dialog.typed_ticket.hasFocus()

    qtbot.keyClicks(dialog.typed_ticket, ticket[:-1])
    qtbot.keyClicks(dialog.passphrase, owner_passphrase)
    qtbot.keyClick(dialog.passphrase, Qt.Key.Key_Return)
    assert "does not match" in dialog.message.text() and dialog.isVisible()
    assert dialog.typed_ticket.hasFocus()
    assert dialog.grab().save(str(tmp_path / "delete-dialog.png"))
    assert _case_row(demo_store, case_id) is not None

    qtbot.keyClicks(dialog.typed_ticket, ticket[-1])
    qtbot.keyClick(dialog.passphrase, Qt.Key.Key_Return)
    settle(qtbot, lambda: not story.isVisible() and not history.controller.loading
           and history.model.total == before - 1)
    assert _case_row(demo_store, case_id) is None
    assert story not in history.stories
    assert f"{before - 1:,} cases" in history.count.text()
    assert f"Case {ticket} deleted." in history.busy.message.text()


def test_without_an_owner_passphrase_the_record_cannot_be_changed_here(qtbot, demo_context,
                                                                       demo_store):
    with demo_store.engine.begin() as connection:
        connection.execute(text("DELETE FROM owner_secret"))
    case_id, _ticket, _before = _closed_case(demo_store)
    window = _window(qtbot, demo_context, case_id)
    assert not window.amend_button.isEnabled() and not window.delete_button.isEnabled()
    assert "No owner's passphrase is set" in window.amend_button.toolTip()


def test_the_case_window_with_an_amendment_renders(qtbot, demo_context, demo_store, tmp_path,
                                                  owner_passphrase):
    case_id, _ticket, _before = _closed_case(demo_store, "outcome != 'not_economical'")
    window = _window(qtbot, demo_context, case_id)
    dialog = _open_amend(qtbot, window)
    dialog.choice.setFocus()
    qtbot.keyClicks(dialog.choice, "Not")
    QApplication.processEvents()
    assert dialog.grab().save(str(tmp_path / "amend-dialog.png"))
    _type_who_why_passphrase(qtbot, dialog, owner_passphrase)
    settle(qtbot, lambda: window.story is not None and "outcome" in window.story.amended)
    window.timeline.verticalScrollBar().setValue(window.timeline.verticalScrollBar().maximum())
    QApplication.processEvents()
    path = tmp_path / "case-amended.png"
    assert window.grab().save(str(path))
    assert path.stat().st_size > 10_000
