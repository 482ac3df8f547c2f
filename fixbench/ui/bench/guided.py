"""The guided checks page: the step card on the left; on the right the supply as its stages shaded
by suspicion, the ranked suspects, and the readings so far with their marks."""

from __future__ import annotations

from PySide6.QtWidgets import (QHBoxLayout, QLabel, QListWidget, QSplitter, QVBoxLayout, QWidget)
from PySide6.QtCore import Qt

from fixbench.workflows import step_wording as wording
from fixbench.workflows.board_profiles import photo_around, step_part
from fixbench.ui.bench.board_part import MarkingDialog
from fixbench.ui.bench.check_finder import CheckFinder
from fixbench.ui.bench.look import heading
from fixbench.ui.bench.stage_picture import StagePicture
from fixbench.ui.bench.step_card import StepCard
from fixbench.ui.bench.suspects import SuspectsModel, SuspectsView


class GuidedPanel(QWidget):
    def __init__(self, controller, parent=None) -> None:
        super().__init__(parent)
        self.controller = controller
        self.card = StepCard()
        self.picture = StagePicture()
        self.suspects_model = SuspectsModel(self)
        self.suspects = SuspectsView(self.suspects_model)
        self.top_suspect = QLabel()
        self.top_suspect.setWordWrap(True)
        self.readings = QListWidget()
        self.readings.setFocusPolicy(Qt.FocusPolicy.NoFocus)

        right = QWidget()
        right_layout = QVBoxLayout(right)
        right_layout.setContentsMargins(0, 0, 0, 0)
        right_layout.addWidget(heading("Where the fault likely is", factor=1.1))
        right_layout.addWidget(self.picture, 5)
        right_layout.addWidget(self.top_suspect)
        right_layout.addWidget(self.suspects, 4)
        left = QWidget()
        left_layout = QVBoxLayout(left)
        left_layout.setContentsMargins(0, 0, 0, 0)
        left_layout.addWidget(self.card, 4)
        left_layout.addWidget(QLabel("<b>Readings so far</b> (newest first)"))
        left_layout.addWidget(self.readings, 1)
        splitter = QSplitter()
        splitter.addWidget(left)
        splitter.addWidget(right)
        splitter.setStretchFactor(0, 9)
        splitter.setStretchFactor(1, 11)
        splitter.setSizes([600, 740])
        layout = QHBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(splitter)
        self.setFocusProxy(self.card)

        self.card.reading_typed.connect(self._typed)
        self.card.skip_asked.connect(controller.skip)
        self.card.undo_asked.connect(controller.undo)
        self.card.conclude_asked.connect(controller.conclude)
        self.card.other_check_asked.connect(self.find_check)
        self.card.board.marking_asked.connect(self.ask_marking)

    def ask_marking(self) -> None:
        """"This board's part is marked ...": kept for the model, and the case recomputed for it."""
        part = self.card.board.part
        if part is None:
            return
        dialog = MarkingDialog(part, self)
        if dialog.exec() and dialog.entry is not None:
            self.controller.keep_marking(dialog.entry)
        self.window().activateWindow()  # the window's keys work again at once
        self.card.setFocus()

    def _typed(self, text: str) -> None:
        try:
            self.controller.submit_reading(text)
        except ValueError as err:  # ReadingError: mistyped; nothing is lost, the text stays
            self.card.refuse(str(err))

    def find_check(self) -> None:
        state = self.controller.view.state
        if state is None:
            return
        finder = CheckFinder(state, self)
        if finder.exec() and finder.chosen:
            self.controller.choose_check(finder.chosen)
        self.window().activateWindow()  # the window's keys (Alt+C, Ctrl+Z...) work again at once
        self.card.setFocus()

    def show_view(self, view) -> None:
        state = view.state
        if state is None:
            return
        check_id = self.controller.current_check_id()
        proposal = state.proposal_for(check_id) if view.chosen_check else state.next_check
        if proposal is None:
            self.card.show_done(state, view.conclusion)
        else:
            self.card.show_step(state, proposal)
            part, words = step_part(state, proposal.check)
            self.card.board.show_part(part, words, photo_around(view.photos, proposal.check.points))
        self.picture.show_state(state, proposal.check if proposal is not None else None)
        self.suspects_model.show_state(state)
        top = self.suspects_model.top()
        self.top_suspect.setText(
            f"Top suspect: <b>{top.title}</b> ({top.probability:.0%})" if top else "")
        self._show_readings(state)
        last = state.readings[-1] if state.readings else None
        if last is not None and "Kept" in view.notice:
            self.card.show_mark(last, self._band_of(state, last.check))
        else:
            self.card.show_mark(None, "")
        self.card.setFocus()

    @staticmethod
    def _band_of(state, check_id: str) -> str:
        big, band = wording.expected_words(state.proposal_for(check_id))
        return band.replace("healthy band ", "") or big

    def _show_readings(self, state) -> None:
        self.readings.clear()
        for reading in reversed(state.readings):
            check = state.family.check(reading.check)
            mark = "\u2714" if reading.in_band else ("\u2716 out of band" if reading.value is not None
                                                    else "\u2716 not what a healthy unit gives")
            self.readings.addItem(f"{check.title}: {reading.shown()}   {mark}")
