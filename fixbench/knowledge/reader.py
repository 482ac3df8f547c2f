"""Reading typed values out of the knowledge TOML files, naming the file and the key in every
complaint ("pwm_flyback.toml: links[3].to: unknown stage 'bulkk'"), never a bare traceback."""

from __future__ import annotations

import tomllib
from pathlib import Path

from fixbench.quantities import ReadingError, parse_quantity


class KnowledgeError(ValueError):
    """A knowledge file is missing, unreadable or inconsistent."""


class Reader:
    """Reads typed values out of one TOML table of one file."""

    def __init__(self, file_name: str, table: dict, where: str = "") -> None:
        self.file_name, self.table, self.where = file_name, table, where

    def place(self, key: str) -> str:
        return f"{self.where}.{key}" if self.where else key

    def fail(self, key: str, message: str) -> KnowledgeError:
        return KnowledgeError(f"{self.file_name}: {self.place(key)}: {message}")

    def get(self, key: str, kind: type | tuple, default: object = ..., choices: tuple = ()) -> object:
        if key not in self.table:
            if default is ...:
                raise self.fail(key, "missing")
            return default
        value = self.table[key]
        if kind is float and isinstance(value, int) and not isinstance(value, bool):
            value = float(value)
        if not isinstance(value, kind):
            name = kind.__name__ if isinstance(kind, type) else "/".join(k.__name__ for k in kind)
            raise self.fail(key, f"expected {name}, got {type(value).__name__} {value!r}")
        if choices and value not in choices:
            raise self.fail(key, f"'{value}' is not one of: {', '.join(choices)}")
        return value

    def strings(self, key: str, default: object = ...) -> tuple[str, ...]:
        """A list of strings (``default`` when the key is absent and a default is given)."""
        values = self.get(key, list, default)
        if values is default:
            return default
        for i, value in enumerate(values):
            if not isinstance(value, str):
                raise self.fail(f"{key}[{i}]", f"expected str, got {type(value).__name__} {value!r}")
        return tuple(values)

    def items(self, key: str, required: bool = True) -> list[Reader]:
        """The tables of an array of tables ([[key]] or key = [{...}, ...])."""
        rows = self.table.get(key)
        if rows is None:
            if required:
                raise self.fail(key, "missing")
            return []
        if not isinstance(rows, list) or not all(isinstance(r, dict) for r in rows):
            raise self.fail(key, "expected an array of tables ([[...]])")
        return [Reader(self.file_name, row, f"{self.place(key)}[{i}]") for i, row in enumerate(rows)]

    def table_at(self, key: str) -> Reader:
        """The sub-table ``key`` (empty when absent)."""
        table = self.get(key, dict, {})
        return Reader(self.file_name, table, self.place(key))

    def unknown_keys(self, allowed: set[str]) -> None:
        extra = set(self.table) - allowed
        if extra:
            raise self.fail(min(extra), "unknown key")


def read_toml(path: Path, name: str | None = None) -> dict:
    """The file's tables; ``name`` is how messages call the file (its name by default)."""
    name = name or path.name
    try:
        with path.open("rb") as handle:
            return tomllib.load(handle)
    except FileNotFoundError:
        raise KnowledgeError(f"{name}: file not found") from None
    except tomllib.TOMLDecodeError as err:
        raise KnowledgeError(f"{name}: not valid TOML: {err}") from None


def check_value_text(reader: Reader, key: str, unit: str) -> str | None:
    """A part value as written ("22 uF", "rule:NAME"), refused without its unit or in the wrong one."""
    text = reader.get(key, str, None)
    if text is None or text.startswith("rule:"):
        return text
    try:
        parse_quantity(text, unit)  # the right kind of unit, if one is typed
        typed = parse_quantity(text, None)  # was one typed at all?
    except ReadingError as err:
        raise reader.fail(key, f"{err}") from None
    if typed.unit is None:
        raise reader.fail(key, f"'{text}' has no unit (write it with its unit, e.g. '{text} {unit}')")
    return text
