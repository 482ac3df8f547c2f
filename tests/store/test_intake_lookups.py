"""What intake looks up: models seen before, a unit that comes back, a ticket already used."""

from __future__ import annotations

from datetime import timedelta

from fixbench.store.cases import open_case
from fixbench.store.intake_lookups import find_device, known_models, ticket_taken
from fixbench.store.people import add_device
from tests.store.conftest import RATINGS, START


def _open(store, tech, device, ticket="B-1", opened=START):
    return open_case(store, ticket_ref=ticket, device_id=device, technician_id=tech,
                     family_id="pwm_flyback", ratings=RATINGS, opened_at=opened)


def test_known_models_and_comeback_device_and_ticket(bench):
    store, tech, device = bench
    other = add_device(store, make="Larkspur", model="LP-19", kind="laptop adapter",
                       label_ratings={}, serial="SN-77")
    open_case(store, ticket_ref="K-1", device_id=other, technician_id=tech,
              family_id="self_oscillating", ratings={"mains": "universal", "output": "19 V",
                                                      "current": "3.4 A"}, opened_at=START)
    _open(store, tech, device, "K-2", START + timedelta(days=1))
    models = known_models(store)
    assert [m.label for m in models] == ["Larkspur LP-19", "Quillon QX-5"]
    assert models[0].family_id == "self_oscillating" and models[0].ratings["output"] == "19 V"
    assert find_device(store, "larkspur", "lp-19", "SN-77") == other
    assert find_device(store, "Larkspur", "LP-19", "") is None
    assert ticket_taken(store, "K-1") and not ticket_taken(store, "K-9")
