"""The practice screen: pick a round, play it, read the debrief; progress beside it, where a kept
round's debrief opens again.

Widgets render and forward; :class:`fixbench.workflows.practice.PracticeRounds` talks to the
practice package and the store. The engine's own path and the debrief, and a kept round played
again, run off the GUI thread.
"""

from __future__ import annotations

from PySide6.QtWidgets import QStackedWidget, QTabWidget, QVBoxLayout, QWidget

from fixbench.practice.record import RecordError
from fixbench.practice.round import RoundError
from fixbench.store.errors import OwnerRequired
from fixbench.ui.context import AppContext
from fixbench.ui.practice.debrief_view import DebriefView
from fixbench.ui.practice.pick_view import PickView
from fixbench.ui.practice.progress_view import ProgressView
from fixbench.ui.practice.round_view import RoundView
from fixbench.ui.workers import run_in_background
from fixbench.workflows.practice import PracticeRounds
from fixbench.workflows.trade_names import TradeNames


class PracticeScreen(QWidget):
    def __init__(self, context: AppContext, controller: PracticeRounds | None = None) -> None:
        super().__init__()
        self.context = context
        self.controller = controller or PracticeRounds(context.store, context.knowledge)
        self.pick = PickView()
        self.round_view = RoundView()
        self.debrief_view = DebriefView()
        self.pages = QStackedWidget()
        for page in (self.pick, self.round_view, self.debrief_view):
            self.pages.addWidget(page)
        self.progress_view = ProgressView(TradeNames(context.knowledge))
        self.tabs = QTabWidget()
        self.tabs.addTab(self.pages, "Round")
        self.tabs.addTab(self.progress_view, "Progress")
        layout = QVBoxLayout(self)
        layout.setContentsMargins(4, 4, 4, 4)
        layout.addWidget(self.tabs)

        self.pick.next_asked.connect(self.next_unit)
        self.pick.start_asked.connect(self.start)
        self.pick.replay_asked.connect(self.replay)
        self.pick.trainee_changed.connect(self.choose_trainee)
        self.round_view.take_asked.connect(self.take)
        self.round_view.coach_toggled.connect(self.toggle_coach)
        self.round_view.commit_asked.connect(self.commit)
        self.debrief_view.again_asked.connect(self.back_to_pick)
        self.progress_view.reopen_asked.connect(self.reopen)
        self.progress_view.unlock_button.clicked.connect(self.unlock_owner)
        self.progress_view.passphrase.returnPressed.connect(self.unlock_owner)
        self.refresh()

    # --- picking -----------------------------------------------------------------------------------

    def refresh(self) -> None:
        c = self.controller
        trainees = c.trainees()
        if c.trainee_id is None and self.context.technician_id in {tid for tid, _ in trainees}:
            c.trainee_id = self.context.technician_id
        self.pick.fill(trainees, c.families(), c.levels(), c.replay_choices(), c.trainee_id)
        self._show_progress()

    def choose_trainee(self, trainee_id) -> None:
        self.controller.trainee_id = trainee_id
        self._show_progress()

    def next_unit(self, level_id: str) -> None:
        self.controller.next_for_trainee(level_id)
        self._play(self.controller.round)

    def start(self, family_id: str, level_id: str) -> None:
        self._play(self.controller.start(family_id, level_id))

    def replay(self, case, level_id: str) -> None:
        self._play(self.controller.replay(case, level_id))

    def _play(self, practice) -> None:
        self.round_view.show_round(practice, self.controller.fault_choices(), self.controller.chosen_why)
        self.pages.setCurrentWidget(self.round_view)
        self.round_view.search.setFocus()

    def back_to_pick(self) -> None:
        self.refresh()
        self.pages.setCurrentWidget(self.pick)

    # --- the round ---------------------------------------------------------------------------------

    def take(self, check_id: str) -> None:
        if self.round_view.stopped:
            return  # the colleague is still talking: carry on first
        practice = self.controller.round
        taken = practice.take(check_id)
        self.round_view.show_taken(practice, taken)
        if self.round_view.coach_box.isChecked() and not self.round_view.stopped:
            self.round_view.show_coach(practice.coach().suspects)

    def toggle_coach(self, on: bool) -> None:
        if on:
            self.round_view.show_coach(self.controller.round.coach().suspects)

    def commit(self, fault_id: str, parts: set[str]) -> None:
        try:
            self.controller.commit(fault_id, parts)
        except RoundError as err:
            self.round_view.message.setText(f"\u26a0 {err}")
            return
        self.round_view.set_busy(True, "Working out the engine's own path on this unit\u2026")
        run_in_background(self.controller.debrief_work(), self._debrief, self._failed)

    def _debrief(self, debrief) -> None:
        self.controller.finish(debrief)
        names = dict(self.controller.trainees())
        self.debrief_view.show_debrief(debrief, names.get(self.controller.trainee_id))
        self.round_view.set_busy(False)
        self.pages.setCurrentWidget(self.debrief_view)
        self._show_progress()

    def _failed(self, err: Exception) -> None:
        self.round_view.set_busy(False, f"\u26a0 The debrief could not be made: {err}")
        raise err  # a programmer's error: fail loudly after telling the trainee

    # --- progress ----------------------------------------------------------------------------------

    def _show_progress(self) -> None:
        c = self.controller
        self.progress_view.show_progress(c.progress(), c.attempts())

    def reopen(self, attempt_id: int) -> None:
        run_in_background(self.controller.reopen_work(attempt_id), self._reopened, self._reopen_failed)

    def _reopened(self, reopened) -> None:
        note = ("Opened again from the kept round." if reopened.same_readings else
                "Opened again from the kept round; the knowledge or the engine changed since, so some "
                "readings differ from those seen then.")
        self.progress_view.reopen_message.clear()
        self.debrief_view.show_debrief(reopened.played.debrief, None, note)
        self.pages.setCurrentWidget(self.debrief_view)
        self.tabs.setCurrentIndex(0)

    def _reopen_failed(self, err: Exception) -> None:
        if isinstance(err, RecordError):
            self.progress_view.reopen_message.setText(f"\u26a0 {err}")
            return
        raise err

    def unlock_owner(self) -> None:
        work = self.controller.unlock_owner(self.progress_view.passphrase.text())
        self.progress_view.owner_message.setText("Checking the passphrase\u2026")
        run_in_background(work, self.progress_view.show_trainees, self._owner_refused)

    def _owner_refused(self, err: Exception) -> None:
        if isinstance(err, OwnerRequired):
            self.progress_view.refuse_owner(str(err))
            return
        raise err
