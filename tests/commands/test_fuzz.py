"""Fuzzing the commands with what people and files really hold: any case file (any bytes, any JSON,
any mix of real and made-up families, ratings, checks and readings) and any rating text ends in a
result (exit 0) or one line saying what is wrong (exit 2) - never a traceback.

The inputs lean on the edges found by hand before (an exponent with a prefix, a blank value, a
family given as a list, deep nesting, UTF-16, a byte-order mark) and let hypothesis look for more.
"""

from __future__ import annotations

import contextlib
import io
import json

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from fixbench.cli import main
from fixbench.knowledge import load_knowledge

KNOWLEDGE = load_knowledge()
FAMILIES = sorted(KNOWLEDGE.families)
CHECKS = sorted({c.id for f in KNOWLEDGE.families.values() for c in f.checks})
FAULTS = sorted({x.id for f in KNOWLEDGE.families.values() for x in f.faults})
RATING_KEYS = ["mains", "frequency", "output", "current", "bulk", "switching", "bench_mains"]
SETTINGS = settings(max_examples=120, deadline=None, derandomize=True,
                    suppress_health_check=[HealthCheck.too_slow, HealthCheck.function_scoped_fixture])

UNITS = ["", "V", "mV", "kV", "A", "mA", "Hz", "kHz", "MHz", "GHz", "uF", "pF", "F", "ohm", "k", "R",
         "W", "%", "Vac", "\u00b5F", "\u2126", "e3mV", "E-2kHz", "xyz"]
numbers = st.one_of(st.integers(-10**6, 10**6).map(str),
                    st.floats(allow_nan=True, allow_infinity=True).map(repr),
                    st.sampled_from(["0", "1e400", "5e3", "0.0001", "-0", "1,5", "4k7", "0R47", "2M2",
                                     "OL", "open", "nan", "inf", ".", "--5", "+5", "1e-400"]))
quantity_text = st.one_of(
    st.builds(lambda n, sep, u: f"{n}{sep}{u}", numbers, st.sampled_from(["", " ", "  "]),
              st.sampled_from(UNITS)),
    st.sampled_from(["", " ", "universal", "100-240 V", "85-265", "230", "120 V", "yes", "no",
                     "bright", "dark", "beeps", "\x00", "5 V\x00"]),
    st.text(max_size=12),
)
json_leaf = st.one_of(st.none(), st.booleans(), st.integers(), st.floats(allow_nan=False),
                      st.text(max_size=8))
json_value = st.recursive(json_leaf, lambda inner: st.one_of(
    st.lists(inner, max_size=3), st.dictionaries(st.text(max_size=6), inner, max_size=3)), max_leaves=8)
ratings = st.one_of(
    st.dictionaries(st.sampled_from(RATING_KEYS + ["colour"]), quantity_text, max_size=7),
    st.fixed_dictionaries({"mains": quantity_text, "output": quantity_text, "current": quantity_text}),
    json_value,
)
reading = st.one_of(
    st.fixed_dictionaries({"check": st.sampled_from(CHECKS), "value": quantity_text}),
    st.fixed_dictionaries({"check": st.one_of(st.text(max_size=10), json_value), "value": json_value}),
    json_value,
)
PLAUSIBLE = {
    "mains": ["230 V", "120 V", "universal", "100-240 V", "220", "240 V", "100 V"],
    "output": ["5 V", "12V", "19 V", "3.3 V", "9 V", "24 V", "5e3mV", "2 V"],
    "current": ["1 A", "2A", "3.42 A", "500 mA", "0.5 A", "4.74 A"],
    "frequency": ["50 Hz", "60Hz", "50"],
    "bench_mains": ["230 V", "120 V"],
    "bulk": ["22 uF", "47uF", "10 \u00b5F", "100 uF"],
    "switching": ["65 kHz", "100kHz", "132 kHz"],
}
plausible_ratings = st.fixed_dictionaries(
    {k: st.sampled_from(PLAUSIBLE[k]) for k in ("mains", "output", "current")},
    optional={k: st.sampled_from(PLAUSIBLE[k]) for k in ("frequency", "bench_mains", "bulk", "switching")})


@st.composite
def nearly_right_ratings(draw):
    """Ratings as a label gives them, with up to two values typed wrong or wild."""
    chosen = dict(draw(plausible_ratings))
    for _ in range(draw(st.integers(0, 2))):
        chosen[draw(st.sampled_from(RATING_KEYS))] = draw(quantity_text)
    return chosen


def _simulated(family: str, fault: str) -> dict:
    code, out = _run_out(["simulate", f"--family={family}", f"--fault={fault}", "--json"])
    assert code == 0
    return json.loads(out)


