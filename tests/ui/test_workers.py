"""Work off the GUI thread: results and errors come back on the GUI thread, and nothing is left
behind for a worker to free."""

import gc
import threading

from fixbench.ui import workers


def test_result_and_error_come_back_on_the_gui_thread(qtbot):
    gui = threading.get_ident()
    seen = {}

    def job():
        seen["worker"] = threading.get_ident()
        return 42

    def boom():
        raise ValueError("a reading the store refused")

    workers.run_in_background(job, lambda r: seen.update(result=(r, threading.get_ident())),
                              lambda e: seen.update(error=e))
    workers.run_in_background(boom, lambda r: seen.update(bad=r),
                              lambda e: seen.update(error=(str(e), threading.get_ident())))
    qtbot.waitUntil(lambda: "result" in seen and "error" in seen, timeout=5000)
    assert seen["worker"] != gui
    assert seen["result"] == (42, gui)
    assert seen["error"] == ("a reading the store refused", gui)
    assert "bad" not in seen
    qtbot.waitUntil(lambda: not workers._live_relays, timeout=5000)


def test_automatic_garbage_collection_is_handed_to_the_gui_thread(qapp):
    timer = workers.collect_garbage_on_gui_thread(qapp)
    assert not gc.isenabled() and timer.isActive()
