"""The parsed train definition: frozen dataclasses, checked once while loading.

Lengths are millimetres, angles degrees (``_deg``), periods exact ``Fraction`` seconds.
Tooth-shape coefficients (``addendum``, ``dedendum``, ``root_radius``, ``tip_radius``) are
multiples of the module, as in the basic-rack standards.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field
from fractions import Fraction
from typing import Literal

from .units import Units

__all__ = [
    "Where",
    "Process",
    "Frame",
    "PillarSpec",
    "Drive",
    "Arbor",
    "Wheel",
    "Mesh",
    "PinSlot",
    "Target",
    "Stock",
    "Hand",
    "Dial",
    "Display",
    "DriveInput",
    "Design",
    "ProcessKind",
    "Form",
    "Seat",
    "Sense",
    "RelativeSense",
    "axis_root_of",
    "Pivot",
    "StockKind",
    "HandSeat",
    "Graduations",
    "HAND_SEAT_BY_PROCESS",
    "DEFAULT_BED",
    "LeastPlay",
]

ProcessKind = Literal["print", "mill", "hand"]
Form = Literal["involute", "triangular"]
Seat = Literal["round", "square", "hex", "pinned"]
#: Sense of rotation seen from the front: the one word for it in every layer.
Sense = Literal["cw", "ccw"]
#: How one member turns relative to another (an output and its input, an index plate
#: and its crank): the one word for that.
RelativeSense = Literal["same", "opposite"]
Pivot = Literal["hole", "bush", "bearing"]
StockKind = Literal["tube", "bush", "bearing", "rod"]
HandSeat = Literal["square", "flat", "collet"]
Graduations = Literal["auto", "hours", "days", "month", "year", "degrees", "labels"]

#: How a hand (or a knob or crank) is held on its arbor when the design does not say:
#: a milled square, a flat filed or printed on a round end, a friction collet made by hand
#: (common practice, no source).
HAND_SEAT_BY_PROCESS: dict[str, HandSeat] = {
    "mill": "square",
    "print": "flat",
    "hand": "collet",
}
#: Which proportion a ``least_play`` request may change.
LeastPlay = Literal["backlash", "addendum"]


@dataclass(frozen=True, slots=True)
class Where:
    """Where something was written: file, item (``wheel "w3"``, ``the 2nd [[mesh]]``), key."""

    file: str
    item: str = ""
    key: str = ""
    line: int | None = None

    def __str__(self) -> str:
        parts = [self.file]
        if self.line is not None:
            parts.append(f"line {self.line}")
        if self.item:
            parts.append(self.item)
        if self.key:
            parts.append(f"key '{self.key}'")
        return ", ".join(parts)


#: The build plate a printed design is laid out for when it names none, x and y in mm:
#: the smaller desk printers' beds are 200 to 250 mm square, so parts planned for
#: 200 mm fit on most (common practice, no source).
DEFAULT_BED: tuple[float, float] = (200.0, 200.0)


@dataclass(frozen=True, slots=True)
class Process:
    """How the parts are made and the limits that follow from it (mm)."""

    kind: ProcessKind = "mill"
    nozzle: float = 0.4  # print: nozzle diameter
    layer: float = 0.2  # print: layer height
    clearance: float = 0.2  # print: radial running clearance of bores and sleeves
    cutter: float = 1.0  # mill: end-mill diameter
    fit: str = "H7/g6"  # mill: ISO 286 running fit for bores
    min_wall: float | None = None  # thinnest sleeve wall; None = the process default
    min_module_hand: float = 0.5  # hand: smallest module still filed by hand
    min_layers: int = 4  # print: face width at least this many layers
    min_backlash: float | None = (
        None  # mm the process holds in a mesh; None = its default
    )
    centre_tolerance: float | None = (
        None  # mm a placed centre may be off; None = default
    )
    bed: tuple[float, float] = DEFAULT_BED  # print: the build plate, x and y, mm

    @property
    def hand_seat(self) -> HandSeat:
        """The seat of a hand, knob or crank on its arbor when the design sets none."""
        return HAND_SEAT_BY_PROCESS[self.kind]


@dataclass(frozen=True, slots=True)
class Frame:
    """Back and front plates: heights of their inner faces and their thickness (mm).

    The outline is found round the wheels unless ``rectangle`` (x0, y0, x1, y1) or
    ``polygon`` (corner points) gives it; ``corner`` rounds the given outline's corners.
    ``margin``, ``clearance`` and ``pillar_diameter`` are ``None`` for the process's
    default (see :mod:`wheelgen.frame.limits`); ``pillars`` is how many pillars are
    placed when the design gives no ``[[pillar]]``; ``screw`` the metric screw size
    that fixes pillars and cocks ("M3").
    """

    plates: tuple[float, float] = (0.0, 40.0)
    thickness: float = 2.0
    margin: float | None = None
    clearance: float | None = None
    rectangle: tuple[float, float, float, float] | None = None
    polygon: tuple[tuple[float, float], ...] | None = None
    corner: float = 3.0
    pillars: int = 4
    pillar_diameter: float | None = None
    screw: str = "M3"


@dataclass(frozen=True, slots=True)
class PillarSpec:
    """A pillar placed by the design: its axis at ``at`` (mm, the arbors' frame)."""

    at: tuple[float, float]
    index: int = 0  # 1-based position among the [[pillar]] tables
    where: Where | None = field(default=None, compare=False, repr=False)


@dataclass(frozen=True, slots=True)
class Drive:
    arbor: str
    period_s: Fraction
    sense: Sense = "ccw"
    where: Where | None = field(default=None, compare=False, repr=False)


@dataclass(frozen=True, slots=True)
class Arbor:
    """A shaft, a sleeve around another arbor (``around``), or an axis on a carrier wheel."""

    name: str
    at: tuple[float, float] | None = None
    diameter: float = 3.0
    around: str | None = None
    fixed: bool = False
    carrier: str | None = None  # name of the wheel that carries this arbor's axis
    pivot: Pivot = "hole"  # what it runs in where a plate holds it
    where: Where | None = field(default=None, compare=False, repr=False)


def axis_root_of(arbors: Mapping[str, Arbor], name: str) -> str:
    """The innermost member of the coaxial group of arbor ``name``: the walk from a tube
    through the members it surrounds to the shaft on its axis (chains must end)."""
    while (around := arbors[name].around) is not None:
        name = around
    return name


@dataclass(frozen=True, slots=True)
class Wheel:
    """One wheel on one arbor; module and face width in mm, angles in degrees.

    A wheel cut to a diametral pitch keeps it in ``diametral_pitch`` (teeth per inch);
    its ``module`` is then 25.4 / that, and its proportions the inch standard's.
    """

    name: str
    arbor: str
    teeth: int
    height: float = 0.0
    module: float = 1.0
    form: Form = "involute"
    pressure_angle_deg: float = 20.0
    tooth_angle_deg: float = 60.0
    face_width: float = 3.0
    shift: float = 0.0
    backlash: float = 0.05
    addendum: float = 1.0  # x module
    dedendum: float = 1.25  # x module
    root_radius: float = (
        0.38  # x module (rack tip radius for involute, root rounding for triangular)
    )
    tip_radius: float = 0.0  # x module (triangular tip rounding)
    bore: float | None = (
        None  # None: the arbor's (or sleeve's) outside diameter plus the fit
    )
    seat: Seat = "round"
    spokes: int = 0
    rim: float | None = None  # rim width below the root circle when spoked (mm)
    hub_diameter: float = 0.0  # 0 = no hub boss
    hub_length: float = 0.0
    where: Where | None = field(default=None, compare=False, repr=False)
    # teeth per inch when the wheel is cut to a diametral pitch (module = 25.4 / it,
    # inch tooth proportions); None for a module wheel
    diametral_pitch: float | None = None

    @property
    def pitch_diameter(self) -> float:
        return self.module * self.teeth


@dataclass(frozen=True, slots=True)
class Mesh:
    """Two wheels in external mesh; ``bearing_deg`` from the first axis to the second."""

    pair: tuple[str, str]
    bearing_deg: float | None = None
    index: int = 0  # 1-based position among the [[mesh]] tables
    where: Where | None = field(default=None, compare=False, repr=False)
    #: asks for the least play that runs, reached by changing this proportion
    least_play: LeastPlay | None = None
    #: what was chosen for ``least_play``, in words (empty until it is settled)
    chosen: str = ""

    @property
    def label(self) -> str:
        return f"mesh {self.pair[0]}-{self.pair[1]}"


@dataclass(frozen=True, slots=True)
class PinSlot:
    """A pin at ``radius`` on wheel ``pin`` driving a radial slot in wheel ``slot``."""

    name: str
    pin: str
    slot: str
    radius: float
    offset: float
    bearing_deg: float = 0.0
    pin_diameter: float = 1.0
    pin_part: Literal["boss", "separate"] = "boss"
    where: Where | None = field(default=None, compare=False, repr=False)


@dataclass(frozen=True, slots=True)
class Target:
    """A wanted period (``period_s``) or an exact rate (``turns`` per drive turn)."""

    arbor: str
    period_s: Fraction | None = None
    turns: Fraction | None = None
    tolerance_ppm: float | None = None
    tolerance_s: Fraction | None = None
    sense: Sense | Literal["either"] = "either"
    index: int = 0
    where: Where | None = field(default=None, compare=False, repr=False)


@dataclass(frozen=True, slots=True)
class Stock:
    """A tube, bush, ball bearing or rod on hand: diameters and width in mm.

    ``width`` is the axial length of a bush or bearing (``None`` for a tube or rod);
    a rod is solid (``inside`` 0).
    """

    outside: float
    inside: float
    where: Where | None = field(default=None, compare=False, repr=False)
    kind: StockKind = "tube"
    width: float | None = None


class _Lookup:
    """A design's arbors and wheels by name, made once (the first of equal names wins,
    as a search in file order would find it)."""

    __slots__ = ("arbors", "wheels", "wheels_on", "sleeves_on", "carried_by")

    def __init__(self, arbors: tuple[Arbor, ...], wheels: tuple[Wheel, ...]) -> None:
        self.arbors: dict[str, Arbor] = {}
        self.wheels: dict[str, Wheel] = {}
        on: dict[str, list[Wheel]] = {}
        around: dict[str, list[str]] = {}
        carried: dict[str, list[Arbor]] = {}
        for a in arbors:
            self.arbors.setdefault(a.name, a)
            if a.around is not None:
                around.setdefault(a.around, []).append(a.name)
            if a.carrier is not None:
                carried.setdefault(a.carrier, []).append(a)
        for w in wheels:
            self.wheels.setdefault(w.name, w)
            on.setdefault(w.arbor, []).append(w)
        self.wheels_on = {k: tuple(v) for k, v in on.items()}
        self.sleeves_on = {k: tuple(v) for k, v in around.items()}
        self.carried_by = {k: tuple(v) for k, v in carried.items()}


@dataclass(frozen=True, slots=True)
class Hand:
    """A hand on the front end of an arbor; lengths in mm.

    ``None`` sizes follow the dial and the process. ``rest`` is the reading the hand
    shows when the train is at rest, in the units of its dial (hours, days, degrees, or
    the number of a label counted from 0). ``from_target`` marks a hand made by
    default because the arbor is a target's.
    """

    arbor: str
    length: float | None = None  # axis to tip
    tail: float | None = None  # axis to the end of the tail, behind the axis
    counterweight: float = 0.0  # diameter of a round counterweight on the tail; 0: none
    width: float | None = None  # blade width at the hub
    thickness: float | None = None
    seat: HandSeat | None = None  # None: the process's (Process.hand_seat)
    rest: float = 0.0
    from_target: bool = False
    where: Where | None = field(default=None, compare=False, repr=False)


@dataclass(frozen=True, slots=True)
class Dial:
    """The graduated ring read by the hand on ``arbor``; ``radius`` its outside, mm.

    Rings on one axis are made as one dial disc, as large as the largest ring.
    ``zero_deg`` is where the ring's zero stands, counter-clockwise from +x (90: top).
    """

    arbor: str
    radius: float | None = None
    graduations: Graduations = "auto"
    labels: tuple[str, ...] = ()
    zero_deg: float = 90.0
    where: Where | None = field(default=None, compare=False, repr=False)


@dataclass(frozen=True, slots=True)
class Display:
    """What is shown in front of the front plate, and its axial spacing (mm).

    ``readings``: ``"targets"`` gives every target's arbor a hand unless a
    ``[[hand]]`` restyles it; ``"none"`` shows only the hands the design lists.
    ``None`` sizes follow the process.
    """

    readings: Literal["targets", "none"] = "targets"
    dial_gap: float | None = None  # front plate's outer face to the dials' back
    hand_gap: float = 1.0  # axial clearance between dial, hands and arbor ends
    dial_thickness: float | None = None
    hand_thickness: float | None = None


@dataclass(frozen=True, slots=True)
class DriveInput:
    """A knob or a crank on the drive arbor, at the front or the back (mm).

    ``side`` ``None``: at the back when the drive's axis carries a hand, else the front.
    ``diameter`` is the knob's, or the crank handle's; ``throw`` the crank's radius.
    """

    kind: Literal["knob", "crank", "none"] = "knob"
    side: Literal["front", "back"] | None = None
    diameter: float | None = None
    throw: float | None = None
    where: Where | None = field(default=None, compare=False, repr=False)


@dataclass(frozen=True, slots=True)
class Design:
    """A whole train definition, checked while loading."""

    title: str
    name: str  # safe file name of the design (from the file name)
    drive: Drive
    arbors: tuple[Arbor, ...]
    wheels: tuple[Wheel, ...] = ()
    meshes: tuple[Mesh, ...] = ()
    pinslots: tuple[PinSlot, ...] = ()
    targets: tuple[Target, ...] = ()
    stock: tuple[Stock, ...] = ()
    process: Process = Process()
    frame: Frame | None = None
    pillars: tuple[PillarSpec, ...] = ()
    hands: tuple[Hand, ...] = ()  # as written; see readings() for the defaults
    dials: tuple[Dial, ...] = ()
    display: Display = Display()
    drive_input: DriveInput = DriveInput()
    source: str = ""  # path of the file it came from
    sha256: str = ""  # of the file's bytes
    units: Units = "mm"  # what the sheets and drawings are written in
    # Look-ups by name, made once: every layer asks for arbors and wheels by name, and
    # a linear search per question made large trains quadratic.
    _by: _Lookup = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        object.__setattr__(self, "_by", _Lookup(self.arbors, self.wheels))

    def arbor(self, name: str) -> Arbor:
        return self._by.arbors[name]

    def wheel(self, name: str) -> Wheel:
        return self._by.wheels[name]

    def wheels_on(self, arbor: str) -> tuple[Wheel, ...]:
        return self._by.wheels_on.get(arbor, ())

    def sleeves_on(self, arbor: str) -> tuple[str, ...]:
        """Names of the sleeves whose ``around`` is ``arbor``, in file order."""
        return self._by.sleeves_on.get(arbor, ())

    def carried_by(self, wheel: str) -> tuple[Arbor, ...]:
        """The arbors whose ``carrier`` is ``wheel``, in file order."""
        return self._by.carried_by.get(wheel, ())

    def axis_root(self, arbor: str) -> str:
        """The innermost member of ``arbor``'s coaxial group (itself unless a sleeve)."""
        return axis_root_of(self._by.arbors, arbor)

    def inner_members(self, arbor: str) -> tuple[str, ...]:
        """The members a sleeve surrounds, from the next one in to the axis root."""
        out: list[str] = []
        a = self.arbor(arbor)
        while a.around is not None:
            out.append(a.around)
            a = self.arbor(a.around)
        return tuple(out)

    def carrier_arbor(self, arbor: str) -> str | None:
        """The arbor whose wheel carries ``arbor``'s axis round (through any nesting);
        ``None`` for an axis standing in the plates."""
        carrier = self.arbor(self.axis_root(arbor)).carrier
        return None if carrier is None else self.wheel(carrier).arbor

    def readings(self) -> tuple[Hand, ...]:
        """Every hand: those written, then one for each target's arbor that has none.

        Targets give no hands when ``[display] readings = "none"``; a target on a
        fixed arbor gives none either (there is nothing to show).
        """
        out = list(self.hands)
        have = {h.arbor for h in self.hands}
        if self.display.readings == "targets":
            fixed = {a.name for a in self.arbors if a.fixed}
            for t in self.targets:
                if t.arbor not in have and t.arbor not in fixed:
                    out.append(Hand(t.arbor, from_target=True, where=t.where))
                    have.add(t.arbor)
        return tuple(out)
