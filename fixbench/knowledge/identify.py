"""Telling the supply family from the board: the intake's questions (knowledge/identify.toml), each
family's answers (its [identify] table), and which families fit what a technician saw.

Every family answers every question, with one answer or several its boards may show. A family fits
the answers given when each is among its own; when none fits, the closest are those that disagree on
the fewest answers, and each disagreement is said in the board's terms ("it has an optocoupler; you
saw none"). The catalogue must let the questions single out every family with at most
MAX_TELLING_ANSWERS answers; the loader refuses one that does not.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass
from pathlib import Path

from fixbench.knowledge import model
from fixbench.knowledge.reader import KnowledgeError, Reader, read_toml

MAX_TELLING_ANSWERS = 3


def parse_questions(path: Path) -> tuple[model.Question, ...]:
    reader = Reader(path.name, read_toml(path))
    reader.unknown_keys({"questions"})
    questions = []
    for row in reader.items("questions"):
        row.unknown_keys({"id", "text", "answers"})
        answers = []
        for item in row.items("answers"):
            item.unknown_keys({"id", "text", "board"})
            answers.append(model.Answer(item.get("id", str), item.get("text", str), item.get("board", str)))
        if len({a.id for a in answers}) != len(answers) or len(answers) < 2:
            raise row.fail("answers", "give at least two answers, each with its own id")
        questions.append(model.Question(row.get("id", str), row.get("text", str), tuple(answers)))
    if len({q.id for q in questions}) != len(questions):
        raise reader.fail("questions", "two questions share an id")
    return tuple(questions)


@dataclass(frozen=True)
class Mismatch:
    question: model.Question
    family_answers: tuple[str, ...]
    given: str

    def reason(self) -> str:
        """The disagreement in the board's terms: "it has an optocoupler; you saw none"."""
        theirs = " or ".join(self.question.answer(a).board for a in self.family_answers)
        return f"its boards have {theirs}; you saw {self.question.answer(self.given).board}"


@dataclass(frozen=True)
class Identification:
    """What the answers given say: the families that fit, and if none does, the closest ones."""

    fitting: tuple[model.Family, ...]
    closest: tuple[tuple[model.Family, tuple[Mismatch, ...]], ...]  # when nothing fits
    deciding: model.Question | None  # a question not yet answered that splits the fitting families

    @property
    def family(self) -> model.Family | None:
        return self.fitting[0] if len(self.fitting) == 1 else None

    def describe(self) -> str:
        """One short paragraph for the intake screen (empty when nothing was answered)."""
        if self.family is not None:
            return f"\u2192 That board fits: {self.family.title} (chosen above)."
        if self.fitting:
            names = "; ".join(f.title for f in self.fitting)
            ask = f" Answer this to tell them apart: {self.deciding.text}" if self.deciding else ""
            return f"{len(self.fitting)} families fit those answers: {names}.{ask}"
        if not self.closest:
            return ""
        lines = [f"{family.title}: {'; and '.join(m.reason() for m in misses)}."
                 for family, misses in self.closest]
        return "No single family fits those answers. Closest: " + " ".join(lines)


def mismatches(family: model.Family, questions: tuple[model.Question, ...],
               answers: dict[str, str]) -> tuple[Mismatch, ...]:
    return tuple(Mismatch(q, family.identify[q.id], answers[q.id]) for q in questions
                 if q.id in answers and answers[q.id] not in family.identify[q.id])


def identify(families, questions: tuple[model.Question, ...], answers: dict[str, str]) -> Identification:
    """Which of ``families`` fit ``answers`` (question id -> answer id; unanswered ones left out)."""
    if not answers:
        return Identification((), (), None)
    scored = [(family, mismatches(family, questions, answers)) for family in families]
    fitting = tuple(family for family, misses in scored if not misses)
    if fitting:
        return Identification(fitting, (), _deciding(fitting, questions, answers))
    fewest = min(len(misses) for _, misses in scored)
    return Identification((), tuple((f, m) for f, m in scored if len(m) == fewest), None)


def _deciding(fitting, questions, answers) -> model.Question | None:
    """The first unanswered question whose answers split the fitting families."""
    if len(fitting) < 2:
        return None
    for question in questions:
        if question.id not in answers and len({f.identify[question.id] for f in fitting}) > 1:
            return question
    return None


def telling_answers(family: model.Family, families, questions: tuple[model.Question, ...],
                    most: int = MAX_TELLING_ANSWERS) -> dict[str, str] | None:
    """The fewest answers (at most ``most``) that this family's boards give and no other family's
    do; None if there are none."""
    others = [f for f in families if f is not family]
    for size in range(1, most + 1):
        for chosen in itertools.combinations(questions, size):
            for picked in itertools.product(*(family.identify[q.id] for q in chosen)):
                answers = {q.id: a for q, a in zip(chosen, picked)}
                if all(mismatches(other, questions, answers) for other in others):
                    return answers
    return None


def check_catalogue(families, questions: tuple[model.Question, ...]) -> None:
    """Refuse a catalogue in which some family cannot be told from the rest in a few answers."""
    for family in families:
        if telling_answers(family, families, questions) is None:
            raise KnowledgeError(
                f"{family.source_file}: identify: no {MAX_TELLING_ANSWERS} answers to the intake's "
                f"questions single out '{family.id}' from the other families; change its answers or "
                "add a question to identify.toml that tells it apart")
