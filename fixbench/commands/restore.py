"""`fixbench restore`: put a backup back in place without destroying what is there now."""

from __future__ import annotations

from pathlib import Path

from fixbench.commands.usage import UsageError

HELP = "restore the shop database from a backup (default: the newest backup)"


def add_arguments(parser) -> None:
    parser.add_argument("backup", nargs="?", help="the backup file (default: the newest one)")


def run(args) -> int:
    from fixbench.store.backup import newest_backup, restore_backup
    from fixbench.store.errors import StoreError
    from fixbench.store.location import resolve_url, sqlite_path

    path = sqlite_path(resolve_url(args.db))
    if path is None:
        raise UsageError("this database is on a server; restore it there (for PostgreSQL: pg_restore)")
    source = Path(args.backup) if args.backup else newest_backup(path)
    if source is None:
        raise UsageError(f"there are no backups of {path}")
    try:
        result = restore_backup(source, path)
    except StoreError as err:
        raise UsageError(str(err)) from err
    print(f"restored {path} from {source}")
    if result.previous_backup is not None:
        print(f"what was there before is kept in {result.previous_backup}")
    if result.set_aside is not None:
        print(f"the unreadable file that was there is kept as {result.set_aside}")
    return 0
