"""Running work off the GUI thread: engine updates, queries and report rendering that may take longer
than a frame must never freeze the window.

`run_in_background(fn, on_done, on_error)` runs ``fn()`` on Qt's global thread pool and delivers its
result (or its exception) back on the GUI thread through a queued signal.
"""

from __future__ import annotations

from typing import Callable

from PySide6.QtCore import QObject, QRunnable, QThreadPool, Signal


class _Relay(QObject):
    done = Signal(object)
    failed = Signal(object)


class _Job(QRunnable):
    def __init__(self, fn: Callable[[], object], relay: _Relay) -> None:
        super().__init__()
        self.fn, self.relay = fn, relay

    def run(self) -> None:  # worker thread
        try:
            result = self.fn()
        except Exception as err:  # handed to the GUI thread, which shows it; never swallowed
            self.relay.failed.emit(err)
            return
        self.relay.done.emit(result)


_live_relays: set[_Relay] = set()


def run_in_background(fn: Callable[[], object], on_done: Callable[[object], None],
                      on_error: Callable[[Exception], None]) -> None:
    relay = _Relay()
    _live_relays.add(relay)  # keep it alive until it has delivered

    def finish(callback, value) -> None:
        _live_relays.discard(relay)
        callback(value)

    relay.done.connect(lambda result: finish(on_done, result))
    relay.failed.connect(lambda err: finish(on_error, err))
    QThreadPool.globalInstance().start(_Job(fn, relay))
