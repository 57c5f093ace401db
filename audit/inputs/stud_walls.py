"""A plate on a stud wall, in short form: the studs and the stud packs, placed under the plate.

The reviewer gives the stud size and spacing and the stud pack under each concentrated load;
this module places every stud and pack as a post under the plate, with a bearing each, so the
later stages check the plate's underside over each stud and pack, and squeeze the plate where
a load above lies within d of one. The plate is then a member on many supports like any other.
"""

from __future__ import annotations

from dataclasses import dataclass

from audit.core.errors import ErrorCollector, Location
from audit.core.located_yaml import Node
from audit.engine.contacts import longer, shorter
from audit.engine.model import Bearing, Member, Side
from audit.inputs.fields import FieldReader

STUD_KEYS = {"material", "thickness", "depth", "spacing", "first", "height", "packs", "sole", "patterned"}
PACK_KEYS = {"id", "at", "studs", "width"}
DEFAULT_HEIGHT = 3.0  # m; a stud's height enters no bearing check, it only names the member's length


@dataclass(frozen=True)
class Pack:
    id: str
    at: float  # centre along the plate (m)
    width: float  # along the plate (m)
    note: str  # how the width was given
    loc: Location


@dataclass(frozen=True)
class StudWall:
    """The short form of the wall under one plate, read and checked, before the studs are placed."""

    plate: str
    material: str
    thickness: float  # along the plate (m)
    depth: float | None  # across the plate (m); None: the plate's own width
    spacing: float  # m, centre to centre
    first: float | None  # centre of the first stud from the plate's start (m); None: flush with the start
    height: float
    packs: tuple[Pack, ...]
    loc: Location
    sole: str = ""  # the member the studs stand on (a sole plate along the same line), where the model has one
    # live and snow load placed bay by bay between the studs: only where the model asks. A plate on studs is not a
    # floor beam loaded bay by bay; patterning it gives small false "uplift" at end studs.
    patterned: bool = False


def read_stud_wall(node: Node, plate_id: str, default_material: str, errors: ErrorCollector) -> StudWall | None:
    """Read a plate's ``studs`` mapping; None (with the errors collected) when it cannot be used."""
    f = FieldReader(node, STUD_KEYS, errors, f"studs of '{plate_id}'")
    if not f.ok:
        return None
    thickness = f.quantity("thickness", "length", positive=True)
    spacing = f.quantity("spacing", "length", positive=True)
    depth = f.quantity("depth", "length", required=False, positive=True)
    first = f.quantity("first", "length", required=False)
    height = f.quantity("height", "length", required=False, positive=True)
    material = f.text("material", required=False, default=default_material)
    patterned = f.flag("patterned")
    if thickness is None or spacing is None:
        return None
    if spacing < thickness - 1e-9:
        errors.add(
            f"stud spacing {spacing * 1000:.0f} mm is less than the stud thickness {thickness * 1000:.0f} mm",
            f.loc("spacing"),
        )
        return None
    packs = []
    if f.has("packs"):
        pnode = f.map["packs"]
        if not isinstance(pnode.value, list):
            errors.add("packs must be a list such as [{at: 3 m, studs: 3}]", pnode.loc)
            return None
        for index, item in enumerate(pnode.value):
            pack = _read_pack(item, index, plate_id, thickness, errors)
            if pack is not None:
                packs.append(pack)
    if not f.ok:
        return None
    return StudWall(
        plate_id,
        material,
        thickness,
        depth,
        spacing,
        first,
        height if height is not None else DEFAULT_HEIGHT,
        tuple(packs),
        node.loc,
        f.text("sole", required=False, limit=120),
        patterned,
    )


def _read_pack(item: Node, index: int, plate_id: str, thickness: float, errors: ErrorCollector) -> Pack | None:
    f = FieldReader(item, PACK_KEYS, errors, "stud pack")
    if not f.ok:
        return None
    at = f.quantity("at", "length")
    has_count, has_width = f.has("studs"), f.has("width")
    if has_count == has_width:
        errors.add("give a stud pack either 'studs' (how many) or 'width' (along the plate)", item.loc)
        return None
    if has_count:
        count = f.number("studs", 1, 12, 0.0)
        if count != int(count) or count < 1:
            errors.add(f"studs must be a whole number from 1 to 12, got {count:g}", f.loc("studs"))
            return None
        width, note = int(count) * thickness, f"{int(count)} studs of {thickness * 1000:.0f} mm"
    else:
        stated = f.quantity("width", "length", positive=True)
        if stated is None:
            return None
        width, note = stated, "stated width"
    if at is None or not f.ok:
        return None
    pack_id = f.text("id", required=False, limit=120) or f"{plate_id}.pack{index + 1}"
    return Pack(pack_id, at, width, note, item.loc)


