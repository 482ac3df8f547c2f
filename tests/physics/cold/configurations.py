"""The in-circuit set-ups the cold-network solve is checked on against ngspice: every example of
issue 10 and more, each a board, a fault (or none), where the probes go and the instrument."""

from __future__ import annotations

from dataclasses import dataclass

from fixbench.physics.cold.board_part import BoardPart
from fixbench.physics.cold.netlist import ColdNetlist
from tests.physics.cold import boards


@dataclass(frozen=True)
class Setup:
    name: str
    netlist: ColdNetlist
    red: str
    black: str
    instrument: str  # "ohmmeter", "low_voltage_ohms" or "diode_test"
    why: str


def _zener_alone(volts: float) -> ColdNetlist:
    return ColdNetlist((BoardPart("ZD1", "zener", (("anode", "a"), ("cathode", "k")), volts),))


PS = boards.primary_side()
TL = boards.opto_tl431()
SO = boards.self_oscillating()

SETUPS = [
    Setup("ps_fb_upper", PS, "aux", "fb", "ohmmeter",
          "issue 10: the aux winding puts the lower resistor across the upper one"),
    Setup("ps_fb_upper_reversed", PS, "fb", "aux", "ohmmeter", "same, probes swapped"),
    Setup("ps_fb_upper_lifted", PS.with_lifted("R5", "b"), "aux", "R5.b(lifted)", "ohmmeter",
          "the upper resistor with one leg lifted reads alone"),
    Setup("ps_fb_lower", PS, "fb", "pgnd", "ohmmeter", "lower FB resistor with the upper across it"),
    Setup("ps_output_rectifier", PS, "sec", "out", "diode_test",
          "issue 10: the output capacitor through the secondary shunts the rectifier (settled)"),
    Setup("ps_output_rectifier_reversed", PS, "out", "sec", "diode_test", "reverse: the capacitor charges to OL"),
    Setup("ps_vcc_red_on_ground", PS, "pgnd", "vcc", "ohmmeter",
          "issue 10: the aux diode conducts in one polarity from Vcc to ground"),
    Setup("ps_vcc_red_on_vcc", PS, "vcc", "pgnd", "ohmmeter", "Vcc to ground, aux diode reversed"),
    Setup("ps_vcc_aux_diode_shorted", PS.with_mode("D2", "short"), "vcc", "pgnd", "ohmmeter",
          "issue 10: a shorted aux diode reads like a shorted controller"),
    Setup("ps_vcc_capacitor_shorted", PS.with_mode("C2", "short"), "vcc", "pgnd", "ohmmeter",
          "a shorted Vcc capacitor reads like a shorted controller"),
    Setup("ps_vcc_controller_shorted", PS.with_mode("U1", "short"), "pgnd", "vcc", "ohmmeter",
          "a controller shorted inside"),
    Setup("ps_mosfet_body_forward_ohms", PS, "source", "drain", "ohmmeter",
          "issue 10: drain-source on ohms conducts through the body diode one way"),
    Setup("ps_mosfet_body_reverse_ohms", PS, "drain", "source", "ohmmeter", "drain-source, body diode reversed"),
    Setup("ps_mosfet_low_voltage_ohms", PS, "source", "drain", "low_voltage_ohms",
          "low-voltage ohms keeps the body diode nearly off"),
    Setup("ps_mosfet_body_diode_test", PS, "source", "drain", "diode_test", "the body diode on diode test"),
    Setup("ps_clamp_resistor_diode_forward", PS, "bulk", "clamp", "ohmmeter",
          "issue 10: the clamp diode and primary sit across the clamp resistor one way"),
    Setup("ps_clamp_resistor_diode_reverse", PS, "clamp", "bulk", "ohmmeter", "clamp resistor, diode reversed"),
    Setup("ps_shorted_mosfet_from_bulk", PS.with_mode("Q1", "short"), "bulk", "pgnd", "ohmmeter",
          "issue 10: a shorted MOSFET seen through the primary and the sense resistor"),
    Setup("ps_shorted_mosfet_from_bulk_reversed", PS.with_mode("Q1", "short"), "pgnd", "bulk", "ohmmeter",
          "same, probes swapped"),
    Setup("ps_start_resistor", PS, "bulk", "vcc", "ohmmeter", "start-up resistor with the controller behind it"),
    Setup("ps_sense_resistor", PS, "source", "pgnd", "ohmmeter", "sense resistor in circuit"),
    Setup("tl_fb_lower", TL, "ref", "sgnd", "ohmmeter", "issue 10: TL431 divider, lower resistor"),
    Setup("tl_fb_lower_reversed", TL, "sgnd", "ref", "ohmmeter",
          "TL431 divider, lower resistor, the secondary and rectifier across it one way"),
    Setup("tl_fb_upper", TL, "out", "ref", "ohmmeter", "issue 10: TL431 divider, upper resistor"),
    Setup("tl_opto_led", TL, "out", "k", "diode_test", "opto LED in circuit"),
    Setup("bridge_diode_forward", PS, "ac1", "bulk", "diode_test", "issue 10: bridge diode ~ to + in circuit"),
    Setup("bridge_diode_lower_forward", PS, "pgnd", "ac1", "diode_test", "bridge diode - to ~ in circuit"),
    Setup("bridge_open_diode", PS.with_mode("BD1", "open"), "ac1", "bulk", "diode_test",
          "issue 10: an open bridge diode in circuit"),
    Setup("bridge_shorted_diode_reversed", PS.with_mode("BD1", "short"), "bulk", "ac1", "diode_test",
          "a shorted bridge diode reads near 0 V both ways"),
    Setup("so_base_emitter", SO, "base", "emitter", "diode_test",
          "NPN base-emitter with the cut-off transistor across it"),
    Setup("so_collector_emitter_ohms", SO, "emitter", "collector", "ohmmeter",
          "NPN collector-emitter through the junctions and the base resistor"),
    Setup("so_base_resistor", SO, "bulk", "base", "ohmmeter", "base bias resistor in circuit"),
    Setup("zener_breakdown_diode_test", _zener_alone(2.4), "k", "a", "diode_test",
          "a 2.4 V Zener reversed breaks down under the diode test's 3 V (2.3 V across it, over the display)"),
    Setup("zener_forward_diode_test", _zener_alone(2.4), "a", "k", "diode_test", "the same Zener forward"),
]
