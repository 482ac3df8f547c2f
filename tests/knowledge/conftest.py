"""A copy of the knowledge folder for the tests that break one file at a time, holding the shared
files, every stage file and the family files a test asks for."""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from fixbench.knowledge import KnowledgeBase, load_knowledge_from
from fixbench.knowledge.locate import knowledge_dir


class KnowledgeCopy:
    def __init__(self, root: Path, families: tuple[str, ...]) -> None:
        source = knowledge_dir()
        self.root = root
        (root / "families").mkdir(parents=True)
        for name in ("identify.toml", "shared_checks.toml"):
            shutil.copy(source / name, root / name)
        shutil.copytree(source / "stages", root / "stages")
        for family in families:
            shutil.copy(source / "families" / f"{family}.toml", root / "families" / f"{family}.toml")

    def text(self, relative: str) -> str:
        return (self.root / relative).read_text(encoding="utf-8")

    def write(self, relative: str, text: str) -> None:
        (self.root / relative).write_text(text, encoding="utf-8")

    def replace(self, relative: str, old: str, new: str) -> None:
        text = self.text(relative)
        assert text.count(old) == 1, f"{relative} no longer holds exactly one {old!r}"
        self.write(relative, text.replace(old, new))

    def append(self, relative: str, text: str) -> None:
        self.write(relative, self.text(relative) + text)

    def load(self) -> KnowledgeBase:
        return load_knowledge_from(self.root)


@pytest.fixture
def knowledge_copy(tmp_path):
    """``knowledge_copy("self_oscillating", ...)``: a loadable copy holding those families."""
    count = iter(range(100))

    def make(*families: str) -> KnowledgeCopy:
        return KnowledgeCopy(tmp_path / f"knowledge{next(count)}", families)

    return make
