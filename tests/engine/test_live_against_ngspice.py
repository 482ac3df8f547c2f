"""The operating model's live behaviour against ngspice: each fault of each family run as a circuit.

For every family and every fault of its file (the root part alone, as the family file names it) and
the healthy unit, the behavioural deck of tests/support/live_deck.py is run in ngspice (the source of
the simulated column) and classed by tests/support/live_spice.py; the operating model's ``Operation``
for the same parts is classed the same way. Signals: the operating state (no_power, no_start,
hiccup, running, switch_fails), Vcc (zero, steady, cycling; controller families), the output at rated
load on the board (zero, low, in_range, high) and audible bursts (ticking yes/no).

The ngspice runs are cached by deck text in tests/engine/data/live_spice.json: with the cache
current this test costs about a second; a change that alters a deck (a part value, a design figure,
the deck builder) runs the changed decks again, about 20 s each, two at a time.
"""

from __future__ import annotations

import pytest

from fixbench.engine.operating import operate
from fixbench.physics.healthy import healthy_unit
from fixbench.physics.ratings import parse_ratings
from tests.support.live_deck import live_deck
from tests.support.live_spice import model_classes, simulated_classes, simulate_all

pytestmark = pytest.mark.slow  # seconds with the cache current; minutes when decks changed

CHARGER = {"mains": "230 V", "output": "5 V", "current": "2 A"}
FAMILIES = ("primary_side", "pwm_flyback")  # self_oscillating: see DEVELOPERS.md
AGREEMENT = 0.90  # [the review's figure: issue 11, "agreement >= 90 % of rows"]

# Rows where ngspice and the operating model disagree, each with its reason. A row listed here that
# agrees again fails the test too, so the list stays true: a fix to the operating model removes its
# rows here. Reasons that name an issue 11 finding are the operating model's to fix; the others say
# what the deck leaves out.
WEAK_LIMIT = ("issue 11 finding (Vcc follows the output): at rated load a drifted sense resistor's lower "
              "current limit holds the output down, the auxiliary winding with it, and Vcc falls under "
              "the stop threshold and cycles; the model keeps Vcc steady")
START_RESISTOR = ("issue 11 finding: the start-up rule gives 1 Mohm, 0.32 mA from the 325 V bulk, under "
                  "the UC3842's 0.5 mA typical start-up current [src: TI UC3842 datasheet]; in ngspice "
                  "the controller never leaves lockout, whatever the fault")
DRIED_VCC_CAPACITOR = ("the deck's dried Vcc capacitor (a quarter of its value, eight times its ESR, the "
                       "cold model's factors) still holds Vcc over the stop threshold until the auxiliary "
                       "winding takes over; the trade's hiccup [practice] comes from a part further gone")
SECONDARY_LOST = ("with the output diode open or shorted the flyback energy has nowhere to go but the RCD "
                  "clamp, sized for leakage energy, and in ngspice the drain passes the switch rating; the "
                  "deck's controller has no over-voltage or short-circuit protection, which on the bench "
                  "usually hiccups it first [practice]")
AUX_SPIKE = ("with the output shorted the leakage spike on the auxiliary winding peak-charges Vcc through "
             "the auxiliary diode and keeps the deck's controller running at its current limit; a real "
             "primary-side controller's short-circuit protection hiccups it [practice]")
NO_DUMMY_LOAD = ("the family leaves out the dummy load its file mentions: with the lead open the board is "
                 "unloaded and a primary-side output rises")


def _rows(fault: str, reason: str, *signals: str) -> dict[tuple[str, str], str]:
    return {(fault, signal): reason for signal in signals}


DISAGREEMENTS: dict[str, dict[tuple[str, str], str]] = {
    "primary_side": {
        **_rows("R3.drift", WEAK_LIMIT, "state", "vcc"),
        **_rows("C2.dried", DRIED_VCC_CAPACITOR, "state", "output", "vcc", "ticking"),
        **_rows("D4.open", SECONDARY_LOST, "state", "vcc", "ticking"),
        **_rows("D4.short", SECONDARY_LOST, "state", "vcc", "ticking"),
        **_rows("C3.short", AUX_SPIKE, "state", "vcc", "ticking"),
        **_rows("W1.open", NO_DUMMY_LOAD, "output"),
    },
    "pwm_flyback": {
        **{(fault, signal): START_RESISTOR for fault, signals in {
            "BD1.open": ('output', 'state', 'vcc'),
            "C1.dried": ('output', 'state', 'vcc'),
            "C2.dried": ('state', 'ticking', 'vcc'),
            "C3.dried": ('output', 'state', 'vcc'),
            "C3.short": ('state', 'ticking', 'vcc'),
            "D2.open": ('state', 'ticking', 'vcc'),
            "D3.open": ('state',),
            "D4.open": ('state', 'ticking', 'vcc'),
            "D4.short": ('state', 'ticking', 'vcc'),
            "Q1.open": ('state', 'vcc'),
            "R2.open": ('state', 'vcc'),
            "R3.drift": ('output', 'state', 'vcc'),
            "R3.open": ('state', 'vcc'),
            "R4.open": ('state',),
            "R5.open": ('output', 'state', 'vcc'),
            "R6.open": ('state', 'ticking', 'vcc'),
            "T1.open": ('state', 'vcc'),
            "U1.dead": ('vcc',),
            "U2.open": ('output', 'state', 'vcc'),
            "U2.short": ('state', 'vcc'),
            "U3.open": ('output', 'state', 'vcc'),
            "U3.short": ('state', 'ticking', 'vcc'),
            "W1.open": ('output', 'state', 'vcc'),
            "healthy": ('output', 'state', 'vcc'),
        }.items() for signal in signals},
    },
}
# Families whose healthy deck does not run in ngspice on main, and why.
HEALTHY_DOES_NOT_RUN = {"pwm_flyback": START_RESISTOR}
# Families whose table is below the agreement figure on main, with the figure reached and why.
BELOW_AGREEMENT = {
    "primary_side": "100 of 116 rows (86 %): see DISAGREEMENTS",
    "pwm_flyback": "71 of 132 rows (54 %): the start-up resistor (START_RESISTOR)",
}


