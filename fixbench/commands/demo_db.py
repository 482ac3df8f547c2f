"""`fixbench demo-db PATH`: build the fictional demo shop's two years of history."""

from __future__ import annotations

from pathlib import Path

from fixbench.commands._output import print_json
from fixbench.commands.usage import UsageError

HELP = "build the demo shop database (fictional shop, about two years of cases) at PATH"


def add_arguments(parser) -> None:
    from fixbench.demo.plan import SHOP_DAYS

    parser.add_argument("path", help="the SQLite file to create (must not exist)")
    parser.add_argument("--seed", type=int, default=1, help="which demo history (default 1)")
    parser.add_argument("--days", type=int, default=SHOP_DAYS,
                        help=f"days of history up to the shop's last day (default {SHOP_DAYS})")
    parser.add_argument("--json", action="store_true", help="print the result as JSON")


def run(args) -> int:
    from fixbench.store.backup import copy_database
    from fixbench.store.database import open_store
    from fixbench.demo.shop import build_demo_shop
    from fixbench.store.digest import content_digest

    path = Path(args.path)
    if path.exists():
        raise UsageError(f"{path} already exists; give a new file name")
    if args.days < 1:
        raise UsageError("--days must be at least 1")
    # Built beside the target and copied into place as one self-contained file (no WAL), so a
    # half-built shop never appears under the name and the result can be committed or shipped.
    building = path.with_name(path.name + ".building")
    _remove(building)
    try:
        store = open_store(building)
        try:
            count = build_demo_shop(store, seed=args.seed, days=args.days)
            digest = content_digest(store)
        finally:
            store.close()
        copy_database(building, path)
    finally:
        _remove(building)
    if args.json:
        print_json({"path": str(path), "cases": count, "seed": args.seed, "days": args.days,
                    "content_digest": digest})
        return 0
    print(f"built the demo shop in {path}: {count} cases (seed {args.seed}, {args.days} days)")
    print(f"content digest: {digest}")
    return 0


def _remove(database: Path) -> None:
    for extra in ("", "-wal", "-shm", "-journal"):
        database.with_name(database.name + extra).unlink(missing_ok=True)
