"""Where the knowledge files are: beside the package in a source checkout, inside it in a wheel."""

from __future__ import annotations

from pathlib import Path

PACKAGE_DIR = Path(__file__).resolve().parent.parent


def knowledge_dir() -> Path:
    """The folder holding shared_checks.toml and families/*.toml."""
    for candidate in (PACKAGE_DIR / "knowledge_files", PACKAGE_DIR.parent / "knowledge"):
        if (candidate / "families").is_dir():
            return candidate
    raise FileNotFoundError("fixbench's knowledge files are missing: reinstall fixbench")
