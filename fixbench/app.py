"""Opening the window: checks there is a display to open it on, and that Qt's X11 platform can load,
before Qt is loaded, so a machine with no desktop (or without the desktop libraries Qt needs) gets
one clear line instead of a Qt plugin trace and an abort.

With a display but a missing X11 library, Qt aborts with "xcb-cursor0 or libxcb-cursor0 is needed",
whichever library is missing. So the X11 platform plugin shipped with PySide6 is loaded here first
(the same file Qt loads next); if the dynamic loader refuses it, each library it needs is tried by
name and the missing ones are listed with their Debian/Ubuntu packages (README: "Desktop libraries").
"""

from __future__ import annotations

import ctypes
import importlib.util
import os
import sys
from pathlib import Path

NO_DISPLAY = ("fixbench: no display to open the window on. The command line works without one: "
              "run `fixbench --help` (families, expect, diagnose, simulate, ...).")

# What Qt's X11 platform links against beyond a basic desktop, by library file and the Debian/Ubuntu
# package that installs it [src: Qt 6 documentation, "Qt for X11 Requirements"; the names checked
# with ldd on PySide6 6.12's libqxcb.so and libQt6XcbQpa.so.6].
X11_LIBRARIES = {
    "libxcb.so.1": "libxcb1", "libX11-xcb.so.1": "libx11-xcb1", "libX11.so.6": "libx11-6",
    "libxcb-cursor.so.0": "libxcb-cursor0", "libxcb-icccm.so.4": "libxcb-icccm4",
    "libxcb-image.so.0": "libxcb-image0", "libxcb-keysyms.so.1": "libxcb-keysyms1",
    "libxcb-randr.so.0": "libxcb-randr0", "libxcb-render.so.0": "libxcb-render0",
    "libxcb-render-util.so.0": "libxcb-render-util0", "libxcb-shape.so.0": "libxcb-shape0",
    "libxcb-shm.so.0": "libxcb-shm0", "libxcb-sync.so.1": "libxcb-sync1",
    "libxcb-util.so.1": "libxcb-util1", "libxcb-xfixes.so.0": "libxcb-xfixes0",
    "libxcb-xkb.so.1": "libxcb-xkb1", "libxkbcommon.so.0": "libxkbcommon0",
    "libxkbcommon-x11.so.0": "libxkbcommon-x11-0", "libfontconfig.so.1": "libfontconfig1",
    "libfreetype.so.6": "libfreetype6", "libEGL.so.1": "libegl1", "libGL.so.1": "libgl1",
    "libdbus-1.so.3": "libdbus-1-3", "libglib-2.0.so.0": "libglib2.0-0",
}


def display_available() -> bool:
    if os.environ.get("QT_QPA_PLATFORM", "").split(":")[0] in ("offscreen", "minimal", "vnc", "eglfs", "linuxfb"):
        return True
    if sys.platform.startswith("linux") or "bsd" in sys.platform:
        return bool(os.environ.get("DISPLAY") or os.environ.get("WAYLAND_DISPLAY"))
    return True  # Windows and macOS always have a window system


def uses_x11() -> bool:
    """Whether Qt will start on its X11 (xcb) platform: asked for, or the default on a Linux or BSD
    desktop that is not a Wayland session."""
    if not (sys.platform.startswith("linux") or "bsd" in sys.platform):
        return False
    asked = os.environ.get("QT_QPA_PLATFORM", "").split(":")[0]
    if asked:
        return asked == "xcb"
    wayland = os.environ.get("WAYLAND_DISPLAY") and os.environ.get("XDG_SESSION_TYPE") == "wayland"
    return bool(os.environ.get("DISPLAY")) and not wayland


def x11_plugin() -> Path | None:
    """PySide6's X11 platform plugin, found without importing PySide6."""
    spec = importlib.util.find_spec("PySide6")
    if spec is None or not spec.submodule_search_locations:
        return None
    plugin = Path(next(iter(spec.submodule_search_locations))) / "Qt" / "plugins" / "platforms" / "libqxcb.so"
    return plugin if plugin.is_file() else None


def missing_x11_libraries(load=ctypes.CDLL) -> list[str]:
    """The libraries Qt's X11 platform needs that the dynamic loader cannot find ([] when it loads)."""
    plugin = x11_plugin()
    if plugin is None:
        return []
    try:
        load(str(plugin))
        return []
    except OSError as refused:
        missing = []
        for name in X11_LIBRARIES:
            try:
                load(name)
            except OSError:
                missing.append(name)
        # A library outside the list: the loader's own words name it.
        return missing or [str(refused).split(":", 1)[0]]


def missing_libraries_message(missing: list[str]) -> str:
    packages = " ".join(X11_LIBRARIES.get(name, name) for name in missing)
    return (f"fixbench: the window cannot open: Qt's X11 platform needs {', '.join(missing)}, not "
            f"installed here (Debian/Ubuntu: sudo apt install {packages}; README lists the desktop "
            "libraries). The command line works without them: run `fixbench --help`.")


def open_window(db: str | None = None) -> int:
    if not display_available():
        print(NO_DISPLAY, file=sys.stderr)
        return 1
    if uses_x11():
        missing = missing_x11_libraries()
        if missing:
            print(missing_libraries_message(missing), file=sys.stderr)
            return 1
    from fixbench.ui.main_window import run_app

    return run_app(db)
