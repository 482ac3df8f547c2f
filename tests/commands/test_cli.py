import subprocess
import sys

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


def test_every_command_has_help():
    for command in ("families", "expect", "diagnose", "simulate", "benchmark"):
        result = subprocess.run([sys.executable, "-m", "fixbench", command, "--help"], capture_output=True, text=True)
        assert result.returncode == 0 and "--json" in result.stdout, command
