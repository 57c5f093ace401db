"""The model's ``members``: sections, lengths, places, built-up plies and stud walls, each id once."""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from audit.core.errors import ErrorCollector, InputError, Location
from audit.core.located_yaml import Node, node_text
from audit.core.suggest import did_you_mean
from audit.core.units import parse_quantity
from audit.engine.model import PLY_FIT, Bearing, Material, Member, Place, Project, normalise_label
from audit.inputs.fields import FieldReader, describe_value, list_items
from audit.inputs.model_keys import MEMBER_KEYS, SUPPORTS
from audit.inputs.stud_walls import StudWall, place_studs, read_stud_wall
from audit.standards.packs import SERVICES


@dataclass(frozen=True)
class KnownMembers:
    """The members read, and the ids of those with an error of their own.

    A reference to a member whose own entry has an error is not an error again: one bad value
    gives one error, not one more for every bearing and load that names the member.
    """

    members: dict[str, Member]
    broken: frozenset[str]

    def resolve(self, member_id: str, loc: Location, errors: ErrorCollector) -> Member | None:
        if member_id in self.members:
            return self.members[member_id]
        if member_id not in self.broken:
            errors.add(f"unknown member '{member_id}'{did_you_mean(member_id, self.members)}", loc)
        return None


def read_members(
    node: Node,
    materials: dict[str, Material],
    project: Project,
    errors: ErrorCollector,
    broken_materials: frozenset[str] = frozenset(),
) -> tuple[dict[str, Member], frozenset[str], tuple[StudWall, ...]]:
    out: dict[str, Member] = {}
    broken: set[str] = set()
    twins: dict[str, str] = {}
    walls: list[StudWall] = []
    for item in list_items(node, "members", errors):
        f = FieldReader(item, MEMBER_KEYS, errors, "member")
        member_id = f.text("id", limit=120)
        material = f.text("material")
        if f.ok and material in broken_materials:
            f.ok = False  # its material's error is reported where the material is; its other fields still are
        elif f.ok and material not in materials:
            errors.add(f"unknown material '{material}'{did_you_mean(material, materials)}", f.loc("material"))
            f.ok = False
        b = f.quantity("b", "length", positive=True)
        d = f.quantity("d", "length", positive=True)
        length = f.quantity("length", "length", positive=True)
        if not _plausible_section(f, b, d, length, errors):
            f.ok = False
        orientation = f.choice("orientation", ("horizontal", "vertical"), required=False, default="horizontal")
        service = f.choice("service", SERVICES, required=False, default=project.service)
        kt = f.number("KT", 0.01, 1.5, 1.0)
        support = f.choice("support", SUPPORTS, required=False, default="bearings")
        if support != "bearings" and orientation == "vertical":
            errors.add(f"only a horizontal member can be supported by '{support}'", f.loc("support"))
            f.ok = False
        wall = _read_wall_fields(f, support, member_id, material, materials, errors)
        plies, ply_thickness = _read_plies(f, b, d)
        place = _read_place(f, orientation == "vertical", length) if f.has("place") else None
        if member_id in out:
            errors.add(f"duplicate member id '{member_id}'", f.loc("id"))
            continue
        if case_twin(member_id, "member", twins, f.loc("id"), errors):
            broken.add(member_id)  # named elsewhere, it is known: one error, not one per reference
            continue
        if not f.ok or b is None or d is None or length is None:
            if member_id:
                broken.add(member_id)
            continue
        out[member_id] = Member(
            id=member_id,
            material=material,
            b=b,
            d=d,
            length=length,
            vertical=orientation == "vertical",
            service=service,
            kt=kt,
            continuous=support == "continuous",
            level=f.text("level", required=False),
            label=f.text("label", required=False),
            plies=plies,
            ply_thickness=ply_thickness,
            bears_on=f.text("bears_on", required=False),
            place=place,
            note=f.text("note", required=False),
            aliases=label_list(f, "aliases", "aliases must be a list of earlier ids", errors) or (),
            loc=item.loc,
            separation=f.text("separation", required=False, limit=200),
        )
        if wall is not None:
            walls.append(wall)
    return out, frozenset(broken - out.keys()), tuple(walls)


