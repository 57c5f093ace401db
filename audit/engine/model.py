"""The review model: frozen records in plain SI floats (m, N, N/m, Pa, rad).

Built by ``read_model`` from the reviewer's YAML; every later stage reads these and nothing
else. Each record keeps the location it came from so later findings can point back at it.
"""

from __future__ import annotations

import datetime as dt
from dataclasses import dataclass, field
from functools import cached_property

from audit.core.errors import Location

SPECIFIED_CASES = ("D", "L", "S", "W", "E")
# Load cases a load may split into: wind as pressure and as suction, live load of storage,
# equipment or service rooms (another companion factor and, in O86, long-term duration).
WIND_PRESSURE = "W:pressure"
WIND_SUCTION = "W:suction"
STORAGE_LIVE = "L:storage"


def base_case(case: str) -> str:
    """The load case a split case belongs to: W:suction is wind, L:storage is live load."""
    return case.split(":", 1)[0]


FACTORED_PREFIX = "factored:"
PLY_FIT = 0.5e-3  # m: plies times their thickness must make up b or d to this


def normalise_label(label: str) -> str:
    """How calc labels and model ids are compared: case and runs of spaces do not count."""
    return " ".join(label.casefold().split())


@dataclass(frozen=True)
class Material:
    id: str
    family: str
    species: str = ""
    grade: str = ""
    fcp: float | None = None  # Pa; engineered products state their own; glulam: compression face
    fcp_tension_face: float | None = None  # Pa, glulam tension-face laminations; None: fcp for both faces
    fc: float | None = None  # Pa; only for bearing at an angle to grain
    applies: frozenset[str] = frozenset({"KD", "KScp", "KB", "KZcp", "KT"})
    wet_factor: float | None = None  # KScp when wet, for engineered products
    source: str = ""
    loc: Location = field(default=Location(""), compare=False)


@dataclass(frozen=True)
class Place:
    """Where a member stands in plan and elevation (m), when the model says; a layout always does."""

    start: tuple[float, float]  # a horizontal member's start; a post's centre
    end: tuple[float, float]  # a horizontal member's end; a post's centre again
    top: float  # elevation of the top face (a post: of its top end)
    base: float  # elevation of the underside (a post: of its foot)
    d_along: str = "x"  # a post: the plan direction its d lies along


@dataclass(frozen=True)
class Frame:
    """A layout's levels and grid lines (m), kept so the memo can draw each level's plan."""

    levels: dict[str, float]
    grid_x: dict[str, float]  # lines of constant x, by name
    grid_y: dict[str, float]


@dataclass(frozen=True)
class Member:
    id: str
    material: str
    b: float  # width across the bearing face (m)
    d: float  # depth through which bearing loads pass (m)
    length: float  # m
    vertical: bool
    service: str  # dry | wet
    kt: float = 1.0
    continuous: bool = False  # continuously supported (a sill on a footing, or a wall the model does not show)
    patterned: bool = True  # on three or more supports, live and snow load are placed span by span (not on studs)
    bears_on: str = ""  # continuous members: the material id of what is under them, where given
    level: str = ""
    label: str = ""
    plies: int = 1  # a built-up member: the number of plies
    ply_thickness: float | None = None  # m, stacked through d (laid flat) or side by side across b
    place: Place | None = field(default=None, compare=False)
    note: str = field(default="", compare=False)  # where a placed member came from
    aliases: tuple[str, ...] = ()  # earlier ids of the member, so an earlier review round still matches
    loc: Location = field(default=Location(""), compare=False)
    separation: str = ""  # a continuous member on concrete or masonry: what separates it from what is under it

    @property
    def ply_section(self) -> tuple[float, float] | None:
        """(b, d) of one ply of a built-up member, or None for a solid one."""
        if self.plies < 2 or self.ply_thickness is None:
            return None
        if abs(self.plies * self.ply_thickness - self.d) <= PLY_FIT:
            return self.b, self.ply_thickness
        return self.ply_thickness, self.d


@dataclass(frozen=True)
class Side:
    """One member's side of a bearing."""

    member: str
    at: float | None  # bearing centre along a horizontal member (m)
    length: float | None  # bearing length along this member's grain, when stated (m)
    angle: float | None  # angle between load and grain (rad); None means perpendicular
    width: float | None = None  # seat width across this member's grain, when a seat states it (m)
    loc: Location = field(default=Location(""), compare=False)
    notch: float = 0.0  # depth cut out of this member at this bearing (a notched end), m: its depth there is d less it


