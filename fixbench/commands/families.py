"""`fixbench families`: the supply families the knowledge base describes, or one family's faults."""

from __future__ import annotations

from fixbench.commands._output import print_json, print_table
from fixbench.commands._unit import family_named
from fixbench.engine.hypotheses import NO_FAULT
from fixbench.knowledge import load_knowledge

HELP = "list the supply families fixbench knows, or with --faults FAMILY the faults of one"


def add_arguments(parser) -> None:
    parser.add_argument("--faults", metavar="FAMILY",
                        help="list the fault ids of this family (what `simulate --fault` takes)")
    parser.add_argument("--json", action="store_true", help="print a JSON list for scripts")


def run(args) -> int:
    if args.faults is not None:
        return _faults(family_named(args.faults), args.json)
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


def _faults(family, as_json: bool) -> int:
    rows = [{"id": f.id, "title": f.title, "part": f.part, "stage": family.part(f.part).stage}
            for f in family.faults]
    if as_json:
        print_json(rows)
        return 0
    print_table(["fault", "title", "part", "stage"],
                [[r["id"], r["title"], r["part"], r["stage"]] for r in rows])
    print(f"\n`fixbench simulate --family {family.id} --fault ID` also takes {NO_FAULT}")
    return 0
