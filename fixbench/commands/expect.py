"""`fixbench expect`: what a healthy unit of these ratings reads at every check."""

from __future__ import annotations

from fixbench.commands._output import print_json, print_table
from fixbench.commands._unit import add_unit_arguments, board_file, family_and_ratings, ratings_text
from fixbench.engine.fault_model import cached_fault_model
from fixbench.physics.part_values import VALUE_UNITS, value_of
from fixbench.quantities import format_band, format_quantity

FIGURE_TITLES = {
    "vcc_start": ("vcc", "Controller start threshold (Vcc rising)"),
    "vcc_stop": ("vcc", "Controller stop threshold (Vcc falling)"),
    "bulk_minimum_at_load": ("bulk_plus/primary_ground", "Bulk valley at rated load"),
    "aux_flyback": ("d2_pins", "Auxiliary winding, flyback plateau (scope)"),
    "aux_forward": ("d2_pins", "Auxiliary winding while the switch conducts (scope)"),
    "aux_rectified": ("d2_pins", "Auxiliary winding, rectified (feeds Vcc)"),
    "bulk_capacitance": ("bulk_plus/primary_ground", "Bulk capacitance assumed"),
    "bulk_without_pfc": ("bulk_plus/primary_ground", "Bulk with the PFC stopped (the rectified peak)"),
}

HELP = "print the readings a healthy unit of given ratings shows at each test point"


def add_arguments(parser) -> None:
    add_unit_arguments(parser)
    parser.add_argument("--cold", action="store_true",
                        help="only the cold checks of parts, as a meter reads them on the assembled board, "
                             "with the marked value of the part each one targets (part_value)")
    parser.add_argument("--json", action="store_true", help="print a JSON list of rows for scripts")


def healthy_rows(family, ratings) -> list[dict]:
    model = cached_fault_model(family, ratings)
    rows = []
    for cm in model.checks:
        check = cm.check
        if check.unit is None:
            continue
        rows.append({"point": "/".join(check.points), "check": check.id, "title": check.title,
                     "instrument": check.instrument, "power": check.power, "unit": check.unit,
                     "nominal": cm.healthy.nominal, "low": cm.healthy.low, "high": cm.healthy.high})
    for name, figure in model.healthy.figures.items():
        point, title = FIGURE_TITLES[name]
        rows.append({"point": point, "check": None, "title": title, "instrument": None, "power": None,
                     "unit": figure.unit, "nominal": figure.nominal, "low": figure.low, "high": figure.high})
    return rows


def cold_rows(family, ratings) -> list[dict]:
    """The cold checks of parts: in-circuit nominal and band (SI), and the value the targeted part
    is marked with (SI; None where its kind has no value that the check reads, e.g. a diode): the
    board profile's marking where it gives one (``marked``), the family's typical value otherwise;
    ``designator`` is the board's where the profile names the part."""
    model = cached_fault_model(family, ratings)
    rows = []
    for cm in model.checks:
        check = cm.check
        if check.target_kind != "part" or check.power != "cold" or check.unit is None:
            continue
        part = family.part(check.target_id)
        rows.append({"point": "/".join(check.points), "check": check.id, "title": check.title,
                     "instrument": check.instrument, "power": check.power, "unit": check.unit,
                     "nominal": cm.healthy.nominal, "low": cm.healthy.low, "high": cm.healthy.high,
                     "part": part.id, "designator": part.label, "marked": part.marked,
                     "part_value": value_of(part, ratings, family.design),
                     "lift": ".".join(check.lift) if check.lift else None})
    return rows


def run(args) -> int:
    family, ratings = family_and_ratings(args.family, ratings_text(args), board_file(args.board))
    rows = cold_rows(family, ratings) if args.cold else healthy_rows(family, ratings)
    if args.json:
        print_json(rows)
        return 0
    print(f"{family.title}: {format_quantity(ratings.output_v, 'V')} {format_quantity(ratings.output_a, 'A')}, "
          f"mains on the bench {format_quantity(ratings.bench_mains, 'V')} {format_quantity(ratings.mains_hz, 'Hz')}")
    if args.cold:
        print("In circuit, on a 4000-count handheld meter; a lifted leg is named where a check lifts one; "
              "a value is the family's typical one unless the board profile marks it.")
        print_table(["check", "part", "value", "lift", "healthy", "band"],
                    [[r["title"], r["designator"], _marked(family, r), r["lift"] or "",
                      format_quantity(r["nominal"], r["unit"], 4) if r["nominal"] is not None else "OL",
                      format_band(r["low"], r["high"], r["unit"])] for r in rows])
        return 0
    print_table(["check", "power", "points", "healthy", "band"],
                [[r["title"], r["power"] or "", r["point"],
                  format_quantity(r["nominal"], r["unit"], 4) if r["nominal"] is not None else "",
                  format_band(r["low"], r["high"], r["unit"])] for r in rows])
    return 0


def _marked(family, row: dict) -> str:
    if row["part_value"] is None:
        return ""
    value = format_quantity(row["part_value"], VALUE_UNITS[family.part(row["part"]).kind])
    return value if row["marked"] else f"{value} (typical)"
