"""Board profiles at the bench: a marking kept at a step recomputes the case, the next unit of the
model arrives with it, the profile file round trip, and photos with marked test points."""

from __future__ import annotations

import pytest

from fixbench.knowledge import load_knowledge
from fixbench.knowledge.board import BoardError, PartEntry
from fixbench.store import open_store
from fixbench.store import board_profiles as kept
from fixbench.store.people import add_technician
from fixbench.workflows import bench
from fixbench.workflows.board_profiles import (board_of_model, export_profile, import_profile,
                                               photo_for_point)
from fixbench.workflows.intake import IntakeForm, open_new_case

CHARGER = {"mains": "230 V", "output": "5 V", "current": "1 A"}
KB = load_knowledge()


@pytest.fixture
def shop(tmp_path):
    store = open_store(tmp_path / "shop.sqlite")
    yield store, add_technician(store, "Rowan Vell")
    store.close()


def _open(store, tech, ticket: str, model: str = "QX-5", family: str = "primary_side"):
    form = IntakeForm(ticket, "Quillon", model, "", "phone charger", family, CHARGER, ("symptom_dead",))
    return open_new_case(store, KB, tech, form)


def _band(state, check_id: str):
    e = state.proposal_for(check_id).expected
    return e.low, e.high


def test_a_marking_kept_at_a_step_recomputes_the_case_and_names_the_part_as_the_board_does(shop):
    store, tech = shop
    loaded = _open(store, tech, "BP-1")
    low, high = _band(loaded.state, "start_resistor")
    assert high < 1.1e6  # the family's typical 1 Mohm start-up resistor
    loaded = bench.keep_board_marking(store, KB, loaded.case.id,
                                      PartEntry("R1", designator="R3 + R4", value="2 x 2.2 Mohm"))
    assert "R3 + R4" in loaded.notice and "2 x 2.2 Mohm" in loaded.notice
    low, high = _band(loaded.state, "start_resistor")
    # The two 2.2 Mohm in series, in circuit with the switch's leakage paths: about 3.7 Mohm
    # (cold network; tests/commands/test_board_option.py reads the same board healthy).
    assert low < 3.72e6 < high
    state = loaded.state.with_reading("start_resistor", "3.72 Mohm")
    assert state.readings[-1].in_band
    r1 = loaded.state.family.part("R1")
    assert (r1.label, r1.marking) == ("R3 + R4", "2 x 2.2 Mohm")


def test_the_next_unit_of_the_model_arrives_with_its_board(shop):
    store, tech = shop
    first = _open(store, tech, "BP-2")
    bench.keep_board_marking(store, KB, first.case.id, PartEntry("C3", designator="C9", value="1000uF 10V"))
    second = _open(store, tech, "BP-3", model="  qx-5 ")
    assert second.state.family.part("C3").label == "C9"
    low, high = _band(second.state, "output_cap_capacitance")
    assert low < 1000e-6 < high
    # Another model, and the same model text under another family, have no profile.
    assert _open(store, tech, "BP-4", model="QX-9").state.family.part("C3").label == "C3"
    assert board_of_model(store, "QX-5", "pwm_flyback") is None


def test_a_marking_that_does_not_read_is_refused_and_nothing_is_kept(shop):
    store, tech = shop
    loaded = _open(store, tech, "BP-5")
    with pytest.raises(BoardError, match="Start-up resistor"):
        bench.keep_board_marking(store, KB, loaded.case.id, PartEntry("R1", value="10 uF"))
    assert kept.profile_for_model(store, "QX-5") is None


def test_a_profile_exported_and_imported_in_another_shop_is_the_same(shop, tmp_path):
    store, tech = shop
    loaded = _open(store, tech, "BP-6")
    bench.keep_board_marking(store, KB, loaded.case.id,
                             PartEntry("R1", designator="R3 + R4", value="2 x 2.2 Mohm", package="1206"))
    bench.keep_board_marking(store, KB, loaded.case.id, PartEntry("C1", designator="C5", value="10 uF",
                                                                   rated="400 V"))
    text = export_profile(store, "QX-5", "primary_side")
    other = open_store(tmp_path / "other.sqlite")
    try:
        imported = import_profile(other, KB.family("primary_side"), "QX-5", text)
        assert imported == board_of_model(store, "QX-5", "primary_side")
        assert export_profile(other, "QX-5", "primary_side") == text
        with pytest.raises(BoardError, match="family 'primary_side'"):
            import_profile(other, KB.family("pwm_flyback"), "QX-5", text)
    finally:
        other.close()


def test_a_photo_with_a_marked_test_point_is_found_for_the_step_and_kept_whole(shop):
    store, tech = shop
    _open(store, tech, "BP-7")
    photo_id = kept.add_photo(store, "QX-5", "primary_side", b"\x89PNG fake bytes", "component side")
    kept.mark_point(store, photo_id, "r1_pins", 0.25, 0.5)
    kept.mark_point(store, photo_id, "r1_pins", 0.3, 0.6)  # marked again: moved
    found = photo_for_point(store, "qx-5", "primary_side", ("bulk_plus", "r1_pins"))
    assert found is not None and found[1] == "r1_pins" and found[0].marks["r1_pins"] == (0.3, 0.6)
    assert photo_for_point(store, "QX-5", "primary_side", ("bulk_plus",)) is None
    with pytest.raises(Exception, match="x and y from 0 to 1"):
        kept.mark_point(store, photo_id, "r1_pins", 1.5, 0.5)


def test_the_record_and_the_customer_report_name_the_part_as_the_board_does(shop):
    from fixbench.workflows.case_story import load_case_story
    from fixbench.workflows.job_report import job_report_content

    store, tech = shop
    loaded = _open(store, tech, "BP-8")
    loaded = bench.keep_board_marking(store, KB, loaded.case.id,
                                      PartEntry("R1", designator="R3 + R4", value="2 x 2.2 Mohm"))
    bench.keep_repair(store, loaded.case, "R1", "replaced", "2 x 2.2 Mohm 1206", None, 20)
    report = job_report_content(store, KB, loaded.case.id)
    assert report.replaced[0][0] == "Start-up resistor (R3 + R4)"
    story = load_case_story(store, KB, loaded.case.id)
    assert any(step.headline == "Replaced: Start-up resistor (R3 + R4)" for step in story.steps)
