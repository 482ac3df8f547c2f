"""A family's design figures, parsed once into a frozen dataclass.

What kind of unit it is (controller or self-oscillating drive, the feedback, the output diode) is
fixed by the stage files the family is made of; how much (thresholds, frequency, ratings) is given by
the family's own [design] table. Every figure is a plain number in the SI unit its name ends in
(``start_v`` volts, ``switching_hz`` hertz, ``source_ohm`` ohms); each field's metadata names the
unit. The physics and the operating model read these fields, never the TOML.
"""

from __future__ import annotations

from dataclasses import dataclass, field, fields

DRIVES = ("controller", "self_oscillating")
FEEDBACKS = ("opto_tl431", "opto_zener", "primary_side")
OUTPUT_DIODES = ("schottky", "fast_silicon")
# Design keys a stage file fixes (its `design` table), with the values each may take.
STAGE_FACTS: dict[str, tuple[str, ...]] = {"drive": DRIVES, "feedback": FEEDBACKS, "output_diode": OUTPUT_DIODES}
# Figures a controller drive cannot run without; a self-oscillating drive has no Vcc to speak of.
NEEDED_BY_DRIVE: dict[str, tuple[str, ...]] = {
    "controller": ("start_v", "stop_v", "vcc_clamp_v", "vcc_target_v"),
    "self_oscillating": (),
}


def _figure(unit: str | None, default: object = ...) -> object:
    if default is ...:
        return field(metadata={"unit": unit})
    return field(default=default, metadata={"unit": unit})


@dataclass(frozen=True)
class Design:
    drive: str  # from the drive stage: "controller" or "self_oscillating"
    feedback: str  # from the feedback stage: "opto_tl431", "opto_zener" or "primary_side"
    output_diode: str  # from the output rectifier stage: "schottky" or "fast_silicon"
    switching_hz: float = _figure("Hz")  # nominal switching frequency
    switching_tolerance: float = _figure(None, 0.10)  # relative band of a healthy frequency reading
    switch_rating_v: float = _figure("V", 650.0)  # drain or collector rating of the switch
    source_ohm: float | None = _figure("ohm", None)  # mains source resistance in series with the bridge
    start_v: float | None = _figure("V", None)  # controller start threshold (UVLO on)
    stop_v: float | None = _figure("V", None)  # controller stop threshold (UVLO off)
    vcc_clamp_v: float | None = _figure("V", None)  # where Vcc ends up when the controller will not run
    vcc_target_v: float | None = _figure("V", None)  # Vcc the auxiliary winding holds when running
    controller_ref: str | None = _figure(None, None)  # the part the thresholds come from ("UC3842")
    pfc_bulk_v: float | None = _figure("V", None)  # bulk rail an active PFC front end holds when running
    pfc_hz: float | None = _figure("Hz", None)  # the PFC switch's frequency


FIGURES = tuple(f.name for f in fields(Design) if f.name not in STAGE_FACTS)


def unit_of(name: str) -> str | None:
    """The unit a design figure is written in (None: a ratio or a name)."""
    return next(f.metadata["unit"] for f in fields(Design) if f.name == name)


def parse_design(reader, facts: dict[str, str], sources: dict[str, str]) -> Design:
    """The figures in ``reader`` (the family's [design] table) with the kinds ``facts`` its stages fix
    (``sources``: the stage file that fixes each)."""
    for key in reader.table:
        if key in STAGE_FACTS:
            where = f"by {sources[key]}" if key in sources else "by a stage file"
            raise reader.fail(key, f"'{key}' is fixed {where}; choose another stage file rather than "
                                   "writing it here")
    reader.unknown_keys(set(FIGURES))
    for key, choices in STAGE_FACTS.items():
        if key not in facts:
            raise reader.fail(key, f"no stage of the family says what its '{key}' is; it needs a stage "
                                   f"whose file sets design.{key} (one of: {', '.join(choices)})")
    values: dict[str, object] = dict(facts)
    for name in FIGURES:
        if name == "controller_ref":
            values[name] = reader.get(name, str, None)
            continue
        number = reader.get(name, float, None)
        if number is None:
            continue
        if number <= 0:
            raise reader.fail(name, f"must be positive (in {unit_of(name) or 'a fraction'})")
        values[name] = number
    if ("pfc_bulk_v" in values) != ("pfc_hz" in values):
        raise reader.fail("pfc_bulk_v", "a PFC front end needs both pfc_bulk_v and pfc_hz")
    if "switching_hz" not in values:
        raise reader.fail("switching_hz", "missing")
    if not values.get("switching_tolerance", 0.10) < 1:
        raise reader.fail("switching_tolerance", "is a fraction of the frequency: below 1")
    for name in NEEDED_BY_DRIVE[facts["drive"]]:
        if name not in values:
            raise reader.fail(name, f"missing (needed for drive = '{facts['drive']}')")
    if facts["drive"] == "controller":
        start, stop, clamp, target = (values[k] for k in ("start_v", "stop_v", "vcc_clamp_v", "vcc_target_v"))
        if not stop < start < clamp:
            raise reader.fail("start_v", f"thresholds must rise stop_v < start_v < vcc_clamp_v "
                                         f"({stop:g} < {start:g} < {clamp:g})")
        if not stop < target < clamp:
            raise reader.fail("vcc_target_v", f"must lie between stop_v and vcc_clamp_v ({target:g})")
    return Design(**values)
