"""`fixbench families`: the supply families the knowledge base describes."""

from __future__ import annotations

from fixbench.commands._output import print_json, print_table
from fixbench.knowledge import load_knowledge

HELP = "list the supply families fixbench knows"


def add_arguments(parser) -> None:
    parser.add_argument("--json", action="store_true", help="print a JSON list for scripts")


def run(args) -> int:
    kb = load_knowledge()
    rows = [{"id": f.id, "title": f.title, "examples": list(f.examples), "stages": len(f.stages),
             "parts": len(f.parts), "checks": len(f.checks), "faults": len(f.faults)}
            for f in kb.families.values()]
    if args.json:
        print_json(rows)
    else:
        print_table(["id", "title", "parts", "checks", "faults"],
                    [[r["id"], r["title"], r["parts"], r["checks"], r["faults"]] for r in rows])
    return 0
