"""`fixbench restore`: put a backup in place of the shop, as the owner, without losing what is there."""

from __future__ import annotations

import sys
from pathlib import Path

from fixbench.commands._output import print_json
from fixbench.commands.usage import UsageError

HELP = "restore the shop from a backup (owner only; default: the newest good backup)"


def add_arguments(parser) -> None:
    parser.add_argument("backup", nargs="?", help="the backup file (default: the newest good backup)")
    parser.add_argument("--json", action="store_true", help="print the result as JSON")


def run(args) -> int:
    from fixbench.commands._passphrase import ask_owner_passphrase
    from fixbench.store.errors import StoreError
    from fixbench.store.location import resolve_url
    from fixbench.store.restore import newest_restorable, plan_restore, restore

    url = resolve_url(args.db)
    try:
        source = Path(args.backup) if args.backup else newest_restorable(url)
        if source is None:
            raise UsageError("there is no good backup of this shop to restore; name a backup file")
        plan = plan_restore(url, source)
        now = (f"{plan.cases_now} cases now" if plan.cases_now is not None
               else f"no readable shop now (it {plan.problem_now})")
        print(f"The shop has {now}; restored from {source} it will have {plan.cases_after}.",
              file=sys.stderr)
        if plan.others_open:
            print("Another bench has this shop open: the restore waits for a write in progress and "
                  "holds that bench's writes until it is done; close and reopen fixbench there "
                  "afterwards.", file=sys.stderr)
        passphrase = ask_owner_passphrase("restore") if plan.needs_passphrase else None
        done = restore(plan, passphrase, on_wait=lambda text: print(text, file=sys.stderr))
    except StoreError as err:
        raise UsageError(str(err)) from err
    if args.json:
        print_json({"restored_from": str(source), "cases_before": plan.cases_now,
                    "cases_after": plan.cases_after, "previous_backup": _text(done.previous_backup),
                    "set_aside": _text(done.set_aside), "after_backup": _text(done.after_backup),
                    "other_benches_open": plan.others_open, "waited_for_another_bench": done.waited})
        return 0
    print(f"restored from {source}: the shop had {plan.cases_now if plan.cases_now is not None else 'no'} "
          f"cases and now has {plan.cases_after}")
    if done.previous_backup is not None:
        print(f"what was there before is kept in {done.previous_backup}")
    if done.set_aside is not None:
        print(f"the unreadable file that was there is kept as {done.set_aside}")
    print("benches that have this shop open see the restored records from now on: close and reopen "
          "fixbench there, so that nothing is written against a case the backup does not hold")
    return 0


def _text(path) -> str | None:
    return None if path is None else str(path)
