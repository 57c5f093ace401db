"""Framing read from an IFC building model (ISO 16739; IFC2X3 and IFC4) into placed pieces and storeys.

IfcOpenShell (the optional extra ``.[ifc]``) is imported here only, when a command asks for it. What is
read: storeys as levels, and IfcBeam, IfcColumn and IfcMember that are straight extrusions of a
rectangular profile, horizontal (placed members) or vertical (posts), with their placement chains
resolved to world coordinates in metres. What cannot be read is one line each (GlobalId and name) and
left out; everything else is still read.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from audit.core.errors import InputError, Location

FRAMING_CLASSES = ("IfcBeam", "IfcColumn", "IfcMember")
# Within half a degree of level or plumb counts as level or plumb (the layout's own square tolerance).
SQUARE_DEGREES = 0.5
_SIN_SQUARE = math.sin(math.radians(SQUARE_DEGREES))
# Straight swept solids that are not the extrusion of a profile along a line: read as curved.
CURVED_SOLIDS = (
    "IfcRevolvedAreaSolid",
    "IfcSurfaceCurveSweptAreaSolid",
    "IfcFixedReferenceSweptAreaSolid",
    "IfcSweptDiskSolid",
    "IfcDirectrixCurveSweptAreaSolid",
)
INSTALL_HINT = "reading IFC needs the optional IfcOpenShell extra: pip install 'bearing-audit[ifc]'"

Vec = tuple[float, float, float]


@dataclass(frozen=True, slots=True)
class Storey:
    """A building storey: its name and elevation (m)."""

    global_id: str
    name: str
    elevation: float


@dataclass(frozen=True, slots=True)
class Piece:
    """One framing member read from the file, in world coordinates (m).

    ``kind`` is "member" (level: from ``start`` to ``end`` on its centreline, top at ``top``) or "post"
    (plumb at ``start``'s x and y, from ``foot`` to ``top``); ``b`` across and ``d`` deep for a member,
    ``d`` along ``d_along`` for a post."""

    global_id: str
    name: str
    ifc_class: str
    kind: str
    start: Vec
    end: Vec
    b: float
    d: float
    d_along: str
    foot: float
    top: float
    material: str | None
    storey: str


@dataclass(frozen=True)
class IfcFraming:
    """What was read: the file's schema and length unit, storeys, pieces, and one line per element left out."""

    path: str
    schema: str
    project: str
    unit: str
    storeys: tuple[Storey, ...]
    pieces: tuple[Piece, ...]
    left_out: tuple[str, ...]
    several_materials: tuple[str, ...]


def import_ifcopenshell() -> Any:
    """IfcOpenShell, or the one line that says how to install it."""
    try:
        import ifcopenshell
        import ifcopenshell.util.element
        import ifcopenshell.util.placement
        import ifcopenshell.util.unit
    except ImportError:
        raise InputError(INSTALL_HINT) from None
    return ifcopenshell


def open_ifc(path: Path) -> Any:
    """The file opened by IfcOpenShell; a file that is not IFC is one located line."""
    ifcopenshell = import_ifcopenshell()
    head = path.read_bytes()[:64].lstrip(b"\xef\xbb\xbf \t\r\n")
    if not head.startswith(b"ISO-10303-21"):
        raise InputError("not an IFC file (an IFC file begins with ISO-10303-21;)", Location(str(path), 1, 1))
    try:
        return ifcopenshell.open(str(path))
    except Exception as exc:  # IfcOpenShell's own parse error: its words are not ours to repeat
        raise InputError(f"cannot be read as IFC ({type(exc).__name__})", Location(str(path))) from None


def read_framing(path: Path) -> IfcFraming:
    """Storeys and framing pieces of the IFC file at ``path``."""
    ifcopenshell = import_ifcopenshell()
    model = open_ifc(path)
    scale = float(ifcopenshell.util.unit.calculate_unit_scale(model))  # metres per file length unit
    storeys = _storeys(model, scale)
    names = {s.global_id: s.name for s in storeys}
    pieces: list[Piece] = []
    left_out: list[str] = []
    several: list[str] = []
    for ifc_class in FRAMING_CLASSES:
        for element in model.by_type(ifc_class):  # with its subtypes (IfcBeamStandardCase, ...)
            piece, problem = _piece(element, scale, names)
            if problem:
                left_out.append(f"{_who(element)}: {problem}")
            if piece is not None:
                pieces.append(piece)
                materials = _material_names(element)
                if len(materials) > 1:
                    several.append(f"{_who(element)}: several materials ({', '.join(materials)}); read as the first")
    left_out += _walls_without_framing(model)
    project = next(iter(model.by_type("IfcProject")), None)
    return IfcFraming(
        str(path),
        model.schema,
        (project.Name or "") if project is not None else "",
        _unit_name(model, scale),
        tuple(storeys),
        tuple(pieces),
        tuple(left_out),
        tuple(several),
    )


def _walls_without_framing(model: Any) -> list[str]:
    """A wall whose studs and plates the file carries is read through them (they are its parts); a wall
    that carries none is one line: its framing is not in the file."""
    import ifcopenshell.util.element as util

    lines = []
    for wall in model.by_type("IfcWall"):
        parts = util.get_decomposition(wall)
        if not any(part.is_a(framing) for part in parts for framing in FRAMING_CLASSES):
            lines.append(f"{_who(wall)}: carries no framing members (studs, plates): give it as a layout wall")
    return lines


def _who(element: Any) -> str:
    name = element.Name or "(no name)"
    return f"{element.is_a()} {element.GlobalId} '{name}'"


def _unit_name(model: Any, scale: float) -> str:
    for unit in model.by_type("IfcNamedUnit"):
        if unit.UnitType == "LENGTHUNIT":
            if unit.is_a("IfcSIUnit"):
                return f"{(unit.Prefix or '').lower()}{unit.Name.lower()}"
            return str(unit.Name).lower()
    return f"{scale:g} m"


def _storeys(model: Any, scale: float) -> list[Storey]:
    """Every storey with its elevation: the world z of its placement, else its Elevation attribute."""
    import ifcopenshell.util.placement as placement

    storeys = []
    seen: dict[str, int] = {}
    for storey in model.by_type("IfcBuildingStorey"):
        if storey.ObjectPlacement is not None:
            z = float(placement.get_local_placement(storey.ObjectPlacement)[2][3]) * scale
        else:
            z = float(storey.Elevation or 0.0) * scale
        name = (storey.Name or "").strip() or "storey"
        seen[name] = seen.get(name, 0) + 1
        storeys.append(Storey(storey.GlobalId, name, round(z, 6)))
    # two storeys of one name get a number each, so a level name stays one storey
    numbered: dict[str, int] = {}
    unique = []
    for s in sorted(storeys, key=lambda s: s.elevation):
        if seen[s.name] > 1:
            numbered[s.name] = numbered.get(s.name, 0) + 1
            s = Storey(s.global_id, f"{s.name} ({numbered[s.name]})", s.elevation)
        unique.append(s)
    return unique


def _storey_of(element: Any, names: dict[str, str]) -> str | None:
    """The storey holding the element, directly, through a space, or through what it is a part of."""
    import ifcopenshell.util.element as util

    seen = 0
    current = element
    while current is not None and seen < 20:
        container = util.get_container(current)
        while container is not None and not container.is_a("IfcBuildingStorey") and seen < 20:
            container = util.get_aggregate(container)
            seen += 1
        if container is not None and container.GlobalId in names:
            return names[container.GlobalId]
        current = util.get_aggregate(current)
        seen += 1
    return None


def _material_names(element: Any) -> list[str]:
    import ifcopenshell.util.element as util

    names: list[str] = []
    for material in util.get_materials(element) or []:
        name = (material.Name or "").strip()
        if name and name not in names:
            names.append(name)
    return names


def _body_solid(element: Any) -> tuple[Any | None, str]:
    """The element's extruded solid, or why there is none."""
    shape = element.Representation
    if shape is None:
        return None, "no shape: no profile to read its section from"
    reps = [r for r in shape.Representations if (r.RepresentationIdentifier or "Body") == "Body"]
    items = [item for rep in reps for item in rep.Items]
    if not items:
        return None, "no body shape: no profile to read its section from"
    solids = [_extrusion_in(item) for item in items]
    found = [s for s in solids if s is not None and s.is_a("IfcExtrudedAreaSolid")]
    if len(found) == 1:
        return found[0], ""
    if len(found) > 1:
        return None, f"{len(found)} extruded solids in its body: not one member"
    curved = [s for s in solids if s is not None and s.is_a() in CURVED_SOLIDS]
    if curved:
        return None, f"curved ({curved[0].is_a()}): only straight members are read"
    return None, f"body is {items[0].is_a()}, not an extruded profile: no profile to read its section from"


def _extrusion_in(item: Any) -> Any | None:
    """The swept solid inside a clipping (a cut end keeps its member's profile and axis)."""
    depth = 0
    while item is not None and item.is_a("IfcBooleanResult") and depth < 20:
        item = item.FirstOperand
        depth += 1
    if item is not None and (item.is_a("IfcExtrudedAreaSolid") or item.is_a() in CURVED_SOLIDS):
        return item
    return None


def _axes_matrix(place: Any) -> list[list[float]]:
    """The 4x4 matrix of an IfcAxis2Placement3D (None: identity), in file units."""
    import ifcopenshell.util.placement as placement

    if place is None:
        return [[1.0, 0, 0, 0], [0, 1.0, 0, 0], [0, 0, 1.0, 0], [0, 0, 0, 1.0]]
    return [[float(v) for v in row] for row in placement.get_axis2placement(place)]


def _apply(m: Sequence[Sequence[float]], v: Sequence[float], w: float) -> Vec:
    return (
        m[0][0] * v[0] + m[0][1] * v[1] + m[0][2] * v[2] + m[0][3] * w,
        m[1][0] * v[0] + m[1][1] * v[1] + m[1][2] * v[2] + m[1][3] * w,
        m[2][0] * v[0] + m[2][1] * v[1] + m[2][2] * v[2] + m[2][3] * w,
    )


def _times(a: Sequence[Sequence[float]], b: Sequence[Sequence[float]]) -> list[list[float]]:
    return [[sum(a[i][k] * b[k][j] for k in range(4)) for j in range(4)] for i in range(4)]


def _unit(v: Sequence[float]) -> Vec:
    n = math.sqrt(v[0] ** 2 + v[1] ** 2 + v[2] ** 2)
    return (v[0] / n, v[1] / n, v[2] / n)


def _profile_frame(profile: Any) -> tuple[tuple[float, float], tuple[float, float]]:
    """The profile's centre and X direction in the solid's own plane (its 2D Position)."""
    place = profile.Position
    if place is None:
        return (0.0, 0.0), (1.0, 0.0)
    centre = tuple(float(c) for c in place.Location.Coordinates[:2])
    ref = place.RefDirection
    x = tuple(float(c) for c in ref.DirectionRatios[:2]) if ref is not None else (1.0, 0.0)
    n = math.hypot(x[0], x[1])
    return (centre[0], centre[1]), (x[0] / n, x[1] / n)


def _section(profile: Any) -> tuple[float, float, str] | str:
    """(size along the profile's X, along its Y, shape) in file units, or why it is not read.

    An I-shape is read by its overall width and depth: a level I-section bears on its flange, whose width
    is the overall width."""
    kind = profile.is_a()
    if kind in ("IfcRectangleProfileDef", "IfcRoundedRectangleProfileDef", "IfcRectangleHollowProfileDef"):
        return float(profile.XDim), float(profile.YDim), "rectangle"
    if kind == "IfcIShapeProfileDef":
        return float(profile.OverallWidth), float(profile.OverallDepth), "I"
    return f"profile {kind} is not rectangular or I-shaped: only those sections are read"


def _piece(element: Any, scale: float, storeys: dict[str, str]) -> tuple[Piece | None, str]:
    """The element as a placed piece, or None and why it was left out."""
    import ifcopenshell.util.placement as placement

    storey = _storey_of(element, storeys)
    if storey is None:
        return None, "outside every storey: not read"
    solid, why = _body_solid(element)
    if solid is None:
        return None, why
    section = _section(solid.SweptArea)
    if isinstance(section, str):
        return None, section
    if element.ObjectPlacement is None:
        return None, "no placement: not read"
    world = _times(
        [[float(v) for v in row] for row in placement.get_local_placement(element.ObjectPlacement)],
        _axes_matrix(solid.Position),
    )
    centre2, x2 = _profile_frame(solid.SweptArea)
    local_dir = _unit([float(c) for c in solid.ExtrudedDirection.DirectionRatios])
    if abs(local_dir[2]) < 1.0 - 1e-9:
        return None, "extruded at a slant to its profile: read as skewed, not read"
    depth = float(solid.Depth) * (1.0 if local_dir[2] > 0 else -1.0)
    start = _apply(world, (centre2[0], centre2[1], 0.0), 1.0)
    end = _apply(world, (centre2[0], centre2[1], depth), 1.0)
    axis = _unit([e - s for s, e in zip(start, end, strict=True)])
    x_world = _unit(_apply(world, (x2[0], x2[1], 0.0), 0.0))
    start = (start[0] * scale, start[1] * scale, start[2] * scale)
    end = (end[0] * scale, end[1] * scale, end[2] * scale)
    x_dim, y_dim, shape = section[0] * scale, section[1] * scale, section[2]
    material = next(iter(_material_names(element)), None)
    name = (element.Name or "").strip()
    common = (element.GlobalId, name, element.is_a())
    if abs(axis[2]) >= math.cos(math.radians(SQUARE_DEGREES)):
        if shape == "I":  # its outline is not its contact: the flanges and web bear, or a cap plate
            return None, "an I-shaped post: its contact is not its outline; give its cap or base plate by hand"
        return _post(common, start, end, x_world, x_dim, y_dim, material, storey)
    if abs(axis[2]) <= _SIN_SQUARE:
        if shape == "I" and abs(x_world[2]) > _SIN_SQUARE:
            return None, "an I-section lying on its side: only an upright I-section is read"
        return _member(common, start, end, x_world, x_dim, y_dim, material, storey)
    slope = math.degrees(math.asin(min(1.0, abs(axis[2]))))
    return None, f"skewed: its axis slopes at {slope:.1f} degrees; only level and plumb members are read"


def _post(
    common: tuple[str, str, str],
    start: Vec,
    end: Vec,
    x_world: Vec,
    x_dim: float,
    y_dim: float,
    material: str | None,
    storey: str,
) -> tuple[Piece | None, str]:
    """A plumb piece: a post, its d (the profile's XDim) along x or y."""
    if abs(x_world[0]) >= 1.0 - _SIN_SQUARE:
        d_along = "x"
    elif abs(x_world[1]) >= 1.0 - _SIN_SQUARE:
        d_along = "y"
    else:
        turn = math.degrees(math.atan2(x_world[1], x_world[0]))
        return None, f"skewed: turned {turn:.1f} degrees in plan; only posts square to x and y are read"
    foot, top = sorted((start[2], end[2]))
    at = (start[0], start[1], foot)
    piece = Piece(*common, "post", at, (end[0], end[1], top), y_dim, x_dim, d_along, foot, top, material, storey)
    return piece, ""


def _member(
    common: tuple[str, str, str],
    start: Vec,
    end: Vec,
    x_world: Vec,
    x_dim: float,
    y_dim: float,
    material: str | None,
    storey: str,
) -> tuple[Piece | None, str]:
    """A level piece: a placed member, its depth the profile dimension that stands plumb."""
    if abs(x_world[2]) <= _SIN_SQUARE:
        b, d = x_dim, y_dim
    elif abs(x_world[2]) >= 1.0 - _SIN_SQUARE:
        b, d = y_dim, x_dim
    else:
        roll = math.degrees(math.asin(min(1.0, abs(x_world[2]))))
        return None, f"skewed: rolled {roll:.1f} degrees about its axis; only upright sections are read"
    top = start[2] + d / 2
    piece = Piece(*common, "member", start, end, b, d, "x", top - d, top, material, storey)
    return piece, ""
