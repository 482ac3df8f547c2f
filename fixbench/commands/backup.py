"""`fixbench backup`: write a consistent copy of the shop database beside it (rolling)."""

from __future__ import annotations

from fixbench.commands.usage import UsageError

HELP = "back up the shop database now (keeps the newest copies, prunes the oldest)"


def add_arguments(parser) -> None:
    parser.add_argument("--keep", type=int, default=None,
                        help="how many backups to keep (default 14)")
    parser.add_argument("--list", action="store_true", help="list the backups instead")


def run(args) -> int:
    from fixbench.store.backup import KEEP_BACKUPS, backup_database, list_backups
    from fixbench.store.errors import StoreError
    from fixbench.store.location import resolve_url, sqlite_path

    path = sqlite_path(resolve_url(args.db))
    if path is None:
        raise UsageError("this database is on a server; back it up there (for PostgreSQL: pg_dump)")
    if args.list:
        for backup in list_backups(path):
            print(backup)
        return 0
    keep = KEEP_BACKUPS if args.keep is None else args.keep
    if keep < 1:
        raise UsageError("--keep must be at least 1")
    try:
        made = backup_database(path, keep=keep)
    except StoreError as err:
        raise UsageError(str(err)) from err
    print(f"backed up to {made}")
    return 0