PLACE_FIT = 1e-3  # m: a stated place must agree with the stated length to this


def _read_place(f: FieldReader, vertical: bool, length: float | None) -> Place | None:
    """Where the member stands: {from: [x, y], to: [x, y], top} or, for a post, {at: [x, y], base, top, d_along}."""
    keys = {"at", "base", "top", "d_along"} if vertical else {"from", "to", "top"}
    p = FieldReader(f.map["place"], keys, f.errors, "place")
    if not p.ok:
        f.ok = False
        return None
    points = {}
    for key in ("at",) if vertical else ("from", "to"):
        node = p.map.get(key)
        if node is None:
            f.errors.add(f"missing field '{key}'", p.node.child_loc(key))
            f.ok = False
            return None
        if not isinstance(node.value, list) or len(node.value) != 2:
            f.errors.add(f"{key} must be [x, y], two lengths", node.loc)
            f.ok = False
            return None
        xy = []
        for item in node.value:
            try:
                xy.append(parse_quantity(item.value, "length", item.loc))
            except InputError as exc:
                f.errors.extend(exc)
                f.ok = False
                return None
        points[key] = (xy[0], xy[1])
    top = p.quantity("top", "length")
    base = p.quantity("base", "length") if vertical else None
    d_along = p.choice("d_along", ("x", "y"), required=False, default="x")
    if top is None or not p.ok or length is None or f.map.get("d") is None:
        f.ok = False
        return None
    if vertical:
        assert base is not None
        start = end = points["at"]
        stated = top - base
    else:
        start, end = points["from"], points["to"]
        stated = math.hypot(end[0] - start[0], end[1] - start[1])
        d = parse_quantity(f.map["d"].value, "length", f.map["d"].loc)
        base = top - d
    if abs(stated - length) > PLACE_FIT:
        f.errors.add(
            f"the place gives a length of {stated * 1000:.0f} mm, the member's length is {length * 1000:.0f} mm",
            p.node.loc,
        )
        f.ok = False
        return None
    return Place(start, end, top, base, d_along)


def place_walls(members: dict[str, Member], walls: tuple[StudWall, ...], errors: ErrorCollector) -> tuple[Bearing, ...]:
    """Place each wall's studs and packs as members under its plate (added to ``members``); their bearings."""
    placed: list[Bearing] = []
    for wall in walls:
        sole = members.get(wall.sole) if wall.sole else None
        if wall.sole and (sole is None or sole.vertical or sole.length < members[wall.plate].length - PLY_FIT):
            errors.add(
                f"sole '{wall.sole}' of the studs under '{wall.plate}' must be a horizontal member the wall's length",
                wall.loc,
            )
            continue
        # the plate, and the sole its studs stand on, take live and snow load on every bay unless the wall says
        members[wall.plate] = replace(members[wall.plate], patterned=wall.patterned)
        if sole is not None:
            members[wall.sole] = replace(sole, patterned=wall.patterned)
        studs, bearings = place_studs(members[wall.plate], wall, errors)
        for stud in studs:
            if stud.id in members:
                errors.add(
                    f"member id '{stud.id}' is also the id of a stud or pack placed under '{wall.plate}'", wall.loc
                )
                return tuple(placed)
            members[stud.id] = stud
        placed += bearings
    return tuple(placed)


def _read_wall_fields(
    f: FieldReader, support: str, member_id: str, material: str, materials: dict[str, Material], errors: ErrorCollector
) -> StudWall | None:
    """The stud wall under a plate (support: studs), or the material under a continuous member (bears_on)."""
    if f.has("studs") and support != "studs":
        errors.add("'studs' describes the wall under a plate: give 'support: studs' too", f.loc("studs"))
        f.ok = False
    if f.has("bears_on"):
        under = f.text("bears_on")
        if support != "continuous":
            errors.add(
                "'bears_on' names what is under a continuous member: give 'support: continuous'", f.loc("bears_on")
            )
            f.ok = False
        elif under not in materials:
            errors.add(f"unknown material '{under}'{did_you_mean(under, materials)}", f.loc("bears_on"))
            f.ok = False
    if support != "studs":
        return None
    if not f.has("studs"):
        errors.add("support: studs needs 'studs' (thickness, spacing, packs)", f.node.child_loc("studs"))
        f.ok = False
        return None
    wall = read_stud_wall(f.map["studs"], member_id, material, errors)
    if wall is not None and wall.material not in materials:
        errors.add(f"unknown material '{wall.material}'{did_you_mean(wall.material, materials)}", wall.loc)
        return None
    return wall


