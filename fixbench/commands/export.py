"""`fixbench export`: cases of a period as CSV (owner only), or one case as re-runnable JSON."""

from __future__ import annotations

import getpass
import sys
from datetime import date, datetime, timedelta

from fixbench.commands.usage import UsageError

HELP = "export cases of a period as CSV (owner only), or one case as JSON for `fixbench diagnose`"


def add_arguments(parser) -> None:
    parser.add_argument("--case", metavar="TICKET", help="export this one case as JSON")
    parser.add_argument("--since", type=_day, help="first day, YYYY-MM-DD (CSV)")
    parser.add_argument("--until", type=_day, help="last day, YYYY-MM-DD, included (CSV)")
    parser.add_argument("--out", help="file to write (default: standard output)")


def _day(text: str) -> date:
    try:
        return date.fromisoformat(text)
    except ValueError as err:
        raise UsageError(f"{text!r} is not a date like 2025-03-31") from err


def run(args) -> int:
    from fixbench.store.database import open_store
    from fixbench.store.errors import StoreError
    from fixbench.store.export import dump_case_json, export_cases_csv

    if args.case is None and (args.since is None or args.until is None):
        raise UsageError("give --case TICKET, or --since and --until for a CSV")
    try:
        store = open_store(args.db)
        try:
            out = open(args.out, "w", newline="", encoding="utf-8") if args.out else sys.stdout
            with out if args.out else _KeepOpen(out):
                if args.case is not None:
                    out.write(dump_case_json(store, args.case) + "\n")
                    return 0
                passphrase = getpass.getpass("Owner's passphrase: ")
                count = export_cases_csv(
                    store, out, since=datetime.combine(args.since, datetime.min.time()),
                    until=datetime.combine(args.until + timedelta(days=1), datetime.min.time()),
                    passphrase=passphrase)
        finally:
            store.close()
    except StoreError as err:
        raise UsageError(str(err)) from err
    print(f"exported {count} cases", file=sys.stderr)
    return 0


class _KeepOpen:
    """Context manager that leaves standard output open."""

    def __init__(self, stream):
        self.stream = stream

    def __enter__(self):
        return self.stream

    def __exit__(self, *exc):
        self.stream.flush()
        return False
