import subprocess
import sys

import pytest

from fixbench.app import NO_DISPLAY, display_available
from fixbench.cli import _command_word


def test_global_db_option_value_is_not_taken_for_the_command():
    assert _command_word(["--db", "shop.sqlite", "backup"]) == "backup"
    assert _command_word(["families", "--json"]) == "families"
    assert _command_word([]) is None


def test_no_display_gives_one_clear_line_and_no_qt_trace(monkeypatch):
    env = {"PATH": "/usr/bin:/bin", "HOME": "/tmp"}
    result = subprocess.run([sys.executable, "-m", "fixbench"], env=env, capture_output=True, text=True)
    assert result.returncode == 1
    assert result.stderr.strip() == NO_DISPLAY
    assert "qt.qpa" not in result.stderr


def test_offscreen_platform_counts_as_a_display(monkeypatch):
    monkeypatch.setenv("QT_QPA_PLATFORM", "offscreen")
    assert display_available()


def test_every_command_has_help_and_json(capsys):
    from fixbench.cli import COMMANDS, main

    for command in COMMANDS:
        with pytest.raises(SystemExit) as done:
            main([command, "--help"])
        assert done.value.code == 0
        out = capsys.readouterr().out
        assert "--json" in out and "--db" in out, command


def test_missing_desktop_libraries_are_listed_with_their_packages(monkeypatch, tmp_path):
    from fixbench import app

    plugin = tmp_path / "libqxcb.so"
    plugin.write_bytes(b"")
    monkeypatch.setattr(app, "x11_plugin", lambda: plugin)
    absent = {str(plugin), "libxcb-icccm.so.4", "libxcb-keysyms.so.1"}

    def load(name):
        if name in absent:
            raise OSError(f"{name}: cannot open shared object file: No such file or directory")

    missing = app.missing_x11_libraries(load)
    assert missing == ["libxcb-icccm.so.4", "libxcb-keysyms.so.1"]
    text = app.missing_libraries_message(missing)
    assert "sudo apt install libxcb-icccm4 libxcb-keysyms1" in text and "\n" not in text
    assert app.missing_x11_libraries(lambda name: None) == []


def test_x11_is_what_qt_starts_on_a_plain_x_desktop(monkeypatch):
    from fixbench import app

    monkeypatch.setattr(app.sys, "platform", "linux")
    for name in ("QT_QPA_PLATFORM", "WAYLAND_DISPLAY", "XDG_SESSION_TYPE"):
        monkeypatch.delenv(name, raising=False)
    monkeypatch.setenv("DISPLAY", ":0")
    assert app.uses_x11()
    monkeypatch.setenv("WAYLAND_DISPLAY", "wayland-0")
    monkeypatch.setenv("XDG_SESSION_TYPE", "wayland")
    assert not app.uses_x11()
    monkeypatch.setenv("QT_QPA_PLATFORM", "xcb")
    assert app.uses_x11()
    monkeypatch.setenv("QT_QPA_PLATFORM", "offscreen")
    assert not app.uses_x11()


def test_a_display_without_the_x11_libraries_is_one_clear_line_not_an_abort():
    # With DISPLAY set and libxcb-icccm4 missing, Qt printed "xcb-cursor0 or libxcb-cursor0 is
    # needed" (it was installed) and aborted with status 134.
    from fixbench import app

    if app.x11_plugin() is None or not app.missing_x11_libraries():
        pytest.skip("this machine has every library Qt's X11 platform needs")
    env = {"PATH": "/usr/bin:/bin", "HOME": "/tmp", "DISPLAY": ":99"}
    result = subprocess.run([sys.executable, "-m", "fixbench"], env=env, capture_output=True, text=True,
                            timeout=60)
    assert result.returncode == 1
    assert result.stderr.startswith("fixbench: the window cannot open: Qt's X11 platform needs")
    assert len(result.stderr.strip().splitlines()) == 1 and "qt.qpa" not in result.stderr
