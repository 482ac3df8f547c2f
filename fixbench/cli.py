"""The one entry point: `fixbench` opens the window; `fixbench COMMAND` runs a command-line task.

Each command lives in its own module under ``fixbench.commands`` and exposes ``HELP`` (one line),
``add_arguments(parser)`` and ``run(args) -> int``. Modules are imported only when their command is
used, so `fixbench families` does not pay for Qt or SQLAlchemy.
"""

from __future__ import annotations

import argparse
import importlib
import sys

from fixbench.commands.usage import UsageError

# command name -> module under fixbench.commands
COMMANDS: dict[str, str] = {
    "families": "families",
    "expect": "expect",
    "diagnose": "diagnose",
    "simulate": "simulate",
    "benchmark": "benchmark",
    "backup": "backup",
    "restore": "restore",
    "demo-db": "demo_db",
    "export": "export",
    "cases": "cases",
}
DB_HELP = "database URL or SQLite file (default: the user data folder; or set FIXBENCH_DB)"


def _build_parser(argv: list[str]) -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="fixbench",
        description="Guided fault-finding for offline switch-mode supplies. "
        "Run without a command to open the window.",
    )
    parser.add_argument("--db", help=DB_HELP)
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    wanted = _command_word(argv)
    for name, module_name in COMMANDS.items():
        # Import only the command asked for; others get a placeholder line in --help.
        if name == wanted:
            module = importlib.import_module(f"fixbench.commands.{module_name}")
            cmd = sub.add_parser(name, help=module.HELP, description=module.HELP)
            module.add_arguments(cmd)
            # Also after the command (`fixbench backup --db shop.sqlite`); SUPPRESS leaves the
            # value given before the command in place when none is given here.
            cmd.add_argument("--db", default=argparse.SUPPRESS, help=DB_HELP)
            cmd.set_defaults(_module=module)
        else:
            sub.add_parser(name, help=_help_line(module_name))
    return parser


def _command_word(argv: list[str]) -> str | None:
    """The command named on the line, skipping the global options and their values."""
    skip = False
    for word in argv:
        if skip:
            skip = False
        elif word == "--db":
            skip = True
        elif not word.startswith("-"):
            return word
    return None


def _help_line(module_name: str) -> str:
    try:
        return importlib.import_module(f"fixbench.commands.{module_name}").HELP
    except ModuleNotFoundError:
        return "(not available in this build)"


def one_line(text: str) -> str:
    """The message on one line: text quoted from a file or an option may hold line breaks or other
    control characters (a NEL from Latin-1 bytes, a NUL), shown as escapes instead."""
    return "".join(ch if ch.isprintable() else ch.encode("unicode_escape").decode("ascii") for ch in text)


def _store_error() -> type[Exception]:
    """The store's error class when a command has loaded the store, else one nothing raises."""
    module = sys.modules.get("fixbench.store.errors")
    return module.StoreError if module is not None else _NeverRaised


class _NeverRaised(Exception):
    pass


def main(argv: list[str] | None = None) -> int:
    argv = list(sys.argv[1:] if argv is None else argv)
    parser = _build_parser(argv)
    args = parser.parse_args(argv)
    if args.command is None:
        from fixbench.app import open_window

        return open_window(db=args.db)
    try:
        return int(args._module.run(args) or 0)
    except UsageError as err:
        print(f"fixbench {args.command}: {one_line(str(err))}", file=sys.stderr)
        return 2
    except _store_error() as err:
        # The store's own errors are ones a person can fix (see fixbench.store.errors).
        print(f"fixbench {args.command}: {one_line(str(err))}", file=sys.stderr)
        return 2
    except BrokenPipeError:
        # Output piped into a command that stopped reading (head, less): not an error of ours.
        sys.stderr.close()
        return 0


if __name__ == "__main__":
    sys.exit(main())
