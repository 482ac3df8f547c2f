"""Flyback transformer relations: turns ratio, reflected voltage, switch stress, auxiliary winding.

(Vo + VD) = (Vin - VDS) * (Ns/Np) * D / (1 - D) in continuous conduction; Np/Ns = VOR / (Vo + VD);
auxiliary winding Vaux = (Vo + VD) * Na/Ns - VDa [src: textbook flyback relations; worked example
in the LM3101 datasheet application section: Vo 5 V, VF 0.7 V, Vin_min 127 V, VSW 0.9 V, Dmax 0.28
gives Ns/Np = 0.12].
Reflected voltage VOR about 60 V for 100/115 V designs and about 135 V for 230 V and universal
designs; switch stress VDS = Vbulk_max + VOR + leakage spike [src: Power Integrations AN-19].
"""

from __future__ import annotations

VOR_LOW_LINE = 60.0  # AN-19: 100/115 VAC designs
VOR_WIDE_OR_HIGH_LINE = 135.0  # AN-19: 230 VAC and universal designs
# The clamp holds the leakage spike to roughly 0.5 * VOR above the reflected plateau in a typical
# RCD-clamped charger [memory]; used only for the drain-peak band, not for a diagnosis threshold.
LEAKAGE_SPIKE_FRACTION = 0.5


def secondary_to_primary_ratio(v_out: float, v_diode: float, v_in_min: float, v_switch: float,
                               duty_max: float) -> float:
    """Ns/Np from the continuous-mode volt-second balance at minimum input and maximum duty."""
    return (v_out + v_diode) * (1.0 - duty_max) / ((v_in_min - v_switch) * duty_max)


def reflected_voltage_design(universal_or_high_line: bool) -> float:
    """The designer's usual VOR for the input range (AN-19)."""
    return VOR_WIDE_OR_HIGH_LINE if universal_or_high_line else VOR_LOW_LINE


def primary_to_secondary_ratio(vor: float, v_out: float, v_diode: float) -> float:
    """Np/Ns = VOR / (Vo + VD)."""
    return vor / (v_out + v_diode)


def drain_peak(bulk_max: float, vor: float, spike_fraction: float = LEAKAGE_SPIKE_FRACTION) -> float:
    """Switch off-state peak: bulk + reflected + leakage spike (AN-19)."""
    return bulk_max + vor * (1.0 + spike_fraction)


def auxiliary_voltage(v_out: float, v_diode: float, aux_to_secondary: float, v_aux_diode: float) -> float:
    """Rectified auxiliary winding: (Vo + VD) * Na/Ns - VDa."""
    return (v_out + v_diode) * aux_to_secondary - v_aux_diode


def aux_turns_for(vcc_target: float, v_out: float, v_diode: float, v_aux_diode: float) -> float:
    """Na/Ns a designer picks to hold Vcc at ``vcc_target`` when the output is in regulation."""
    return (vcc_target + v_aux_diode) / (v_out + v_diode)
