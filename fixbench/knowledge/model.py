"""What the knowledge files describe, as plain frozen dataclasses, and the words they may use.

A supply family is a set of stages joined by links, the parts inside each stage, the test points a
probe can touch, the checks a technician can make, the faults parts suffer, and its design figures.
The family files compose it from shared stage files (see :mod:`composition`). The engine and the
physics read these; nothing here computes anything.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from fixbench.knowledge.design import Design

# Instruments a check can use, and the unit each reads in (None: an outcome is picked, not typed).
INSTRUMENT_UNITS: dict[str, str | None] = {
    "ohmmeter": "ohm",
    "diode_test": "V",
    "capacitance": "F",
    "esr": "ohm",
    "dc_volts": "V",
    "ac_volts": "V",
    "ripple": "V",
    "frequency": "Hz",
    "eyes": None,
    "ears": None,
    "nose": None,
    "series_lamp": None,
    "question": None,
}
# cold: unplugged and discharged; lamp: mains through a series lamp; live: plain mains;
# none: nothing is touched (a symptom or a look).
POWER_STATES = ("none", "cold", "lamp", "live")
STAGE_ROLES = (
    "input", "rectifier", "pfc", "bulk", "startup", "drive", "switch", "clamp", "transformer",
    "output_rectifier", "output_filter", "feedback", "lead",
)
LINK_KINDS = ("power", "control")
SIDES = ("primary", "isolation", "secondary")
# Part roles the operating model reads, each with the stage roles a part playing it may sit in.
# A role outside this table would be silently ignored by the model, so the loader refuses it;
# tests/knowledge checks the table against the roles the model asks for.
PART_ROLES: dict[str, tuple[str, ...]] = {
    "fuse": ("input",), "inrush_limiter": ("input",),
    "bridge": ("rectifier",),
    "boost_inductor": ("pfc",), "boost_diode": ("pfc",), "pfc_switch": ("pfc",), "pfc_controller": ("pfc",),
    "bulk_capacitor": ("bulk",),
    "start_resistor": ("startup",), "vcc_capacitor": ("startup",), "aux_diode": ("startup",),
    "base_resistor": ("startup",),
    "controller": ("drive",), "drive_resistor": ("drive",), "drive_capacitor": ("drive",),
    "cutoff_transistor": ("drive",),
    "switch": ("switch",), "gate_resistor": ("switch",), "sense_resistor": ("switch",),
    "integrated_switch": ("switch",),  # controller and MOSFET in one package, started from the drain
    "clamp_diode": ("clamp",), "clamp_resistor": ("clamp",),
    "transformer": ("transformer",),
    "output_rectifier": ("output_rectifier",),
    "output_capacitor": ("output_filter",),
    "optocoupler": ("feedback",), "shunt_reference": ("feedback",), "feedback_upper": ("feedback",),
    "feedback_lower": ("feedback",),
    "lead": ("lead",),
}
PART_KINDS = (
    "fuse", "thermistor", "bridge", "electrolytic", "film_capacitor", "resistor", "fast_diode",
    "rectifier_diode", "schottky", "zener", "mosfet", "bjt", "controller", "transformer",
    "optocoupler", "tl431", "lead", "integrated_controller", "inductor",
)
# The pins of each kind of part, as the cold netlist names them, and those a stage file must place
# (a transformer has only the windings it is wound with; a controller's drive and FB pins may go
# unplaced where nothing of the model meets them).
KIND_PINS: dict[str, tuple[str, ...]] = {
    "fuse": ("a", "b"), "thermistor": ("a", "b"), "resistor": ("a", "b"), "lead": ("a", "b"),
    "inductor": ("a", "b"),
    "electrolytic": ("plus", "minus"), "film_capacitor": ("a", "b"),
    "rectifier_diode": ("anode", "cathode"), "fast_diode": ("anode", "cathode"),
    "schottky": ("anode", "cathode"), "zener": ("anode", "cathode"),
    "bridge": ("ac1", "ac2", "plus", "minus"),
    "mosfet": ("drain", "gate", "source"), "bjt": ("base", "collector", "emitter"),
    "controller": ("vcc", "gnd", "drive", "fb"),
    # an integrated-switch controller: drain pin (the MOSFET's, with the start-up current source),
    # source (the IC's ground), supply or bypass pin, feedback pin
    "integrated_controller": ("drain", "source", "vcc", "fb"),
    "optocoupler": ("anode", "cathode", "collector", "emitter"),
    "tl431": ("cathode", "anode", "ref"),
    "transformer": ("primary_a", "primary_b", "aux_a", "aux_b", "secondary_a", "secondary_b"),
}
# The unit a kind's value is written in (a fuse's value is its current rating, a transformer's its
# primary winding's resistance); other kinds are bought by type and have no value.
KIND_VALUE_UNITS: dict[str, str] = {
    "fuse": "A", "thermistor": "ohm", "electrolytic": "F", "film_capacitor": "F", "resistor": "ohm",
    "transformer": "ohm", "zener": "V", "inductor": "ohm",
}
KIND_REQUIRED_PINS: dict[str, tuple[str, ...]] = {
    "transformer": ("primary_a", "primary_b"), "controller": ("vcc", "gnd"),
    "integrated_controller": ("drain", "source", "vcc"),
}
# How the readings of a cold check's several probe pairs make the one number entered.
COMBINES = ("one", "odd_one_out", "lowest")
LIFTED_LEG = "lifted"  # a probe written this way goes on the leg the check lifts


@dataclass(frozen=True)
class Stage:
    id: str
    title: str
    role: str
    side: str
    template: str = ""  # the stage file it was made from ("feedback/tl431_opto")


@dataclass(frozen=True)
class Link:
    source: str
    target: str
    kind: str


@dataclass(frozen=True)
class Part:
    id: str
    stage: str
    kind: str
    role: str
    title: str
    value: str | None = None  # "22 uF", "rule:bulk_capacitance" or None where a value means nothing
    rated: str | None = None  # voltage rating of a capacitor, same forms as value
    cost: float = 0.0
    pins: tuple[tuple[str, str], ...] = ()  # (pin, node) in the cold netlist, e.g. ("a", "bulk_plus")
    # What a board profile says of this part on the board in hand (knowledge.board): its own
    # designator(s), the number of resistors of a chain, the marking as typed and the package.
    # value and rated then hold the marking's figures; empty marking: the family's typical part.
    designator: str = ""
    count: int = 1
    marking: str = ""
    package: str = ""
    id_on_board_elsewhere: bool = False  # the board gives this part's family designator to another part

    def node(self, pin: str) -> str:
        return dict(self.pins)[pin]

    @property
    def label(self) -> str:
        """The part's name as the technician finds it on the board: the board's designator where a
        profile gives one, the family's otherwise, said to be the typical part's where the board
        uses that designator for another part."""
        if self.designator:
            return self.designator
        return f"{self.id} (typical)" if self.id_on_board_elsewhere else self.id

    @property
    def marked(self) -> bool:
        return bool(self.marking)


@dataclass(frozen=True)
class TestPoint:
    id: str
    stage: str
    title: str


@dataclass(frozen=True)
class Check:
    id: str
    title: str
    instrument: str
    power: str
    points: tuple[str, ...]
    target: str  # "part:ID" (that part's cold reading) or "signal:NAME" (from the operating model)
    minutes: float
    how: str
    outcomes: tuple[str, ...] = ()
    procedure: bool = False  # a safety step that tells nothing about the fault
    # Cold checks of a part: the nodes the probes go on, red first, one pair per leg; how several
    # legs make one number; and a leg (part, pin) lifted off its pad first.
    probes: tuple[tuple[str, str], ...] = ()
    combine: str = "one"
    lift: tuple[str, str] | None = None

    @property
    def unit(self) -> str | None:
        return INSTRUMENT_UNITS[self.instrument]

    @property
    def target_kind(self) -> str:
        return self.target.split(":", 1)[0]

    @property
    def target_id(self) -> str:
        return self.target.split(":", 1)[1]


@dataclass(frozen=True)
class Collateral:
    part: str
    mode: str
    probability: float


@dataclass(frozen=True)
class Fault:
    id: str
    part: str
    mode: str
    title: str
    weight: float
    source: str
    collateral: tuple[Collateral, ...] = ()


@dataclass(frozen=True, eq=False)
class Family:
    """One supply family. Compared and hashed by identity: each is loaded once per process."""

    id: str
    title: str
    summary: str
    examples: tuple[str, ...]
    identify: dict[str, tuple[str, ...]]  # intake question id -> the answers this family's boards give
    design: Design
    stages: tuple[Stage, ...]
    links: tuple[Link, ...]
    parts: tuple[Part, ...]
    test_points: tuple[TestPoint, ...]
    checks: tuple[Check, ...]
    faults: tuple[Fault, ...]
    source_file: str = ""
    _index: dict = field(default_factory=dict, compare=False, repr=False)

    def __post_init__(self) -> None:
        self._index.update(
            stage={s.id: s for s in self.stages},
            part={p.id: p for p in self.parts},
            point={t.id: t for t in self.test_points},
            check={c.id: c for c in self.checks},
            fault={f.id: f for f in self.faults},
        )

    def stage(self, stage_id: str) -> Stage:
        return self._index["stage"][stage_id]

    def part(self, part_id: str) -> Part:
        return self._index["part"][part_id]

    def test_point(self, point_id: str) -> TestPoint:
        return self._index["point"][point_id]

    def check(self, check_id: str) -> Check:
        return self._index["check"][check_id]

    def fault(self, fault_id: str) -> Fault:
        return self._index["fault"][fault_id]

    def has_check(self, check_id: str) -> bool:
        return check_id in self._index["check"]

    def parts_with_role(self, role: str) -> tuple[Part, ...]:
        return tuple(p for p in self.parts if p.role == role)

    def touches_primary(self, check: Check) -> bool:
        """Whether a check puts probes on the primary side (hazardous when powered)."""
        return any(self.stage(self.test_point(p).stage).side == "primary" for p in check.points)


@dataclass(frozen=True)
class Answer:
    id: str
    text: str  # as the technician picks it
    board: str  # what such a board has, for saying why a family does not fit ("no optocoupler")


@dataclass(frozen=True)
class Question:
    """One thing a technician can tell by looking at the board, asked at intake."""

    id: str
    text: str
    answers: tuple[Answer, ...]

    def answer(self, answer_id: str) -> Answer:
        return next(a for a in self.answers if a.id == answer_id)


@dataclass(frozen=True)
class KnowledgeBase:
    families: dict[str, Family]
    questions: tuple[Question, ...] = ()

    def family(self, family_id: str) -> Family:
        try:
            return self.families[family_id]
        except KeyError:
            known = ", ".join(sorted(self.families))
            raise KeyError(f"unknown supply family '{family_id}' (known: {known})") from None


# Failure modes each kind of part can suffer.
KIND_MODES: dict[str, tuple[str, ...]] = {
    "fuse": ("open",),
    "thermistor": ("open",),
    "bridge": ("short", "open"),
    "electrolytic": ("dried", "short"),
    "film_capacitor": ("short", "open"),
    "resistor": ("open", "drift"),
    "fast_diode": ("open", "short"),
    "rectifier_diode": ("open", "short"),
    "schottky": ("open", "short"),
    "zener": ("open", "short"),
    "mosfet": ("short", "open"),
    "bjt": ("short", "open"),
    "controller": ("dead", "short"),
    "integrated_controller": ("short", "dead"),  # short: drain to source, the whole IC destroyed
    "transformer": ("open",),
    "inductor": ("open",),
    "optocoupler": ("open", "short"),
    "tl431": ("open", "short"),
    "lead": ("open",),
}

# Signals the operating model produces; a check's "signal:NAME" target must be one of these.
SIGNALS = (
    "bulk_voltage", "bulk_ripple", "vcc_voltage", "vcc_behaviour", "switching_frequency",
    "output_voltage", "output_loaded", "output_ripple", "plug_voltage",
    "opto_led_voltage", "feedback_reference", "base_voltage", "drain_peak", "pfc_frequency", "bridge_ac", "lamp", "residual_bulk", "dead",
    "intermittent", "output_low", "output_high", "ticking", "whine", "hot", "fuse_blackened",
    "bulged", "scorched", "burnt_smell",
)
