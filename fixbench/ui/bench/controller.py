"""The bench's controller: the one object that talks to the engine and the store for the screen.

Widgets call its methods and redraw from its signals. Typed text is checked here at once (on the
GUI thread, it is a parse), so a mistake gets its message next to the field before anything is
kept; the engine update and the store write then run as one job off the GUI thread. Jobs run one
after another in the order they were asked for, so readings are kept in the order they were typed
even when a technician types faster than the disk writes.
"""

from __future__ import annotations

from collections import deque
from collections.abc import Callable
from dataclasses import dataclass
from datetime import UTC, datetime

from PySide6.QtCore import QObject, Signal

from fixbench.engine import DiagnosisState
from fixbench.engine.conclusion import Conclusion
from fixbench.engine.readings import Reading
from fixbench.ui.context import AppContext
from fixbench.ui.workers import run_in_background
from fixbench.workflows import bench, intake
from fixbench.workflows.bench import CaseInView, KeptRepair, KeptVerification
from fixbench.workflows.intake import IntakeForm, TicketInUse

PAGES = ("cases", "intake", "cautions", "guided", "repair", "verify", "close")


@dataclass
class BenchView:
    """What the screen shows about the open case, replaced as a whole after every job."""

    case: CaseInView | None = None
    state: DiagnosisState | None = None
    chosen_check: str | None = None  # a check picked off the list instead of the proposal
    conclusion: Conclusion | None = None
    repairs: tuple[KeptRepair, ...] = ()
    verifications: tuple[KeptVerification, ...] = ()
    last_verification: Reading | None = None  # the newest verification, read against its band
    notice: str = ""  # one line on what just happened ("reading kept", "undone: ...")
    photos: tuple = ()  # photos of the model's board with their marked test points


