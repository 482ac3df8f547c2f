"""`fixbench demo-db PATH`: build the fictional demo shop's two years of history."""

from __future__ import annotations

from pathlib import Path

from fixbench.cli import UsageError

HELP = "build the demo shop database (fictional shop, about two years of cases) at PATH"


def add_arguments(parser) -> None:
    parser.add_argument("path", help="the SQLite file to create (must not exist)")
    parser.add_argument("--seed", type=int, default=1, help="which demo history (default 1)")


def run(args) -> int:
    from fixbench.store.database import open_store
    from fixbench.store.demo_shop import build_demo_shop

    path = Path(args.path)
    if path.exists():
        raise UsageError(f"{path} already exists; give a new file name")
    store = open_store(path)
    try:
        count = build_demo_shop(store, seed=args.seed)
    except NotImplementedError as err:
        store.close()
        for leftover in path.parent.glob(path.name + "*"):
            leftover.unlink()
        raise UsageError(str(err)) from err
    store.close()
    print(f"built the demo shop in {path}: {count} cases")
    return 0