def _pack_spans(plate: Member, wall: StudWall, errors: ErrorCollector) -> list[tuple[float, float, Pack]] | None:
    """Each pack's extent along the plate, in order; None (with the error) for one past the plate's ends or
    overlapping the one before."""
    spans: list[tuple[float, float, Pack]] = []
    for pack in sorted(wall.packs, key=lambda p: p.at):
        lo, hi = pack.at - pack.width / 2, pack.at + pack.width / 2
        if lo < -1e-9 or hi > plate.length + 1e-9:
            errors.add(
                f"stud pack '{pack.id}' ({pack.width * 1000:.0f} mm at {pack.at * 1000:.0f} mm) runs past the "
                f"ends of plate '{plate.id}' (length {plate.length * 1000:.0f} mm)",
                pack.loc,
            )
            return None
        if spans and lo < spans[-1][1] - 1e-9:
            errors.add(f"stud packs '{spans[-1][2].id}' and '{pack.id}' overlap under '{plate.id}'", pack.loc)
            return None
        spans.append((lo, hi, pack))
    return spans


def place_studs(plate: Member, wall: StudWall, errors: ErrorCollector) -> tuple[list[Member], list[Bearing]]:
    """The studs and packs as posts under the plate, each with its bearing.

    Regular studs stand at ``first`` + k x ``spacing`` with one more flush at the plate's far
    end; a pack replaces every regular stud it overlaps. Packs that overlap each other, or
    lie past the plate's ends, are input errors.
    """
    t = wall.thickness
    depth = wall.depth if wall.depth is not None else plate.b
    if depth > plate.b + 1e-9:
        errors.add(
            f"stud depth {depth * 1000:.0f} mm is wider than plate '{plate.id}' (b = {plate.b * 1000:.0f} mm)",
            wall.loc,
        )
        return [], []
    spans = _pack_spans(plate, wall, errors)
    if spans is None:
        return [], []
    first = wall.first if wall.first is not None else t / 2
    if first < t / 2 - 1e-9 or first > plate.length - t / 2 + 1e-9:
        errors.add(f"first stud at {first * 1000:.0f} mm does not stand under plate '{plate.id}'", wall.loc)
        return [], []
    centres = []
    x = first
    while not longer(x + t / 2, plate.length):  # a stud flush with the end to 0.01 mm stands there
        centres.append(x)
        x += wall.spacing
    end = plate.length - t / 2
    if not centres or not shorter(end - centres[-1], t):
        centres.append(end)  # the end stud of the wall
    posts: list[tuple[str, float, float, str]] = []  # id, centre, width along the plate, label
    number = 0
    for c in centres:
        if any(c + t / 2 > lo + 1e-9 and c - t / 2 < hi - 1e-9 for lo, hi, _ in spans):
            continue  # a pack stands here instead
        number += 1
        posts.append((f"{plate.id}.stud{number}", c, t, f"stud under {plate.id}, placed from its spacing"))
    for lo, hi, pack in spans:
        posts.append((pack.id, (lo + hi) / 2, hi - lo, f"stud pack under {plate.id} ({pack.note})"))
    members, bearings = [], []
    for post_id, centre, along, label in sorted(posts, key=lambda p: p[1]):
        members.append(
            Member(
                id=post_id,
                material=wall.material,
                b=depth,
                d=along,
                length=wall.height,
                vertical=True,
                service=plate.service,
                level=plate.level,
                label=label,
                loc=wall.loc,
            )
        )
        bearings.append(
            Bearing(
                f"{plate.id}/{post_id}",
                Side(plate.id, centre, None, None, loc=wall.loc),
                Side(post_id, None, None, None, loc=wall.loc),
                None,
                loc=wall.loc,
            )
        )
        if wall.sole:  # the stud stands on the sole plate, at the same place along the wall
            bearings.append(
                Bearing(
                    f"{post_id}/{wall.sole}",
                    Side(post_id, None, None, None, loc=wall.loc),
                    Side(wall.sole, centre, None, None, loc=wall.loc),
                    None,
                    loc=wall.loc,
                )
            )
    return members, bearings
