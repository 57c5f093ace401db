"""Placing one layout entry: points, grid lines, levels, sections, and single members by their ends."""

from __future__ import annotations

import math

from audit.core.errors import ErrorCollector, InputError, Location
from audit.core.located_yaml import Node, node_text
from audit.core.suggest import did_you_mean
from audit.core.units import parse_quantity
from audit.engine.plan_geometry import Axis, Point, strip
from audit.inputs.fields import FieldReader, describe_value
from audit.inputs.layout_records import (
    GRID_KEYS,
    LAYOUT_MEMBERS,
    MEMBER_KEYS,
    PASSED,
    POINT_KEYS,
    Grids,
    Placed,
)


class Placer:
    """Reads layout entries into placed members; every error located, none fatal on its own."""

    def __init__(self, levels: dict[str, float], grids: Grids, errors: ErrorCollector) -> None:
        self.levels = levels
        self.grids = grids
        self.errors = errors
        self.room = LAYOUT_MEMBERS  # members the layout may still place

    # ---- values

    def point(self, node: Node) -> Point | None:
        """A grid intersection 'A/1', coordinates [x, y], or {grid: A/1, dx: .., dy: ..}."""
        value = node.value
        if isinstance(value, list):
            if len(value) != 2:
                self.errors.add("coordinates must be [x, y], two lengths", node.loc)
                return None
            try:
                return (
                    parse_quantity(value[0].value, "length", value[0].loc),
                    parse_quantity(value[1].value, "length", value[1].loc),
                )
            except InputError as exc:
                self.errors.extend(exc)
                return None
        if isinstance(value, dict):
            f = FieldReader(node, POINT_KEYS, self.errors, "point")
            base = self.point(f.map["grid"]) if f.has("grid") else None
            if not f.has("grid"):
                self.errors.add("missing field 'grid' (the grid point the offset is from)", node.child_loc("grid"))
            dx = f.quantity("dx", "length", required=False) or 0.0
            dy = f.quantity("dy", "length", required=False) or 0.0
            return None if base is None or not f.ok else (base[0] + dx, base[1] + dy)
        if value is None or isinstance(value, (dict, list)):
            self.errors.add(f"expected a point such as A/1 or [3 m, 4 m], got {describe_value(value)}", node.loc)
            return None
        return self.grid_point(node_text(node), node.loc)

    def grid_point(self, text: str, loc: Location) -> Point | None:
        names = [part.strip() for part in text.split("/")]
        if len(names) != 2:
            self.errors.add(f"'{text}' is not a grid point: name two grid lines, e.g. A/1", loc)
            return None
        found = {}
        for name in names:
            line = self.grids.line(name)
            if line is None:
                known = [*self.grids.x, *self.grids.y]
                self.errors.add(f"unknown grid line '{name}'{did_you_mean(name, known)}", loc)
                return None
            found[line[0]] = line[1]
        if len(found) != 2:
            self.errors.add(f"grid lines {names[0]} and {names[1]} are parallel: they do not meet at a point", loc)
            return None
        return found["x"], found["y"]

    def line(self, node: Node) -> tuple[str, float, str] | None:
        """A grid line by name, or {x: ..} / {y: ..}: (axis, coordinate, name)."""
        if isinstance(node.value, dict):
            f = FieldReader(node, GRID_KEYS, self.errors, "line")
            if len(f.map) != 1:
                self.errors.add("give a line as a grid name or one of {x: ..} or {y: ..}", node.loc)
                return None
            axis = next(iter(f.map))
            value = f.quantity(axis, "length")
            return None if value is None else (axis, value, f"{axis}={value:g}")
        if node.value is None or isinstance(node.value, list):
            self.errors.add(f"expected a grid line name, got {describe_value(node.value)}", node.loc)
            return None
        name = node_text(node)
        line = self.grids.line(name)
        if line is None:
            known = [*self.grids.x, *self.grids.y]
            self.errors.add(f"unknown grid line '{name}'{did_you_mean(name, known)}", node.loc)
            return None
        return line[0], line[1], name

    def level(self, f: FieldReader, key: str) -> tuple[str, float] | None:
        name = f.text(key)
        if not name:
            return None
        if name not in self.levels:
            self.errors.add(f"unknown level '{name}'{did_you_mean(name, self.levels)}", f.loc(key))
            f.ok = False
            return None
        return name, self.levels[name]

    def ends_extension(self, f: FieldReader) -> tuple[float, float]:
        """``extend``: one length for both ends, or [start, end]."""
        if not f.has("extend"):
            return 0.0, 0.0
        node = f.map["extend"]
        items = node.value if isinstance(node.value, list) else [node, node]
        if len(items) != 2:
            self.errors.add("extend is one length, or [start, end]", node.loc)
            f.ok = False
            return 0.0, 0.0
        out = []
        for item in items:
            try:
                value = parse_quantity(item.value, "length", item.loc)
            except InputError as exc:
                self.errors.extend(exc)
                f.ok = False
                return 0.0, 0.0
            out.append(value)
        return out[0], out[1]

    def section(self, f: FieldReader) -> tuple[float, float] | None:
        b = f.quantity("b", "length", positive=True)
        d = f.quantity("d", "length", positive=True)
        return None if b is None or d is None else (b, d)

    def horizontal_axis(self, f: FieldReader, start: Point, end: Point, what: str) -> Axis | None:
        if math.hypot(end[0] - start[0], end[1] - start[1]) < 1e-6:
            self.errors.add(f"{what} starts and ends at the same point ({start[0]:g} m, {start[1]:g} m)", f.node.loc)
            return None
        e0, e1 = self.ends_extension(f)
        axis = Axis.between(start, end)
        moved = Axis.between(axis.point(-e0), axis.point(axis.length + e1))
        if moved.length <= 1e-6 or moved.ux * axis.ux + moved.uy * axis.uy < 0:
            self.errors.add(f"{what} is shortened to nothing by its negative extend", f.loc("extend"))
            return None
        return moved

    def passed(self, f: FieldReader, keys: tuple[str, ...] = PASSED) -> dict[str, Node]:
        return {k: f.map[k] for k in keys if k in f.map}

    # ---- entries

    def member(self, item: Node) -> list[Placed]:
        f = FieldReader(item, MEMBER_KEYS, self.errors, "layout member")
        member_id = f.text("id", limit=120)
        level = self.level(f, "level")
        section = self.section(f)
        start = self.point(f.map["from"]) if f.has("from") else None
        end = self.point(f.map["to"]) if f.has("to") else None
        for key in ("from", "to"):
            if not f.has(key):
                self.errors.add(f"missing field '{key}'", item.child_loc(key))
        drop = f.quantity("drop", "length", required=False) or 0.0
        free = self.free_ends(f)
        ends = self.calc_ends(f, {"start": "start", "end": "end"})
        notches = self.calc_ends(f, {"start": "start", "end": "end"}, "notch")
        if not f.ok or level is None or section is None or start is None or end is None or free is None:
            return []
        axis = self.horizontal_axis(f, start, end, f"member '{member_id}'")
        if axis is None:
            return []
        b, d = section
        return [
            Placed(
                member_id,
                "member",
                self.passed(f),
                b,
                d,
                level[0],
                item.loc,
                item,
                f"placed from layout member {member_id}",
                axis=axis,
                top=level[1] - drop,
                drop=drop,
                free_ends=free,
                calc_ends=ends,
                notch_ends=notches,
                footprint=strip(axis, b),
            )
        ]

    def calc_ends(self, f: FieldReader, names: dict[str, str], key: str = "calc_force") -> tuple[tuple[str, Node], ...]:
        """``calc_force`` (or ``notch``) by end: {start: {D: .., L: ..}, end: ..}, or for a run by its span lines
        {A: .., B: ..}."""
        if not f.has(key):
            return ()
        node = f.map[key]
        if not isinstance(node.value, dict):
            self.errors.add(f"{key} gives its value at each end by {' or '.join(names)}", node.loc)
            f.ok = False
            return ()
        out = []
        for end, given in node.value.items():
            if end not in names:
                hint = did_you_mean(end, names)
                self.errors.add(f"{key}: '{end}' is not an end here{hint} (ends: {', '.join(names)})", given.loc)
                f.ok = False
                continue
            out.append((names[end], given))
        return tuple(out)

    def free_ends(self, f: FieldReader) -> frozenset[str] | None:
        if not f.has("free_ends"):
            return frozenset()
        node = f.map["free_ends"]
        items = node.value if isinstance(node.value, list) else [node]
        out = set()
        for it in items:
            text = node_text(it) if not isinstance(it.value, (dict, list)) else ""
            if text not in ("start", "end"):
                self.errors.add("free_ends lists the cantilevered ends: start, end or both", it.loc)
                return None
            out.add(text)
        return frozenset(out)
