"""The comeback and failed-verification flags follow the record through every kind of write."""

from __future__ import annotations

import random
from datetime import timedelta

from sqlalchemy import select

from fixbench.store.amendments import amend_closed_case, delete_case
from fixbench.store.case_flags import recompute_all_flags
from fixbench.store.cases import add_verification, open_case
from fixbench.store.models import Case
from fixbench.store.owner import set_owner_passphrase
from fixbench.store.people import add_device, add_technician
from tests.store.conftest import RATINGS, START, record_case

PASS = "hot air station"


def _flags(store) -> dict[str, tuple[bool, bool]]:
    with store.session() as session:
        return {ticket: (bool(back), bool(failed)) for ticket, back, failed in session.execute(
            select(Case.ticket_ref, Case.came_back, Case.failed_verification))}


def test_unit_opened_again_within_ninety_days_makes_the_repair_a_comeback(bench):
    store, tech, device = bench
    record_case(store, tech, device, ticket="F-1", opened=START, closed_after=timedelta(hours=2))
    assert _flags(store)["F-1"] == (False, False)
    # 90 days after the closing exactly is still a comeback (the rule is "within 90 days").
    open_case(store, ticket_ref="F-2", device_id=device, technician_id=tech,
              family_id="pwm_flyback", ratings=RATINGS,
              opened_at=START + timedelta(hours=2) + timedelta(days=90))
    assert _flags(store) == {"F-1": (True, False), "F-2": (False, False)}


def test_unit_back_after_ninety_days_or_after_a_failed_repair_is_no_comeback(bench):
    store, tech, device = bench
    other = add_device(store, make="Tarnwick", model="TW-9", kind="usb adapter",
                       label_ratings=RATINGS)
    record_case(store, tech, device, ticket="G-1", opened=START)
    record_case(store, tech, device, ticket="G-2", opened=START + timedelta(days=91))
    record_case(store, tech, other, ticket="G-3", opened=START, outcome="not_economical")
    record_case(store, tech, other, ticket="G-4", opened=START + timedelta(days=10))
    assert {t: f[0] for t, f in _flags(store).items()} == {
        "G-1": False, "G-2": False, "G-3": False, "G-4": False}


def test_failed_verification_is_flagged_and_stays_after_a_later_pass(bench):
    store, tech, device = bench
    record_case(store, tech, device, ticket="V-1", opened=START, verifications=(False, True))
    record_case(store, tech, device, ticket="V-2", opened=START + timedelta(days=200),
                verifications=(True,))
    assert _flags(store) == {"V-1": (False, True), "V-2": (False, False)}


def test_amending_the_outcome_and_deleting_the_return_visit_update_the_comeback(bench):
    store, tech, device = bench
    set_owner_passphrase(store, PASS)
    first = record_case(store, tech, device, ticket="A-1", opened=START)
    back = record_case(store, tech, device, ticket="A-2", opened=START + timedelta(days=20))
    assert _flags(store)["A-1"] == (True, False)
    amend_closed_case(store, first, {"outcome": "no_fault_found"}, by="Owner", reason="retest",
                      passphrase=PASS)
    assert _flags(store)["A-1"] == (False, False)
    amend_closed_case(store, first, {"outcome": "repaired"}, by="Owner", reason="undo",
                      passphrase=PASS)
    assert _flags(store)["A-1"] == (True, False)
    delete_case(store, back, passphrase=PASS)
    assert _flags(store) == {"A-1": (False, False)}


def test_flags_kept_while_writing_agree_with_recomputing_them_from_the_record(store):
    """A random history of units coming and going: the incremental upkeep equals the set rule."""
    rng = random.Random(5)
    techs = [add_technician(store, name) for name in ("Ada", "Ben")]
    devices = [add_device(store, make="Quillon", model=f"QX-{i}", kind="phone charger",
                          label_ratings=RATINGS) for i in range(6)]
    opened = START
    for number in range(40):
        opened += timedelta(days=rng.randrange(0, 30), hours=rng.randrange(8))
        record_case(store, rng.choice(techs), rng.choice(devices), ticket=f"R-{number}",
                    opened=opened, outcome=rng.choice(["repaired", "repaired", "no_fault_found"]),
                    closed_after=timedelta(days=rng.randrange(0, 5), hours=2),
                    verifications=rng.choice([(), (True,), (False, True)]))
    open_case(store, ticket_ref="R-open", device_id=devices[0], technician_id=techs[0],
              family_id="pwm_flyback", ratings=RATINGS, opened_at=opened + timedelta(days=1))
    kept = _flags(store)
    assert any(back for back, _ in kept.values()) and any(failed for _, failed in kept.values())
    with store.engine.begin() as connection:
        connection.execute(Case.__table__.update().values(came_back=False,
                                                          failed_verification=False))
        recompute_all_flags(connection)
    assert _flags(store) == kept


def test_a_verification_on_an_open_case_flags_it_at_once(bench):
    store, tech, device = bench
    case_id = open_case(store, ticket_ref="O-1", device_id=device, technician_id=tech,
                        family_id="pwm_flyback", ratings=RATINGS, opened_at=START)
    add_verification(store, case_id, check_id="output_voltage", typed="0 V", value=0.0, unit="V",
                     outcome=None, passed=False)
    assert _flags(store)["O-1"] == (False, True)
