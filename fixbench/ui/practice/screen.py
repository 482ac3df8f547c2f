"""The practice screen: pick a round, play it, read the debrief; progress beside it.

Widgets render and forward; :class:`fixbench.workflows.practice.PracticeRounds` talks to the
practice package and the store. The
engine's own path for the debrief runs off the GUI thread.
"""

from __future__ import annotations

from PySide6.QtWidgets import QStackedWidget, QTabWidget, QVBoxLayout, QWidget

from fixbench.practice.round import RoundError
from fixbench.store.errors import OwnerRequired
from fixbench.ui.context import AppContext
from fixbench.ui.practice.debrief_view import DebriefView
from fixbench.ui.practice.pick_view import PickView
from fixbench.ui.practice.progress_view import ProgressView
from fixbench.ui.practice.round_view import RoundView
from fixbench.ui.workers import run_in_background
from fixbench.workflows.practice import PracticeRounds


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
        self.progress_view = ProgressView({f.id: f.title for f in context.knowledge.families.values()})
        self.tabs = QTabWidget()
        self.tabs.addTab(self.pages, "Round")
        self.tabs.addTab(self.progress_view, "Progress")
        layout = QVBoxLayout(self)
        layout.setContentsMargins(4, 4, 4, 4)
        layout.addWidget(self.tabs)

        self.pick.start_asked.connect(self.start)
        self.pick.replay_asked.connect(self.replay)
        self.pick.trainee_changed.connect(self.choose_trainee)
        self.round_view.take_asked.connect(self.take)
        self.round_view.coach_toggled.connect(self.toggle_coach)
        self.round_view.commit_asked.connect(self.commit)
        self.debrief_view.again_asked.connect(self.back_to_pick)
        self.progress_view.unlock_button.clicked.connect(self.unlock_owner)
        self.progress_view.passphrase.returnPressed.connect(self.unlock_owner)
        self._cases = []
        self.refresh()

    # --- picking -----------------------------------------------------------------------------------

    def refresh(self) -> None:
        c = self.controller
        trainees = c.trainees()
        if c.trainee_id is None and self.context.technician_id in {tid for tid, _ in trainees}:
            c.trainee_id = self.context.technician_id
        self._cases = c.past_cases()
        self.pick.fill(trainees, c.families(), c.levels(), self._cases, c.trainee_id)
        self._show_progress()

    def choose_trainee(self, trainee_id) -> None:
        self.controller.trainee_id = trainee_id
        self._show_progress()

    def start(self, family_id: str, level_id: str) -> None:
        self._play(self.controller.start(family_id, level_id))

    def replay(self, row: int, level_id: str) -> None:
        self._play(self.controller.replay(self._cases[row], level_id))

    def _play(self, practice) -> None:
        self.round_view.show_round(practice, self.controller.fault_choices())
        self.pages.setCurrentWidget(self.round_view)
        self.round_view.search.setFocus()

    def back_to_pick(self) -> None:
        self.refresh()
        self.pages.setCurrentWidget(self.pick)

    # --- the round ---------------------------------------------------------------------------------

    def take(self, check_id: str) -> None:
        practice = self.controller.round
        step = practice.take(check_id)
        self.round_view.show_step_taken(practice, step)
        if self.round_view.coach_box.isChecked():
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
        run_in_background(self.controller.engine_path_work(), self._debrief, self._failed)

    def _debrief(self, path) -> None:
        debrief = self.controller.finish(path)
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

    def unlock_owner(self) -> None:
        work = self.controller.unlock_owner(self.progress_view.passphrase.text())
        self.progress_view.owner_message.setText("Checking the passphrase\u2026")
        run_in_background(work, self.progress_view.show_trainees, self._owner_refused)

    def _owner_refused(self, err: Exception) -> None:
        if isinstance(err, OwnerRequired):
            self.progress_view.refuse_owner(str(err))
            return
        raise err
