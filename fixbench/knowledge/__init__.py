"""The knowledge base: supply families composed from shared stage files, their parts, test points,
checks, faults and design figures, and the intake's questions that tell the families apart, read
from validated TOML files under knowledge/."""

from __future__ import annotations

from functools import lru_cache
from pathlib import Path

from fixbench.knowledge.design import Design
from fixbench.knowledge.identify import check_catalogue, parse_questions
from fixbench.knowledge.loading import parse_family
from fixbench.knowledge.locate import knowledge_dir
from fixbench.knowledge.model import (
    Check,
    Family,
    Fault,
    KnowledgeBase,
    Part,
    Question,
    Stage,
    TestPoint,
)
from fixbench.knowledge.reader import KnowledgeError, Reader, read_toml
from fixbench.knowledge.stages import parse_checks, parse_stages

__all__ = ["Check", "Design", "Family", "Fault", "KnowledgeBase", "KnowledgeError", "Part", "Question",
           "Stage", "TestPoint", "load_knowledge", "load_knowledge_from"]


def load_knowledge_from(folder: Path) -> KnowledgeBase:
    """Read and validate the intake questions, the shared checks, every stage file in
    ``folder``/stages and every family file in ``folder``/families."""
    questions = parse_questions(folder / "identify.toml")
    shared_path = folder / "shared_checks.toml"
    shared = parse_checks(Reader(shared_path.name, read_toml(shared_path)))
    templates = parse_stages(folder / "stages")
    files = sorted((folder / "families").glob("*.toml"))
    if not files:
        raise KnowledgeError(f"{folder.name}/families: no family files")
    families = {}
    for path in files:
        family = parse_family(path, shared, templates, questions)
        if family.id in families:
            raise KnowledgeError(f"{path.name}: id: family '{family.id}' is defined twice")
        families[family.id] = family
    check_catalogue(list(families.values()), questions)
    return KnowledgeBase(families, questions)


@lru_cache(maxsize=1)
def load_knowledge() -> KnowledgeBase:
    """The installed knowledge base (cached: the files do not change while the program runs)."""
    return load_knowledge_from(knowledge_dir())
