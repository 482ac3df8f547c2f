"""Running work off the GUI thread: engine updates, queries and report rendering that may take longer
than a frame must never freeze the window.

`run_in_background(fn, on_done, on_error)` runs ``fn()`` on Qt's global thread pool and delivers its
result (or its exception) back on the GUI thread through a queued signal.

Theory of the two rules here. A Qt object must be destroyed on the thread that owns it, and
Python destroys an object on whichever thread drops its last reference, or on whichever thread
happens to trigger the cyclic garbage collector. So:
- the worker drops its references to the job (and so to whatever the job's closure holds, such as
  a controller) before it hands the result over; the GUI thread holds the last ones;
- :func:`collect_garbage_on_gui_thread` turns Python's automatic cyclic collection off and runs it
  from a GUI-thread timer instead, so a cycle holding a widget is never collected on a worker
  [the approach pyqtgraph documents for its GarbageCollector utility, for the same reason].
"""

from __future__ import annotations

import gc
from typing import Callable

from PySide6.QtCore import QCoreApplication, QObject, QRunnable, QThreadPool, QTimer, Signal

GC_INTERVAL_MS = 1000


class _Relay(QObject):
    """Lives on the GUI thread; carries the result back and calls the caller's callback there."""

    done = Signal()
    failed = Signal()

    def __init__(self, fn: Callable[[], object], on_done: Callable[[object], None],
                 on_error: Callable[[Exception], None]) -> None:
        # Parented to the application: its C++ side is deleted by deleteLater on the GUI thread,
        # never by a worker dropping the last Python reference.
        super().__init__(QCoreApplication.instance())
        self.fn, self._on_done, self._on_error = fn, on_done, on_error
        self.outcome: object = None  # the result or the exception, handed over by the worker
        self.done.connect(self._deliver_done)
        self.failed.connect(self._deliver_error)

    def _release(self) -> tuple[Callable, Callable, object]:
        held = (self._on_done, self._on_error, self.outcome)
        self.fn = self._on_done = self._on_error = self.outcome = None  # dropped on the GUI thread
        _live_relays.discard(self)
        self.deleteLater()
        return held

    def _deliver_done(self) -> None:
        on_done, _, result = self._release()
        on_done(result)

    def _deliver_error(self) -> None:
        _, on_error, err = self._release()
        on_error(err)


class _Job(QRunnable):
    def __init__(self, relay: _Relay) -> None:
        super().__init__()
        self.relay = relay

    def run(self) -> None:  # worker thread
        relay, fn = self.relay, self.relay.fn
        self.relay = None
        failed = False
        try:
            outcome = fn()
        except Exception as err:  # handed to the GUI thread, which shows it; never swallowed
            outcome, failed = err, True
        # Hand everything to the relay and drop this thread's references before signalling, so
        # the GUI thread drops the last ones (the job's closure may hold widgets or controllers).
        relay.outcome = outcome
        del fn, outcome
        (relay.failed if failed else relay.done).emit()


_live_relays: set[_Relay] = set()


def run_in_background(fn: Callable[[], object], on_done: Callable[[object], None],
                      on_error: Callable[[Exception], None]) -> None:
    relay = _Relay(fn, on_done, on_error)
    _live_relays.add(relay)  # keep it alive until it has delivered
    QThreadPool.globalInstance().start(_Job(relay))


_collector: QTimer | None = None


def collect_garbage_on_gui_thread(parent: QObject) -> QTimer:
    """Disable automatic cyclic garbage collection and collect from a timer on the GUI thread."""
    global _collector
    if _collector is None:
        gc.disable()
        _collector = QTimer(parent)
        _collector.setInterval(GC_INTERVAL_MS)
        _collector.timeout.connect(_collect)
        _collector.start()
    return _collector


def _collect() -> None:
    # Collect only the generations whose thresholds were passed, as the automatic collector would.
    thresholds, counts = gc.get_threshold(), gc.get_count()
    for generation in (2, 1, 0):
        if counts[generation] > thresholds[generation]:
            gc.collect(generation)
            return