def _run_out(argv: list[str]) -> tuple[int, str]:
    out = io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(io.StringIO()):
        code = main(argv)
    return code, out.getvalue()


# A real case file of each family (a simulated unit with a common fault), for the fuzz to change.
BASE_CASES = [_simulated(family, next(iter(KNOWLEDGE.family(family).faults)).id) for family in FAMILIES]


@st.composite
def nearly_right_case(draw):
    """A real case file with up to four things changed: a rating, a reading's value or check, a
    key dropped, the family, a reading added."""
    case = json.loads(json.dumps(draw(st.sampled_from(BASE_CASES))))
    for _ in range(draw(st.integers(0, 4))):
        change = draw(st.sampled_from(["rating", "value", "check", "drop", "family", "add"]))
        readings = case.get("readings") if isinstance(case.get("readings"), list) else []
        if change == "rating" and isinstance(case.get("ratings"), dict):
            case["ratings"][draw(st.sampled_from(RATING_KEYS))] = draw(quantity_text)
        elif change in ("value", "check") and readings:
            item = readings[draw(st.integers(0, len(readings) - 1))]
            if change == "value":
                item["value"] = draw(st.one_of(quantity_text, json_value))
            else:
                item["check"] = draw(st.one_of(st.sampled_from(CHECKS), st.text(max_size=10)))
        elif change == "drop":
            case.pop(draw(st.sampled_from(["family", "ratings", "readings"])), None)
        elif change == "family":
            case["family"] = draw(st.one_of(st.sampled_from(FAMILIES), json_value))
        elif change == "add":
            case["readings"] = readings + [draw(reading)]
    return case


case_object = st.fixed_dictionaries(
    {"family": st.one_of(st.sampled_from(FAMILIES), st.text(max_size=12), json_value),
     "ratings": ratings},
    optional={"readings": st.one_of(st.lists(reading, max_size=12), json_value),
              "record": json_value})
case_bytes = st.one_of(
    st.builds(lambda c, enc: _encoded(c, enc), nearly_right_case(),
              st.sampled_from(["utf-8", "utf-8", "utf-8-sig", "utf-16"])),
    st.builds(lambda c, enc: _encoded(c, enc), nearly_right_case(),
              st.sampled_from(["utf-8", "utf-8-sig", "utf-16", "utf-32", "latin-1"])),
    st.builds(lambda c, enc: _encoded(c, enc), case_object,
              st.sampled_from(["utf-8", "utf-8-sig", "utf-16", "utf-16-le", "utf-32", "latin-1"])),
    st.binary(max_size=200),
    st.builds(lambda depth: ("[" * depth + "]" * depth).encode(), st.integers(1, 200_000)),
)


def _encoded(case: dict, encoding: str) -> bytes:
    try:
        return json.dumps(case, ensure_ascii=False).encode(encoding)
    except UnicodeEncodeError:
        return json.dumps(case).encode(encoding)


def _run(argv: list[str]) -> tuple[int, str]:
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(argv)
    return code, err.getvalue()


def _result_or_one_line(argv: list[str]) -> None:
    code, err = _run(argv)
    assert code in (0, 2), (argv, code, err)
    if code == 2:
        command = argv[0]
        assert err.startswith(f"fixbench {command}: ") and len(err.strip().splitlines()) == 1, (argv, err)


@SETTINGS
@given(raw=case_bytes)
def test_any_case_file_ends_in_a_result_or_one_line(tmp_path, raw):
    path = tmp_path / "case.json"
    path.write_bytes(raw)
    _result_or_one_line(["diagnose", str(path)])


@SETTINGS
@given(family=st.one_of(st.sampled_from(FAMILIES), st.sampled_from(FAMILIES), st.text(max_size=10)),
       values=st.one_of(nearly_right_ratings(), nearly_right_ratings(),
                        st.dictionaries(st.sampled_from(RATING_KEYS), quantity_text, max_size=7)))
def test_any_ratings_on_the_command_line_end_in_a_result_or_one_line(family, values):
    # The --name=value form, so a value that starts with "-" is not taken for an option.
    options = [f"--{key.replace('_', '-')}={text}" for key, text in values.items()]
    _result_or_one_line(["expect", f"--family={family}", *options])


@settings(max_examples=40, deadline=None, derandomize=True)
@given(family=st.sampled_from(FAMILIES), fault=st.one_of(st.sampled_from(FAULTS + ["no_fault"]),
                                                          st.text(max_size=10)),
       values=nearly_right_ratings())
def test_any_fault_and_ratings_to_simulate_end_in_a_result_or_one_line(family, fault, values):
    options = [f"--{key.replace('_', '-')}={text}" for key, text in values.items()]
    _result_or_one_line(["simulate", f"--family={family}", f"--fault={fault}", *options, "--exact"])
