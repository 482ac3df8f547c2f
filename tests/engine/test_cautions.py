"""Hazard classes and cautions on the step cards."""

from fixbench.engine.cautions import BULK, DEFER, LAMP, MAINS, cautions_for, hazard_class
from fixbench.knowledge import load_knowledge


def _family():
    return load_knowledge().family("pwm_flyback")


def test_live_primary_check_is_es3_with_the_mains_caution_and_the_deferral():
    family = _family()
    check = family.check("bulk_voltage")
    # The primary of an offline supply is ES3 when connected [src: IEC 62368-1 Table 4, memory]
    assert hazard_class(family, check, 5.0) == "ES3"
    notes = cautions_for(family, check)
    assert MAINS in notes and DEFER == notes[-1]


def test_cold_primary_check_asks_for_the_discharge_first():
    family = _family()
    check = family.check("mosfet_drain_source")
    assert hazard_class(family, check, 5.0) == "ES3 until discharged"
    assert BULK in cautions_for(family, check)


def test_series_lamp_step_carries_the_lamp_caution():
    family = _family()
    assert LAMP in cautions_for(family, family.check("series_lamp"))


def test_live_output_of_a_19_volt_adapter_is_es1():
    family = _family()
    # ES1 up to 60 V DC [src: IEC 62368-1 Table 4, memory for the exact figure]
    assert hazard_class(family, family.check("output_board"), 19.0) == "ES1"
    assert hazard_class(family, family.check("output_board"), 90.0) == "ES2"


def test_a_question_touches_nothing():
    family = _family()
    check = family.check("symptom_dead")
    assert hazard_class(family, check, 5.0) == "none" and cautions_for(family, check) == ()