def _faults(family):
    yield "healthy", {}
    for fault in family.faults:
        yield fault.id, {fault.part: fault.mode}


@pytest.fixture(scope="module")
def table(knowledge, ngspice):
    """(family, fault, signal) -> (model class, simulated class)."""
    ratings = parse_ratings(CHARGER)
    decks, runs = {}, {}
    for family_id in FAMILIES:
        family = knowledge.family(family_id)
        for fault_id, modes in _faults(family):
            label = f"{family_id}/{fault_id}"
            decks[label] = (live_deck(family, ratings, modes, fault_id), family.design.switching_hz)
            runs[label] = (family, modes, fault_id)
    simulated = simulate_all(decks)
    # A switch the run drives past its rating fails short (avalanche): the unit is then what it
    # becomes with that switch shorted, so those faults run again with it shorted too.
    damaged = {}
    for label, (family, modes, fault_id) in runs.items():
        if simulated_classes(family, ratings, simulated[label])["state"] == "switch_fails":
            shorted = {**modes, **{part.id: "short" for part in family.parts_with_role("switch")}}
            damaged[label + ", switch shorted"] = (
                live_deck(family, ratings, shorted, f"{fault_id}, switch shorted"), family.design.switching_hz)
    if damaged:
        simulated = simulate_all({**decks, **damaged})
    rows = {}
    for label, (family, modes, fault_id) in runs.items():
        healthy = healthy_unit(family.design, ratings)
        model = model_classes(family, ratings, operate(family, ratings, healthy, modes))
        sim = simulated_classes(family, ratings, simulated[label])
        if label + ", switch shorted" in simulated:
            sim = {**simulated_classes(family, ratings, simulated[label + ", switch shorted"]),
                   "state": "switch_fails"}
        for signal in model:
            rows[(family.id, fault_id, signal)] = (model[signal], sim[signal])
    return rows


@pytest.fixture(scope="session")
def ngspice():
    from tests.support.ngspice import ngspice_binary
    if ngspice_binary() is None:
        pytest.skip("ngspice binary not found on PATH: install the Debian package 'ngspice'")


def _text(rows) -> str:
    return "\n".join(f"{f:16s} {fault:10s} {signal:8s} model={m:12s} ngspice={s}"
                     for (f, fault, signal), (m, s) in sorted(rows.items()))


def _agreement_case(family_id: str):
    reason = BELOW_AGREEMENT.get(family_id)
    marks = [pytest.mark.xfail(strict=True, reason=reason)] if reason else []
    return pytest.param(family_id, marks=marks)


@pytest.mark.parametrize("family_id", [_agreement_case(f) for f in FAMILIES])
def test_operating_model_agrees_with_ngspice_on_nine_rows_in_ten(table, family_id):
    rows = {key: value for key, value in table.items() if key[0] == family_id}
    agree = sum(model == sim for model, sim in rows.values())
    # [src: ngspice transient of the family's behavioural deck, classed as described above]
    assert agree / len(rows) >= AGREEMENT, f"{agree}/{len(rows)} rows agree:\n{_text(rows)}"


@pytest.mark.parametrize("family_id", FAMILIES)
def test_every_disagreement_is_listed_with_its_reason(table, family_id):
    found = {key[1:] for key, (model, sim) in table.items() if key[0] == family_id and model != sim}
    listed = set(DISAGREEMENTS.get(family_id, {}))
    unlisted = {(family_id, *key): table[(family_id, *key)] for key in found - listed}
    # [src: ngspice transient of each family's behavioural deck]
    assert not unlisted, "disagreements with no reason listed:\n" + _text(unlisted)
    assert not listed - found, ("listed in DISAGREEMENTS but agreeing now (remove them): "
                                + ", ".join("/".join(k) for k in sorted(listed - found)))
    assert all(DISAGREEMENTS[family_id][key] for key in listed)


def _healthy_case(family_id: str):
    reason = HEALTHY_DOES_NOT_RUN.get(family_id)
    marks = [pytest.mark.xfail(strict=True, reason=reason)] if reason else []
    return pytest.param(family_id, marks=marks)


@pytest.mark.parametrize("family_id", [_healthy_case(f) for f in FAMILIES])
def test_healthy_unit_runs_regulated_in_ngspice(table, family_id):
    # [src: ngspice transient of the healthy deck: running, output in its window, no bursts]
    assert table[(family_id, "healthy", "state")] == ("running", "running")
    assert table[(family_id, "healthy", "output")] == ("in_range", "in_range")
    assert table[(family_id, "healthy", "ticking")] == ("no", "no")