HANGER_KINDS = ("face-mount", "top-flange")
DURATIONS = ("permanent", "standard", "short")  # longest first


@dataclass(frozen=True)
class Hanger:
    """A hanger from the firm's connector pack: its seat, its top flange, its listed capacity per load duration."""

    id: str
    kind: str  # face-mount | top-flange
    seat_width: float  # m, across the carried member's grain
    seat_length: float  # m, along the carried member's grain
    flange_length: float | None  # m, top-flange: how far the flange reaches across the carrier's top
    capacity: tuple[tuple[str, float], ...]  # (duration, N) as listed
    source: str  # where the listing comes from ("firm's verified listing, page ...")
    status: str
    pack: str = ""  # the connector pack's id
    loc: Location = field(default=Location(""), compare=False)

    def capacity_for(self, duration: str) -> tuple[float, str]:
        """The listed capacity for a load duration (N), and how it was taken: the listed one, else that of the
        nearest longer duration listed, else the least listed (conservative either way)."""
        listed = dict(self.capacity)
        if duration in listed:
            return listed[duration], f"listed for {duration} term"
        longer = [d for d in DURATIONS[: DURATIONS.index(duration)] if d in listed] if duration in DURATIONS else []
        if longer:
            taken = longer[-1]
            return listed[taken], f"none listed for {duration} term: the {taken}-term capacity taken"
        least = min(listed, key=lambda d: listed[d])
        return listed[least], f"none listed for {duration} term: the least listed ({least} term) taken"


@dataclass(frozen=True)
class Bearing:
    id: str
    upper: Side
    lower: Side
    width: float | None  # contact width, when a plate or seat states it (m)
    aliases: tuple[str, ...] = ()
    typical: tuple[str, ...] = ()  # labels several bearings share, as a calc's typical claim names them
    note: str = field(default="", compare=False)  # how a found bearing was found
    calc_force: tuple[tuple[str, float], ...] = ()  # the calc's own force through it, per case (N): no take-down
    loc: Location = field(default=Location(""), compare=False)
    hanger: str = ""  # the id of the hanger (Model.hangers) the upper member is carried in; "" : it sits on top
    separation: str = ""  # what keeps timber off concrete or masonry here (a membrane, a sill gasket), as stated

    def side_of(self, member_id: str) -> Side:
        return self.upper if self.upper.member == member_id else self.lower


@dataclass(frozen=True)
class Load:
    """A load applied directly to a member, in one load case (or a factored group)."""

    id: str
    member: str
    kind: str  # point | uniform
    case: str  # D, L, S, W, E, or "factored:<label>"
    magnitude: float  # N for point, N/m for uniform
    at: float | None = None  # point loads on horizontal members (m)
    start: float | None = None  # uniform loads (m)
    end: float | None = None
    length: float | None = None  # bearing length of a point load along the member (m)
    width: float | None = None
    note: str = field(default="", compare=False)  # how a shared load was made
    loc: Location = field(default=Location(""), compare=False)


@dataclass(frozen=True)
class FactoredGroup:
    """Already-factored loads that act together, with their load duration."""

    label: str
    duration: str


@dataclass(frozen=True)
class Project:
    title: str
    calc: str
    reviewer: str
    rule_pack: str
    combinations: str
    service: str
    tolerance_relative: float
    tolerance_absolute: float  # N
    date: dt.date | None
    readings: dict[str, str] = field(default_factory=dict)  # choice name -> reading chosen over the pack's default
    units: str = "SI"  # how the memo and logs show forces: SI (kN) or US (kip)
    uplift_note_below: float | None = None  # N; a smaller calculated uplift is a note; None: the pack's threshold
    own_comment_from: float | None = None  # Qf/Qr from which a missing check gets its own comment; None: the default


@dataclass(frozen=True)
class Model:
    file: str
    project: Project
    materials: dict[str, Material]
    members: dict[str, Member]
    bearings: tuple[Bearing, ...]
    loads: tuple[Load, ...]
    factored_groups: dict[str, FactoredGroup]
    warnings: tuple[str, ...] = ()  # located, one line each: printed, never fatal
    frame: Frame | None = None  # the layout's levels and grids, where the model has a layout
    hangers: dict[str, Hanger] = field(default_factory=dict)  # the hangers the bearings name, by id

    def material_of(self, member_id: str) -> Material:
        return self.materials[self.members[member_id].material]

    @cached_property
    def bearings_by_id(self) -> dict[str, Bearing]:
        return {b.id: b for b in self.bearings}
