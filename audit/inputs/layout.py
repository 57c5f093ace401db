"""A framing layout, read: levels, grid lines, and members placed by their ends.

The reviewer describes the framing as the drawings show it; this module reads the levels and
grids and hands each entry to its placer (``layout_placer``: points, levels, single members;
``layout_framing``: runs, posts, walls), which place it in plan and in elevation. ``layout_contacts`` then
finds where they bear on each other and ``area_loads`` shares floor and roof loads among
them; ``expand_layout`` joins the three into the entries of the explicit model (members,
bearings, loads), which the model reader reads as if the reviewer had typed them.

Conventions (in the README): grid lines named under ``x`` stand at constant x, those under
``y`` at constant y; a point is a grid intersection ``A/1``, coordinates ``[x, y]``, or
``{grid: A/1, dx: .., dy: ..}``. A horizontal member's top is at its level, less its ``drop``;
its ends are its ``from`` and ``to`` points, moved out by ``extend``. Posts and walls stand on
their ``base`` level and reach up to the underside of what is over them, at most their ``top``
level.
"""

from __future__ import annotations

from audit.core.errors import ErrorCollector, InputError, Location
from audit.core.located_yaml import Node
from audit.core.units import parse_quantity
from audit.inputs.fields import FieldReader, describe_value, list_items
from audit.inputs.layout_framing import place_post, place_run, place_wall
from audit.inputs.layout_placer import Placer
from audit.inputs.layout_records import (
    GRID_KEYS,
    LAYOUT_KEYS,
    LAYOUT_MEMBERS,
    Grids,
    Layout,
    Placed,
)


def read_layout(node: Node, errors: ErrorCollector) -> Layout | None:
    f = FieldReader(node, LAYOUT_KEYS, errors, "layout")
    if not f.ok:
        return None
    levels = _read_levels(f, errors)
    grids = _read_grids(f, errors)
    if levels is None or grids is None:
        return None
    reader = Placer(levels, grids, errors)
    placed: list[Placed] = []
    for key, read in (
        ("members", reader.member),
        ("runs", lambda item: place_run(reader, item)),
        ("posts", lambda item: place_post(reader, item)),
        ("walls", lambda item: place_wall(reader, item)),
    ):
        if f.has(key):
            for item in list_items(f.map[key], f"layout {key}", errors):
                reader.room = LAYOUT_MEMBERS - len(placed)
                if reader.room <= 0:
                    errors.add(f"the layout places more than {LAYOUT_MEMBERS:,} members in all; split it", item.loc)
                    return None
                placed += read(item)
                if reader.room < 0:  # the run that went past the bound said so: one error, no more work
                    return None
    seen: dict[str, Location] = {}
    for p in placed:
        if p.id in seen:
            errors.add(f"duplicate member id '{p.id}' in the layout (also at {seen[p.id]})", p.loc)
        seen.setdefault(p.id, p.loc)
    return Layout(levels, grids, tuple(placed), f.map.get("areas"), node, f.map.get("labels"))


def _read_levels(f: FieldReader, errors: ErrorCollector) -> dict[str, float] | None:
    if not f.has("levels"):
        errors.add("missing field 'levels' (e.g. {L1: 0 m, L2: 3.2 m})", f.node.child_loc("levels"))
        return None
    node = f.map["levels"]
    if not isinstance(node.value, dict) or not node.value:
        errors.add(f"levels must map a level name to its elevation, got {describe_value(node.value)}", node.loc)
        return None
    out: dict[str, float] = {}
    for name, item in node.value.items():
        try:
            out[str(name)] = parse_quantity(item.value, "length", item.loc)
        except InputError as exc:
            errors.extend(exc)
    return out if len(out) == len(node.value) else None


def _read_grids(f: FieldReader, errors: ErrorCollector) -> Grids | None:
    lines: dict[str, dict[str, float]] = {"x": {}, "y": {}}
    if not f.has("grids"):
        return Grids({}, {})
    g = FieldReader(f.map["grids"], GRID_KEYS, errors, "layout grids")
    ok = g.ok
    for axis in ("x", "y"):
        if not g.has(axis):
            continue
        node = g.map[axis]
        if not isinstance(node.value, dict):
            errors.add(f"grids.{axis} must map a line name to its {axis} coordinate, e.g. {{A: 0 m}}", node.loc)
            ok = False
            continue
        for name, item in node.value.items():
            try:
                lines[axis][str(name)] = parse_quantity(item.value, "length", item.loc)
            except InputError as exc:
                errors.extend(exc)
                ok = False
    both = lines["x"].keys() & lines["y"].keys()
    if both:
        errors.add(f"grid line '{sorted(both)[0]}' is named under both x and y", f.map["grids"].loc)
        ok = False
    for axis in ("x", "y"):
        for name in lines[axis]:
            if "/" in name:
                errors.add(f"grid line name '{name}' holds '/', which joins two lines into a point", f.map["grids"].loc)
                ok = False
    return Grids(lines["x"], lines["y"]) if ok else None
