"""Shared by the commands: JSON printing and plain tables, so every command looks alike."""

from __future__ import annotations

import json
import math
import sys


def _clean(value: object) -> object:
    if isinstance(value, float) and (math.isinf(value) or math.isnan(value)):
        return None
    if isinstance(value, dict):
        return {k: _clean(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_clean(v) for v in value]
    return value


def print_json(data: object) -> None:
    json.dump(_clean(data), sys.stdout, indent=2, ensure_ascii=False)
    sys.stdout.write("\n")


def print_table(headers: list[str], rows: list[list[str]]) -> None:
    widths = [max(len(str(x)) for x in [h] + [r[i] for r in rows]) for i, h in enumerate(headers)]
    line = "  ".join(h.ljust(w) for h, w in zip(headers, widths))
    print(line)
    print("  ".join("-" * w for w in widths))
    for row in rows:
        print("  ".join(str(x).ljust(w) for x, w in zip(row, widths)))
