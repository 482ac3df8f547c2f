"""`fixbench cases`: the shop's case tickets, newest first, to pick one for `export --case`."""

from __future__ import annotations

from fixbench.commands._output import print_json, print_table
from fixbench.commands.usage import UsageError

HELP = "list the shop's cases by ticket, newest first (--open for those still at the bench)"


def add_arguments(parser) -> None:
    parser.add_argument("--open", action="store_true", help="only cases not yet closed")
    parser.add_argument("--search", default="", metavar="TEXT",
                        help="only cases whose ticket, notes, fault or device name hold every word")
    parser.add_argument("--limit", type=int, default=50, help="how many to list (default 50)")
    parser.add_argument("--json", action="store_true", help="print a JSON list for scripts")


def run(args) -> int:
    from fixbench.store.case_filters import CaseFilter, filtered_page
    from fixbench.store.case_list import open_cases
    from fixbench.store.database import open_store
    from fixbench.store.errors import StoreError

    if args.limit < 1:
        raise UsageError("--limit must be at least 1")
    if args.open and args.search.strip():
        raise UsageError("--open lists every open case; leave out --search")
    try:
        store = open_store(args.db, create=False)
        try:
            if args.open:
                rows = [{"ticket": c.ticket, "opened": c.opened_at.isoformat(timespec="minutes"),
                         "status": c.status, "family": c.family_id, "device": f"{c.make} {c.model}",
                         "technician": c.technician} for c in open_cases(store, limit=args.limit)]
            else:
                page = filtered_page(store, CaseFilter(text=args.search), limit=args.limit)
                rows = [{"ticket": c.ticket, "opened": c.opened.isoformat(timespec="minutes"),
                         "status": c.outcome or c.status, "family": c.family,
                         "device": f"{c.make} {c.model}", "technician": c.technician} for c in page]
        finally:
            store.close()
    except StoreError as err:
        raise UsageError(str(err)) from err
    if args.json:
        print_json(rows)
    elif rows:
        print_table(["ticket", "opened", "status", "family", "device", "technician"],
                    [[r[k] for k in ("ticket", "opened", "status", "family", "device", "technician")]
                     for r in rows])
    else:
        print("no cases")
    return 0
