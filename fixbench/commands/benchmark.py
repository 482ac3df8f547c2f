"""`fixbench benchmark engine|practice|store|ui`: the figures the project is held to, measured on
this machine."""

from __future__ import annotations

from fixbench.commands.usage import UsageError
from fixbench.commands._output import print_json

HELP = "measure the engine, the practice scoring, the store or the user interface and print the figures"


def add_arguments(parser) -> None:
    parser.add_argument("part", choices=("engine", "practice", "store", "ui"), help="what to measure")
    parser.add_argument("--json", action="store_true", help="print one JSON object for scripts")
    parser.add_argument("--seed", type=int, default=0, help="random seed (engine, practice, store)")
    parser.add_argument("--units", type=int, default=None,
                        help="simulated units per family (engine: 150; practice: 70 per level)")
    parser.add_argument("--cases", type=int, default=100_000, help="cases in the temporary database (store, ui)")
    parser.add_argument("--runs", type=int, default=5,
                        help="fresh processes started for each start-up time (ui; default 5)")


def run(args) -> int:
    if args.cases < 1:
        raise UsageError("--cases must be at least 1")
    if args.runs < 1:
        raise UsageError("--runs must be at least 1")
    if args.part == "engine":
        from fixbench.benchmarks.engine_figures import print_report, run_benchmark

        result = run_benchmark(seed=args.seed, units_per_family=_units(args, 150))
        print_json(result) if args.json else print_report(result)
        return 0
    if args.part == "practice":
        from fixbench.benchmarks.practice_fairness import print_practice_report, run_practice_benchmark

        result = run_practice_benchmark(seed=args.seed, units_per_family=_units(args, 70))
        print_json(result) if args.json else print_practice_report(result)
        return 0
    if args.part == "store":
        from fixbench.benchmarks.store_scale import print_store_report, run_store_benchmark

        result = run_store_benchmark(cases=args.cases, seed=args.seed)
        print_json(result) if args.json else print_store_report(result)
        return 0
    from fixbench.benchmarks.window_speed import print_ui_report, run_ui_benchmark

    result = run_ui_benchmark(cases=args.cases, startup_runs=args.runs)
    print_json(result) if args.json else print_ui_report(result)
    return 0


def _units(args, default: int) -> int:
    units = default if args.units is None else args.units
    if units < 1:
        raise UsageError("--units must be at least 1")
    return units
