"""A case is loaded one way: the bench resuming it, the case file exported for `fixbench diagnose`
and the owner's case story all see the same standing readings, with a reading taken back by undo
left out of each (and kept in the record), and the resumed diagnosis equals the one at the bench."""

from __future__ import annotations

import pytest

from fixbench.knowledge import load_knowledge
from fixbench.store import open_store
from fixbench.store.export import case_as_json
from fixbench.store.people import add_technician
from fixbench.workflows import bench
from fixbench.workflows.case_story import load_case_story, rerun_case
from fixbench.workflows.intake import IntakeForm, TicketInUse, open_new_case

CHARGER = {"mains": "230 V", "output": "5 V", "current": "2 A"}
KB = load_knowledge()


@pytest.fixture
def shop(tmp_path):
    store = open_store(tmp_path / "shop.sqlite")
    yield store, add_technician(store, "Rowan Vell")
    store.close()


def _form(ticket="BW-4001"):
    return IntakeForm(ticket, "Quillon", "QX-5", "SN-1", "phone charger", "pwm_flyback", CHARGER,
                      ("symptom_dead",))


def test_resume_export_and_story_agree_on_what_stands_after_an_undo(shop):
    store, tech = shop
    loaded = open_new_case(store, KB, tech, _form())
    case = loaded.case
    state = loaded.state
    for check_id, typed in (("look_fuse", "yes"), ("fuse_resistance", "OL"), ("bulk_discharged", "2 V")):
        state = bench.keep_reading(store, case, state.with_reading(check_id, typed))
    state = bench.keep_undo(store, case, state.undo())
    standing = [(r.check, r.text) for r in state.readings]
    assert standing == [("symptom_dead", "yes"), ("look_fuse", "yes"), ("fuse_resistance", "OL")]

    resumed = bench.resume_case(store, KB, case.id)
    assert [(r.check, r.text) for r in resumed.state.readings] == standing
    assert resumed.state.evidence == state.evidence
    exported = case_as_json(store, case.ticket)
    assert [(r["check"], r["value"]) for r in exported["readings"]] == standing
    assert exported["record"]["withdrawn_readings"] == [{"check": "bulk_discharged", "value": "2 V"}]
    story = load_case_story(store, KB, case.id)
    assert list(story.readings) == standing
    assert any("(taken back)" in step.headline for step in story.steps)
    assert rerun_case(KB, story).skipped == ()


def test_a_ticket_already_used_is_refused_before_anything_is_kept(shop):
    store, tech = shop
    open_new_case(store, KB, tech, _form("BW-4002"))
    with pytest.raises(TicketInUse, match="already a case"):
        open_new_case(store, KB, tech, _form(" BW-4002 "))
    assert case_as_json(store, "BW-4002")["readings"] == [{"check": "symptom_dead", "value": "yes"}]


def test_cautions_are_acknowledged_by_whoever_opened_the_case_when_nobody_is_chosen(shop):
    store, tech = shop
    case = open_new_case(store, KB, tech, _form("BW-4003")).case
    acknowledged = bench.acknowledge(store, case, None)
    assert acknowledged.cautions_acknowledged
    assert bench.resume_case(store, KB, case.id).case.cautions_acknowledged


def test_a_kept_case_whose_ratings_the_family_cannot_describe_opens_once_put_right(tmp_path, knowledge):
    # Such a case (kept by an older fixbench, which saved before checking) raised "band inverted"
    # on every resume: now it names the problem, and opens once its ratings are corrected.
    from fixbench.store import open_store
    from fixbench.store.cases import open_case
    from fixbench.store.people import add_device, add_technician
    from fixbench.quantities import ReadingError
    from fixbench.workflows.bench import RatingsToCorrect, correct_ratings, resume_case

    store = open_store(tmp_path / "shop.sqlite")
    try:
        tech = add_technician(store, "Rowan Vell")
        kept = {"mains": "230 V", "output": "2 V", "current": "1 A"}
        device = add_device(store, make="Quillon", model="QX-9", kind="phone charger", label_ratings=kept)
        case_id = open_case(store, ticket_ref="BW-7", device_id=device, technician_id=tech,
                            family_id="pwm_flyback", ratings=kept)
        with pytest.raises(RatingsToCorrect) as refused:
            resume_case(store, knowledge, case_id)
        assert refused.value.ratings == kept and "reference of the TL431" in refused.value.problem
        with pytest.raises(ReadingError):
            correct_ratings(store, knowledge, case_id, dict(kept, output="1.5 V"))
        loaded = correct_ratings(store, knowledge, case_id, dict(kept, output="5 V"))
        assert loaded.case.ratings["output"] == "5 V" and loaded.state.next_check is not None
        assert resume_case(store, knowledge, case_id).case.ratings["output"] == "5 V"
    finally:
        store.close()


def test_a_lamp_dark_after_its_flash_verifies_a_repair_and_a_bare_dark_asks(shop):
    # Reproduces issue 11: verification marked "dark" a failed repair, though a healthy small charger
    # keeps a 40-100 W lamp dark after the first flash [practice; trade primer section 8].
    from fixbench.quantities import ReadingError

    store, tech = shop
    loaded = open_new_case(store, KB, tech, _form("BW-4009"))
    reading = bench.verification_reading(loaded.state, "series_lamp", "flash then dark")
    assert reading.in_band
    kept = bench.keep_verification(store, loaded.case, reading)
    assert kept[-1].passed
    with pytest.raises(ReadingError, match="flash"):
        bench.verification_reading(loaded.state, "series_lamp", "dark")
    assert not bench.verification_reading(loaded.state, "series_lamp", "no flash").in_band
