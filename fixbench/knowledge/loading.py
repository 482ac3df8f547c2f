"""Read a family file into a validated :class:`model.Family`: its stages composed from the stage
files (:mod:`composition`), its links, its design figures (:mod:`design`), its answers to the
intake's questions, and the checks every family shares.

A broken or inconsistent file fails with a :class:`KnowledgeError` whose message names the file and
the key ("pwm_flyback.toml: links[3].to: unknown stage 'bulkk'"); an item that came from a stage
file is named by that file and key, with the family file and stage entry that used it.
"""

from __future__ import annotations

from pathlib import Path

from fixbench.knowledge import model
from fixbench.knowledge.composition import Composition, apply_check_order, compose
from fixbench.knowledge.design import parse_design
from fixbench.knowledge.reader import KnowledgeError, Reader, read_toml
from fixbench.knowledge.stages import StageTemplate
from fixbench.knowledge.validation import validate_family

FAMILY_KEYS = {"id", "title", "summary", "examples", "identify", "design", "stages", "links", "check_order"}


def parse_identify(reader: Reader, questions: tuple[model.Question, ...]) -> dict[str, tuple[str, ...]]:
    """The family's answer (or answers) to each intake question about the board."""
    table = reader.table_at("identify")
    known = {q.id: q for q in questions}
    for key in table.table:
        if key not in known:
            raise table.fail(key, f"no intake question '{key}' (identify.toml asks: {', '.join(known)})")
    answers = {}
    for question in questions:
        if question.id not in table.table:
            raise table.fail(question.id, "missing: every family answers every intake question")
        given = table.table[question.id]
        given = table.strings(question.id) if isinstance(given, list) else (table.get(question.id, str),)
        allowed = [a.id for a in question.answers]
        for answer in given:
            if answer not in allowed:
                raise table.fail(question.id, f"'{answer}' is not an answer to it (use {', '.join(allowed)})")
        if not given:
            raise table.fail(question.id, "give at least one answer")
        answers[question.id] = given
    return answers


def _failing(family_file: str, family_id: str, origins: dict[str, tuple[str, str]]):
    """The ``fail(key, message)`` the validator uses: an item from a stage file is named there."""

    def fail(key: str, message: str) -> KnowledgeError:
        head, dot, rest = key.partition(".")
        if head in origins:
            where, context = origins[head]
            return KnowledgeError(f"{where}{dot}{rest}: {message} (in family '{family_id}', {context})")
        return KnowledgeError(f"{family_file}: {key}: {message}")

    return fail


def parse_family(path: Path, shared_checks: list[model.Check], templates: dict[str, StageTemplate],
                 questions: tuple[model.Question, ...]) -> model.Family:
    reader = Reader(path.name, read_toml(path))
    reader.unknown_keys(FAMILY_KEYS)
    family_id = reader.get("id", str)
    made: Composition = compose(reader, templates)
    links = []
    for row in reader.items("links"):
        row.unknown_keys({"from", "to", "kind"})
        links.append(model.Link(row.get("from", str), row.get("to", str),
                                row.get("kind", str, choices=model.LINK_KINDS)))
    apply_check_order(reader, made.checks, made.origins)
    for i in range(len(shared_checks)):
        made.origins[f"checks[{len(made.checks) + i}]"] = (f"shared_checks.toml: checks[{i}]", path.name)
    family = model.Family(
        id=family_id, title=reader.get("title", str), summary=reader.get("summary", str),
        examples=reader.strings("examples", ()), identify=parse_identify(reader, questions),
        design=parse_design(reader.table_at("design"), made.facts, made.fact_sources),
        stages=tuple(made.stages), links=tuple(links), parts=tuple(made.parts),
        test_points=tuple(made.test_points), checks=tuple(made.checks + shared_checks),
        faults=tuple(made.faults), source_file=path.name,
    )
    validate_family(family, _failing(path.name, family_id, made.origins))
    return family
