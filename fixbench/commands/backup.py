"""`fixbench backup`: a copy of the shop proven readable, kept beside it (rolling)."""

from __future__ import annotations

from fixbench.commands._output import print_json
from fixbench.commands.usage import UsageError

HELP = "back up the shop now (each copy proven readable; the newest kept, the newest good one always)"


def add_arguments(parser) -> None:
    parser.add_argument("--keep", type=int, default=None,
                        help="how many backups to keep (default 14); the newest good one is never pruned")
    parser.add_argument("--list", action="store_true", help="list the backups instead, oldest first")
    parser.add_argument("--accept-fewer", action="store_true",
                        help="the shop is meant to hold far fewer cases than its last good backup "
                             "(owner only): count this copy as good")
    parser.add_argument("--json", action="store_true", help="print the result as JSON")


def run(args) -> int:
    from fixbench.store.backup import KEEP_BACKUPS, backup_database, backup_server
    from fixbench.store.errors import StoreError
    from fixbench.store.location import backup_anchor, backup_kind, list_backups, resolve_url, sqlite_path

    keep = KEEP_BACKUPS if args.keep is None else args.keep
    if keep < 1:
        raise UsageError("--keep must be at least 1")
    url = resolve_url(args.db)
    path = sqlite_path(url)
    try:
        if args.list:
            return _list([(p, backup_kind(p)) for p in list_backups(backup_anchor(url))], args.json)
        if path is None:
            made = _on_server(url, keep, args.accept_fewer, backup_server)
        else:
            if args.accept_fewer:
                _owner_confirms(path)
            made = backup_database(path, keep=keep, accept_fewer=args.accept_fewer)
    except StoreError as err:
        raise UsageError(str(err)) from err
    if args.json:
        print_json({"backup": str(made.path), "cases": made.cases, "good": made.good,
                    "note": made.note(), "pruned": [str(p) for p in made.pruned]})
    else:
        print(f"backed up to {made.path} ({made.cases} cases)")
        if made.note():
            print(f"note: {made.note()}")
    return 0


def _on_server(url, keep, accept_fewer, backup_server):
    from fixbench.store.database import open_store

    store = open_store(url, create=False)
    try:
        if accept_fewer:
            _confirm(store)
        return backup_server(store, keep=keep, accept_fewer=accept_fewer)
    finally:
        store.close()


def _owner_confirms(path) -> None:
    from fixbench.store.database import open_store

    store = open_store(path, create=False)
    try:
        _confirm(store)
    finally:
        store.close()


def _confirm(store) -> None:
    from fixbench.commands._passphrase import ask_owner_passphrase
    from fixbench.store.owner import require_owner

    require_owner(store, ask_owner_passphrase("count a much smaller shop as a good backup"))


def _list(backups, as_json: bool) -> int:
    if as_json:
        print_json([{"backup": str(p), "kind": kind or "good"} for p, kind in backups])
        return 0
    for path, kind in backups:
        print(f"{path}{'  (' + kind + ')' if kind else ''}")
    return 0
