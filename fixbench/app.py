"""Opening the window: checks there is a display to open it on before Qt is loaded, so a machine
with no desktop gets one clear line instead of a Qt plugin trace."""

from __future__ import annotations

import os
import sys

NO_DISPLAY = ("fixbench: no display to open the window on. The command line works without one: "
              "run `fixbench --help` (families, expect, diagnose, simulate, ...).")


def display_available() -> bool:
    if os.environ.get("QT_QPA_PLATFORM", "").split(":")[0] in ("offscreen", "minimal", "vnc", "eglfs", "linuxfb"):
        return True
    if sys.platform.startswith("linux") or "bsd" in sys.platform:
        return bool(os.environ.get("DISPLAY") or os.environ.get("WAYLAND_DISPLAY"))
    return True  # Windows and macOS always have a window system


def open_window(db: str | None = None) -> int:
    if not display_available():
        print(NO_DISPLAY, file=sys.stderr)
        return 1
    from fixbench.ui.main_window import run_app

    return run_app(db)
