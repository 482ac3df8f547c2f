"""The knowledge base: supply families, their parts, test points, checks and faults, read from
validated TOML files. Adding a family is adding a file under knowledge/families/."""

from __future__ import annotations

from functools import lru_cache
from pathlib import Path

from fixbench.knowledge.loading import KnowledgeError, _Reader, parse_checks, parse_family, read_toml
from fixbench.knowledge.locate import knowledge_dir
from fixbench.knowledge.model import Check, Family, Fault, KnowledgeBase, Part, Stage, TestPoint

__all__ = ["Check", "Family", "Fault", "KnowledgeBase", "KnowledgeError", "Part", "Stage", "TestPoint",
           "load_knowledge", "load_knowledge_from"]


def load_knowledge_from(folder: Path) -> KnowledgeBase:
    """Read and validate every family file in ``folder``/families with the shared checks."""
    shared_path = folder / "shared_checks.toml"
    shared = parse_checks(_Reader(shared_path.name, read_toml(shared_path)))
    files = sorted((folder / "families").glob("*.toml"))
    if not files:
        raise KnowledgeError(f"{folder.name}/families: no family files")
    families = {}
    for path in files:
        family = parse_family(path, shared)
        if family.id in families:
            raise KnowledgeError(f"{path.name}: id: family '{family.id}' is defined twice")
        families[family.id] = family
    return KnowledgeBase(families)


@lru_cache(maxsize=1)
def load_knowledge() -> KnowledgeBase:
    """The installed knowledge base (cached: the files do not change while the program runs)."""
    return load_knowledge_from(knowledge_dir())
