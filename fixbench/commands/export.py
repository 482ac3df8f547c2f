"""`fixbench export`: cases of a period as CSV or JSON (owner only), or one case as re-runnable JSON.

One case carries what the bench needs to re-run it and no customer details, and a period's cases
leave customers' names and contacts out; ``--with-customer`` adds them for the owner, with the
passphrase. Nothing is written to ``--out`` until the owner's
passphrase is accepted, and the file appears whole (written beside it, then renamed), owner-only.
"""

from __future__ import annotations

import json
import os
import sys
from datetime import date, datetime, timedelta
from pathlib import Path

from fixbench.commands._output import print_json
from fixbench.commands.usage import UsageError, near_matches

HELP = "export cases of a period as CSV (owner only), or one case as JSON for `fixbench diagnose`"


def add_arguments(parser) -> None:
    parser.add_argument("--case", metavar="TICKET", help="export this one case as JSON")
    parser.add_argument("--with-customer", action="store_true",
                        help="add who the customer is (owner only; personal data: only when the "
                             "file needs it)")
    parser.add_argument("--since", help="first day, YYYY-MM-DD (CSV)")
    parser.add_argument("--until", help="last day, YYYY-MM-DD, included (CSV)")
    parser.add_argument("--out", help="file to write (default: standard output)")
    parser.add_argument("--json", action="store_true",
                        help="the cases of a period as a JSON list instead of CSV (one case is JSON anyway)")


def _day(text: str, option: str) -> date:
    try:
        return date.fromisoformat(text.strip())
    except ValueError:
        raise UsageError(f"{option} {text!r} is not a date like 2025-03-31") from None


def run(args) -> int:
    from fixbench.commands._passphrase import ask_owner_passphrase
    from fixbench.store.database import open_store
    from fixbench.store.errors import StoreError

    if args.case is None and (args.since is None or args.until is None):
        raise UsageError("give --case TICKET, or --since and --until for a CSV")
    period = None
    if args.case is None:
        since, until = _day(args.since, "--since"), _day(args.until, "--until")
        period = (datetime.combine(since, datetime.min.time()),
                  datetime.combine(until + timedelta(days=1), datetime.min.time()))
    try:
        store = open_store(args.db, create=False)
        try:
            if args.case is not None:
                passphrase = ask_owner_passphrase("export the customer") if args.with_customer else None
                _write(args.out, _one_case(store, args.case, passphrase) + "\n")
                return 0
            count = _period(store, args, period, ask_owner_passphrase("export cases"))
        finally:
            store.close()
    except StoreError as err:
        raise UsageError(str(err)) from err
    print(f"exported {count} cases", file=sys.stderr)
    return 0


def _one_case(store, ticket: str, passphrase: str | None) -> str:
    from fixbench.store.case_list import tickets_like
    from fixbench.store.errors import CaseNotFound
    from fixbench.store.export import dump_case_json
    from fixbench.store.owner import require_owner

    if passphrase is not None:
        require_owner(store, passphrase)
    try:
        return dump_case_json(store, ticket, owner_passphrase=passphrase)
    except CaseNotFound:
        raise UsageError(f"there is no case {ticket}{near_matches(ticket, tickets_like(store, ticket))}; "
                         "`fixbench cases` lists them") from None


def _period(store, args, period, passphrase: str) -> int:
    import io

    from fixbench.store.export import export_cases_csv, export_cases_rows
    from fixbench.store.owner import require_owner

    require_owner(store, passphrase)  # before anything is written anywhere
    since, until = period
    if args.json:
        rows = export_cases_rows(store, since=since, until=until, passphrase=passphrase,
                                 with_customers=args.with_customer)
        if args.out is None:
            print_json(rows)
        else:
            _write(args.out, json.dumps(rows, ensure_ascii=False, indent=2) + "\n")
        return len(rows)
    if args.out is None:
        return export_cases_csv(store, sys.stdout, since=since, until=until, passphrase=passphrase,
                                with_customers=args.with_customer)
    buffer = io.StringIO(newline="")
    count = export_cases_csv(store, buffer, since=since, until=until, passphrase=passphrase,
                             with_customers=args.with_customer)
    _write(args.out, buffer.getvalue())
    return count


def _write(out: str | None, text: str) -> None:
    """To standard output, or into ``out`` as a whole: written beside it owner-only, then renamed
    over it, so a refusal or a failure half-way leaves the file as it was."""
    if out is None:
        sys.stdout.write(text)
        return
    target = Path(out)
    partial = target.with_name(f".{target.name}.partial")
    try:
        descriptor = os.open(partial, os.O_WRONLY | os.O_CREAT | os.O_TRUNC, 0o600)
        with open(descriptor, "w", encoding="utf-8", newline="") as handle:
            handle.write(text)
        os.replace(partial, target)
    except OSError as err:
        partial.unlink(missing_ok=True)
        raise UsageError(f"cannot write {out}: {err.strerror or err}") from None
