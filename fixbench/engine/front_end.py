"""The active PFC front end in the operating model: a boost stage between the bridge and the bulk
capacitor (boost inductor, boost diode, PFC switch and its controller).

Theory of operation. Mains equipment above 75 W input must meet the harmonic-current limits of
IEC 61000-3-2, so larger adapters shape their input current with a boost converter [src: IEC
61000-3-2; the 75 W threshold: memory]. With the PFC running the bulk rail is held at its own set
point, about 380-400 V DC at any mains voltage; with it stopped the boost inductor and diode just
pass the rectified peak, about 325 V at 230 V and 170 V at 120 V: the key bench tell [practice;
trade primer section 9]. The PFC controller runs from the same Vcc rail as the PWM controller, so
the boost starts only once the flyback's controller is up; before that the bulk charges to the
rectified peak through the inductor and diode, which is what starts the flyback [practice]. The
flyback is sized for the boosted rail, so on the bare peak it sags at rated load.

An open inductor or diode leaves the bulk capacitor with nothing to charge it; a shorted PFC switch,
or a shorted boost diode that lets the switch short the bulk capacitor, is a primary short.

The steps take the operating model's work-in-progress (``operating._Work``), which imports them.
"""

from __future__ import annotations

# Drives of the flyback controller under which its Vcc rail, and so the PFC controller, is up.
VCC_UP = ("running", "latched")
# The flyback behind a PFC is sized for the boosted rail, with a margin for the hold-up time: it
# delivers its rated power down to about this share of the set point; below it, at rated load, it
# runs into its current limit and the output sags [practice].
FLYBACK_MIN_SHARE = 0.85
SAGGED_OUTPUT = 0.6  # loaded output of a flyback in its current limit, share of rated [practice]


def has_front_end(w) -> bool:
    return bool(w.family.parts_with_role("pfc_switch"))


def pfc_stage(w) -> None:
    """Whether anything reaches the bulk capacitor (a step in power order, before the bulk)."""
    if w.family.design.pfc_bulk_v is None:
        raise ValueError(f"{w.family.source_file}: a family with a PFC stage needs design.pfc_bulk_v")
    path_open = w.mode("boost_inductor") == "open" or w.mode("boost_diode") == "open"
    w.flags["bulk_dead"] = path_open and w.flags["mains_ok"]


def settle_bulk(w) -> None:
    """The bulk rail once the flyback's controller has started (or not): boosted, or the peak."""
    if not has_front_end(w):
        return
    w.values["pfc_frequency"] = 0.0
    if not w.flags["mains_ok"]:
        return
    if w.flags.get("bulk_dead"):
        w.values.update(bulk_voltage=0.0, bulk_ripple=0.0)
        return
    # the gate is driven whenever the PFC controller has its Vcc; an open switch does not boost
    driven = w.flags.get("drive") in VCC_UP and w.mode("pfc_controller") == "ok"
    runs = driven and w.mode("pfc_switch") == "ok"
    w.flags["pfc_running"] = runs
    w.values["bulk_voltage"] = w.nominal("bulk_voltage") if runs else w.healthy.figures["bulk_without_pfc"].nominal
    w.values["pfc_frequency"] = w.nominal("pfc_frequency") if driven else 0.0
    if not runs and w.values["bulk_voltage"] < FLYBACK_MIN_SHARE * w.family.design.pfc_bulk_v:
        w.values["output_loaded"] = min(w.values["output_loaded"], SAGGED_OUTPUT * w.v_out)