def _read_plies(f: FieldReader, b: float | None, d: float | None) -> tuple[int, float | None]:
    """A built-up member's ply count and thickness; the plies must make up its depth d or its width b."""
    count = f.number("plies", 1, 20, 1.0)
    if count != int(count):
        f.errors.add(f"plies must be a whole number, got {count:g}", f.loc("plies"))
        f.ok = False
        return 1, None
    thickness = f.quantity("ply_thickness", "length", required=False, positive=True)
    if count >= 2 and thickness is None and f.ok:
        f.errors.add(
            "a built-up member needs 'ply_thickness' (which way the plies run)", f.node.child_loc("ply_thickness")
        )
        f.ok = False
    if count < 2 and thickness is not None:
        f.errors.add("'ply_thickness' is for built-up members: give 'plies' too", f.loc("ply_thickness"))
        f.ok = False
    if count >= 2 and thickness is not None and b is not None and d is not None:
        made = count * thickness
        if abs(made - d) > PLY_FIT and abs(made - b) > PLY_FIT:
            f.errors.add(
                f"{count:g} plies of {thickness * 1000:.0f} mm make {made * 1000:.0f} mm, neither d "
                f"({d * 1000:.0f} mm, plies laid flat) nor b ({b * 1000:.0f} mm, plies side by side)",
                f.loc("ply_thickness"),
            )
            f.ok = False
    return int(count), thickness


def _plausible_section(
    f: FieldReader, b: float | None, d: float | None, length: float | None, errors: ErrorCollector
) -> bool:
    """b and d within the plausible section range (refused outside: 38 m for 38 mm); one longer than the
    member itself is a warning (a short block is possible, a slip likelier)."""
    from audit.standards import plausible

    ok = True
    for key, value in (("b", b), ("d", d)):
        if value is None:
            continue
        if not plausible.check(value, plausible.ranges().section, key, f.loc(key), errors):
            ok = False
        elif length is not None and value > length:
            errors.warnings.append(
                f"{f.loc(key)}: {key} = {value * 1000:g} mm is more than the member's length "
                f"({length * 1000:g} mm): a unit slip?"
            )
    return ok


def case_twin(item_id: str, what: str, twins: dict[str, str], where: Location, errors: ErrorCollector) -> bool:
    """Refuse an id that differs from an earlier one only in case or spacing: labels and claims are matched
    without either, so a claim meant for one would land on the other (as an alias that is another's id would)."""
    if not item_id:
        return False
    first = twins.setdefault(normalise_label(item_id), item_id)
    if first == item_id:
        return False
    errors.add(
        f"{what} id '{item_id}' differs from {what} '{first}' only in case or spacing; calc labels are matched "
        "without either, so give it an id of its own",
        where,
    )
    return True


def label_list(f: FieldReader, key: str, wrong: str, errors: ErrorCollector) -> tuple[str, ...] | None:
    """A bearing's list of labels (aliases, typical labels); None, with the error, when it is not a list."""
    if not f.has(key):
        return ()
    node = f.map[key]
    if not isinstance(node.value, list):
        errors.add(wrong, node.loc)
        return None
    return _read_aliases(node, errors)


def _read_aliases(node: Node, errors: ErrorCollector) -> tuple[str, ...]:
    out = []
    for i, item in enumerate(node.value):
        if isinstance(item.value, (dict, list)) or item.value is None:
            errors.add(f"an alias must be a label, got {describe_value(item.value)}", node.child_loc(i))
            continue
        text = node_text(item).strip()
        if not text or len(text) > 120:
            errors.add(f"an alias must be 1 to 120 characters, got {len(text)}", item.loc)
            continue
        out.append(text)
    return tuple(out)