class BenchController(QObject):
    view_changed = Signal(object)  # BenchView
    page_wanted = Signal(str)
    cases_changed = Signal()
    failed = Signal(str)  # a message for the person: the store refused, the disk is full...
    ticket_refused = Signal(str)  # intake's ticket is already a case's: shown beside the field
    ratings_to_correct = Signal(object)  # bench.RatingsToCorrect: a kept case to put right first
    busy_changed = Signal(bool)

    def __init__(self, context: AppContext, parent: QObject | None = None) -> None:
        super().__init__(parent)
        self.context = context
        self.view = BenchView()
        self._jobs: deque[tuple[Callable[[], object], Callable[[object], None]]] = deque()
        self._running = False

    # --- job queue ---------------------------------------------------------------------------------

    def _queue(self, work: Callable[[], object], done: Callable[[object], None]) -> None:
        self._jobs.append((work, done))
        if not self._running:
            self._next()

    def _next(self) -> None:
        if not self._jobs:
            self._running = False
            self.busy_changed.emit(False)
            return
        self._running = True
        self.busy_changed.emit(True)
        work, done = self._jobs.popleft()

        def finished(result: object) -> None:
            try:
                done(result)
            finally:
                self._next()

        def failed(err: Exception) -> None:
            if isinstance(err, TicketInUse):
                self.ticket_refused.emit(str(err))
            elif isinstance(err, bench.RatingsToCorrect):
                self.failed.emit(bench.person_message(err))
                self.ratings_to_correct.emit(err)
            else:
                self.failed.emit(bench.person_message(err))
            self._next()

        run_in_background(work, finished, failed)

    @property
    def busy(self) -> bool:
        return self._running

    def _show(self, **changes) -> None:
        for key, value in changes.items():
            setattr(self.view, key, value)
        self.view_changed.emit(self.view)

    # --- cases ---------------------------------------------------------------------------------

    def new_case(self) -> None:
        self.view = BenchView()
        self.page_wanted.emit("intake")

    def back_to_cases(self) -> None:
        self.view = BenchView()
        self.cases_changed.emit()
        self.page_wanted.emit("cases")

    def open_case(self, form: IntakeForm) -> None:
        """Keep a checked intake form as a new case, its symptoms as the first readings."""
        store, knowledge, technician = self.context.store, self.context.knowledge, self.context.technician_id
        self._queue(lambda: intake.open_new_case(store, knowledge, technician, form), self._loaded)

    def resume(self, case_id: int) -> None:
        store, knowledge = self.context.store, self.context.knowledge
        self._queue(lambda: bench.resume_case(store, knowledge, case_id), self._loaded)

    def correct_ratings(self, case_id: int, ratings: dict[str, str]) -> None:
        store, knowledge = self.context.store, self.context.knowledge
        self._queue(lambda: bench.correct_ratings(store, knowledge, case_id, ratings), self._loaded)

    def _loaded(self, loaded: bench.Loaded) -> None:
        self.view = BenchView(case=loaded.case, state=loaded.state, repairs=loaded.repairs,
                              verifications=loaded.verifications, notice=loaded.notice,
                              photos=loaded.photos)
        self.cases_changed.emit()
        self.view.conclusion = loaded.state.conclusion
        if loaded.case.status in ("repairing", "verifying") and self.view.conclusion is None:
            self.view.conclusion = loaded.state.final_conclusion()
        self.view_changed.emit(self.view)
        self.page_wanted.emit(bench.page_for(loaded))

    # --- cautions ------------------------------------------------------------------------------

    def acknowledge_cautions(self) -> None:
        case, store, technician = self.view.case, self.context.store, self.context.technician_id
        self._queue(lambda: bench.acknowledge(store, case, technician), self._acknowledged)

    def _acknowledged(self, case: CaseInView) -> None:
        self._show(case=case, notice="Cautions acknowledged for this case.")
        self.page_wanted.emit("guided")

    # --- guided checks -------------------------------------------------------------------------

    def current_check_id(self) -> str | None:
        state = self.view.state
        if state is None:
            return None
        if self.view.chosen_check:
            return self.view.chosen_check
        return state.next_check.check.id if state.next_check is not None else None

    def choose_check(self, check_id: str) -> None:
        self._show(chosen_check=check_id, notice="")

    def submit_reading(self, text: str) -> None:
        """Check ``text`` now (ReadingError goes back to the field), then keep it off the GUI thread."""
        check_id = self.current_check_id()
        if check_id is None or self.view.state is None:
            raise ValueError("there is no step to answer: the checks are done")
        new_state = self.view.state.with_reading(check_id, text)  # raises ReadingError at once
        case, store = self.view.case, self.context.store
        self.view.state, self.view.chosen_check = new_state, None
        self._queue(lambda: bench.keep_reading(store, case, new_state), self._after_reading)

    def _after_reading(self, state: DiagnosisState) -> None:
        reading = state.readings[-1]
        mark = "in band" if reading.in_band else "OUT OF BAND"
        read_as = (f" The bare number {reading.text} was read in {reading.read_as}, as this step shows it."
                   if reading.read_as else "")
        self._show(state=state, notice=f"Kept: {reading.shown()} ({mark}).{read_as}",
                   conclusion=state.conclusion)

    def keep_marking(self, entry) -> None:
        """Keep what this board's part is marked with (for every unit of the model) and recompute."""
        case, store, knowledge = self.view.case, self.context.store, self.context.knowledge
        chosen = self.view.chosen_check
        self._queue(lambda: bench.keep_board_marking(store, knowledge, case.id, entry),
                    lambda loaded: (self._loaded(loaded), chosen and self._show(chosen_check=chosen)))

    def skip(self) -> None:
        check_id = self.current_check_id()
        if check_id is None:
            return
        new_state = self.view.state.skip(check_id)
        case, store = self.view.case, self.context.store
        self.view.state, self.view.chosen_check = new_state, None
        self._queue(lambda: bench.keep_skip(store, case, new_state, check_id),
                    lambda state: self._show(state=state, conclusion=state.conclusion,
                                             notice="Skipped: cannot measure."))

    def undo(self) -> None:
        state = self.view.state
        if state is None or not state.readings:
            self._show(notice="No reading to undo.")
            return
        taken_back = state.readings[-1]
        new_state = state.undo()
        case, store = self.view.case, self.context.store
        self.view.state, self.view.chosen_check = new_state, None
        self._queue(lambda: bench.keep_undo(store, case, new_state),
                    lambda s: self._show(state=s, conclusion=s.conclusion,
                                         notice=f"Undone: {taken_back.shown()} taken back."))

    # --- repair, verification, close -------------------------------------------------------------

    def conclude(self) -> None:
        state = self.view.state
        conclusion = state.conclusion or state.final_conclusion()
        self._show(conclusion=conclusion, notice="")
        self.page_wanted.emit("repair")

    def back_to_checks(self) -> None:
        self.page_wanted.emit("guided")

    def record_repair(self, part_id: str, action: str, value_text: str, test_passed: bool | None,
                      cost_cents: int) -> None:
        case, store = self.view.case, self.context.store
        name = self.view.state.family.part(part_id).label if self.view.state is not None else part_id
        kept = action if test_passed is None else (
            f"{action}, {'passed' if test_passed else 'failed'}")
        self._queue(lambda: bench.keep_repair(store, case, part_id, action, value_text,
                                                test_passed, cost_cents),
                    lambda repairs: self._show(repairs=repairs, notice=f"Kept: {name} {kept}."))

    def go_verify(self) -> None:
        self.page_wanted.emit("verify")

    def submit_verification(self, check_id: str, text: str) -> None:
        reading = bench.verification_reading(self.view.state, check_id, text)  # raises at once
        case, store = self.view.case, self.context.store
        self._queue(lambda: bench.keep_verification(store, case, reading),
                    lambda rows: self._show(verifications=rows, last_verification=reading,
                                            notice=""))

    def go_close(self) -> None:
        self.page_wanted.emit("close")

    def close_case(self, outcome: str, minutes: int, fault_id: str | None,
                   price_cents: int | None = None) -> None:
        case, store, state = self.view.case, self.context.store, self.view.state
        self._queue(lambda: bench.keep_close(store, case, state, outcome, minutes, fault_id,
                                             price_cents),
                    lambda _none: self.back_to_cases())

    def minutes_so_far(self) -> int:
        case = self.view.case
        if case is None:
            return 0
        now = datetime.now(UTC).replace(tzinfo=None)
        return max(1, round((now - case.opened_at).total_seconds() / 60))
