"""A framing layout, read: levels, grid lines, and members placed by their ends.

The reviewer describes the framing as the drawings show it; this module places every member,
run of repeated members, post and wall in plan and in elevation. ``layout_contacts`` then
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

import math
from dataclasses import dataclass, field

from audit.core.errors import ErrorCollector, InputError, Location
from audit.core.located_yaml import Node, node_text
from audit.core.suggest import did_you_mean
from audit.core.units import parse_quantity
from audit.engine.plan_geometry import Axis, Point, Polygon, box, strip
from audit.inputs.fields import FieldReader, describe_value, list_items

LAYOUT_KEYS = {"levels", "grids", "members", "runs", "posts", "walls", "areas"}
# Fields a placed member passes to the member reader as written, so their errors point at the layout line.
PASSED = ("material", "b", "d", "service", "KT", "support", "bears_on", "plies", "ply_thickness", "label", "studs")
# The work is bounded per model, not per entry: ten runs each under its own cap would still place
# hundreds of thousands of members from a few lines. Twice the largest building benchmarked
# (50,000 bearings, about 25,000 members) is allowed.
LAYOUT_MEMBERS = 50_000

MEMBER_KEYS = {"id", "from", "to", "level", "drop", "extend", "free_ends", "calc_force", *PASSED}
RUN_KEYS = {
    "id",
    "prefix",
    "calc_force",
    "between",
    "span",
    "spacing",
    "first",
    "last",
    "level",
    "drop",
    "extend",
    "typical",
    *PASSED,
} - {
    "support",
    "bears_on",
    "studs",
}
POST_KEYS = {"id", "at", "base", "drop", "top", "d_along", "material", "b", "d", "service", "KT", "label"}
WALL_KEYS = {"id", "from", "to", "base", "drop", "top", "extend", "sole", *PASSED} - {"support", "bears_on"}
SOLE_KEYS = {"material", "b", "d", "plies", "ply_thickness", "bears_on", "label"}
ROUND = 6  # decimals of a metre (a micrometre) for every placed coordinate: the explicit model reads back exactly


def metres(value: float) -> str:
    """A length as the explicit model writes it: metres, shortest text that reads back to the same float."""
    return f"{round(value, ROUND) + 0.0!r} m"


@dataclass(frozen=True)
class Grids:
    x: dict[str, float]  # name -> x of a line of constant x
    y: dict[str, float]

    def line(self, name: str) -> tuple[str, float] | None:
        if name in self.x:
            return "x", self.x[name]
        if name in self.y:
            return "y", self.y[name]
        return None


@dataclass(frozen=True)
class Placed:
    """A member placed in space, with the entry the model reader will read for it."""

    id: str
    kind: str  # member | run | post | wall
    fields: dict[str, Node]  # the member's own fields, as written, for the model reader
    b: float
    d: float
    level: str
    loc: Location
    source: Node
    origin: str  # how it was placed, for the explicit model's note
    axis: Axis | None = None  # horizontal members
    point: Point | None = None  # posts
    top: float | None = None  # elevation of the top face (m); posts and walls: found from what is over them
    base: float | None = None  # posts and walls: elevation of the foot
    ceiling: float | None = None  # posts and walls: the elevation of their top level, the most they reach
    drop: float = 0.0
    d_along: str = "x"  # posts: which plan direction the post's d lies along
    free_ends: frozenset[str] = frozenset()
    typical: tuple[str, ...] = ()
    group: str = ""  # the run a member belongs to
    calc_ends: tuple[tuple[str, Node], ...] = ()  # (start | end, the calc's force there per case), as written
    footprint: Polygon = field(default=(), compare=False)

    @property
    def vertical(self) -> bool:
        return self.point is not None

    @property
    def bottom(self) -> float:
        if self.vertical:
            return self.base if self.base is not None else 0.0
        return (self.top if self.top is not None else 0.0) - self.d


@dataclass(frozen=True)
class Layout:
    levels: dict[str, float]
    grids: Grids
    placed: tuple[Placed, ...]
    areas: Node | None  # read by area_loads, which knows the placed members
    node: Node


def synth(value: object, at: Node, key: str) -> Node:
    """A node the layout made, located at the layout entry it came from (nodes given as written stay as they are)."""
    file, line, column = at.file, at.line, at.column
    path = f"{at.key}.{key}" if key else at.key

    def make(v: object) -> Node:
        kind = type(v)  # most values are text: test the common kinds first, cheaply
        if kind is str:
            return Node(v, file, line, column, path)
        if kind is Node:
            return v  # type: ignore[return-value]
        if kind is dict:
            return Node({k: make(x) for k, x in v.items()}, file, line, column, path)  # type: ignore[attr-defined]
        if kind is list:
            return Node([make(x) for x in v], file, line, column, path)  # type: ignore[attr-defined]
        return Node(v, file, line, column, path)

    return make(value)


# ---------------------------------------------------------------- reading


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
        ("runs", reader.run),
        ("posts", reader.post),
        ("walls", reader.wall),
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
    return Layout(levels, grids, tuple(placed), f.map.get("areas"), node)


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
    g = FieldReader(f.map["grids"], {"x", "y"}, errors, "layout grids")
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
            f = FieldReader(node, {"grid", "dx", "dy"}, self.errors, "point")
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
            f = FieldReader(node, {"x", "y"}, self.errors, "line")
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
                footprint=strip(axis, b),
            )
        ]

    def calc_ends(self, f: FieldReader, names: dict[str, str]) -> tuple[tuple[str, Node], ...]:
        """``calc_force`` by end: {start: {D: .., L: ..}, end: ..}, or for a run by its span lines {A: .., B: ..}."""
        if not f.has("calc_force"):
            return ()
        node = f.map["calc_force"]
        if not isinstance(node.value, dict):
            self.errors.add(f"calc_force gives the calc's force at each end by {' or '.join(names)}", node.loc)
            f.ok = False
            return ()
        out = []
        for key, forces in node.value.items():
            if key not in names:
                hint = did_you_mean(key, names)
                self.errors.add(f"calc_force: '{key}' is not an end here{hint} (ends: {', '.join(names)})", forces.loc)
                f.ok = False
                continue
            out.append((names[key], forces))
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

    def run(self, item: Node) -> list[Placed]:
        f = FieldReader(item, RUN_KEYS, self.errors, "layout run")
        run_id = f.text("id", limit=60)
        level = self.level(f, "level")
        section = self.section(f)
        spacing = f.quantity("spacing", "length", positive=True)
        first = f.quantity("first", "length", required=False) or 0.0
        last = f.quantity("last", "length", required=False) or 0.0
        drop = f.quantity("drop", "length", required=False) or 0.0
        prefix = f.text("prefix", required=False, limit=60)
        typical = f.text("typical", required=False, limit=100) or run_id
        lines = {}
        for key in ("between", "span"):
            node = f.map.get(key)
            if node is None:
                self.errors.add(f"missing field '{key}' (two grid lines, e.g. [1, 3])", item.child_loc(key))
                f.ok = False
                continue
            if not isinstance(node.value, list) or len(node.value) != 2:
                self.errors.add(f"{key} must be two grid lines, e.g. [A, B]", node.loc)
                f.ok = False
                continue
            pair = [self.line(n) for n in node.value]
            if pair[0] is None or pair[1] is None:
                f.ok = False
                continue
            if pair[0][0] != pair[1][0]:
                self.errors.add(f"the two lines of {key} must be parallel (both x or both y lines)", node.loc)
                f.ok = False
                continue
            lines[key] = (pair[0], pair[1])
        if not f.ok or level is None or section is None or spacing is None or len(lines) != 2:
            return []
        (a0, a1), (s0, s1) = lines["between"], lines["span"]
        ends = self.calc_ends(f, {s0[2]: "start", s1[2]: "end"})
        if a0[0] == s0[0]:
            self.errors.add("a run's 'between' and 'span' lines must cross (x lines and y lines)", item.loc)
            return []
        b, d = section
        if spacing < b - 1e-9:
            self.errors.add(f"spacing {spacing * 1000:.0f} mm is less than b = {b * 1000:.0f} mm", f.loc("spacing"))
            return []
        lo, hi = a0[1], a1[1]
        sign, total = (1.0 if hi >= lo else -1.0), abs(hi - lo)
        reach = total - last  # the offset of the run's last member
        if not 0.0 <= first <= reach + 1e-9 or last < 0.0:
            self.errors.add("first and last must lie between the run's two lines, first before last", item.loc)
            return []
        if (reach - first) / spacing > 20000:
            self.errors.add(f"run '{run_id}' would place more than 20000 members", item.loc)
            return []
        if (reach - first) / spacing + 1 > self.room:
            self.errors.add(
                f"run '{run_id}' would take the layout past {LAYOUT_MEMBERS:,} members in all; split the layout",
                item.loc,
            )
            self.room = -1
            return []
        offsets = [first + k * spacing for k in range(math.floor((reach - first) / spacing + 1e-9) + 1)]
        if reach - offsets[-1] >= b - 1e-9:
            offsets.append(reach)  # the last member of the run, ``last`` short of its far line
        centres = [lo + sign * o for o in offsets]
        out = []
        name = prefix if prefix else f"{run_id}-{s0[2]}-{s1[2]}-"
        for n, c in enumerate(centres, start=1):
            if a0[0] == "x":
                start, end = (c, s0[1]), (c, s1[1])
            else:
                start, end = (s0[1], c), (s1[1], c)
            axis = self.horizontal_axis(f, start, end, f"run '{run_id}'")
            if axis is None:
                return []
            member_id = f"{name}{n}"
            out.append(
                Placed(
                    member_id,
                    "run",
                    self.passed(f, tuple(k for k in PASSED if k in RUN_KEYS)),
                    b,
                    d,
                    level[0],
                    item.loc,
                    item,
                    f"member {n} of {len(centres)} of layout run {run_id}, at {a0[0]} = {round(c, ROUND):g} m",
                    axis=axis,
                    top=level[1] - drop,
                    drop=drop,
                    typical=(typical,),
                    group=run_id,
                    calc_ends=ends,
                    footprint=strip(axis, b),
                )
            )
        return out

    def foot_below_top(
        self, f: FieldReader, what: str, base: tuple[str, float], drop: float, top: tuple[str, float]
    ) -> bool:
        """A drop (negative: raised) that puts the foot at or above the top is the post's or wall's own
        error, not a fault of the member it was to carry."""
        foot = base[1] - drop
        if foot < top[1]:
            return True
        self.errors.add(
            f"{what}: with drop {drop * 1000:g} mm below level {base[0]} its foot is at {foot:.3f} m, not below "
            f"its top at level {top[0]} ({top[1]:.3f} m)",
            f.loc("drop"),
        )
        return False

    def post(self, item: Node) -> list[Placed]:
        f = FieldReader(item, POST_KEYS, self.errors, "layout post")
        post_id = f.text("id", limit=120)
        section = self.section(f)
        at = self.point(f.map["at"]) if f.has("at") else None
        if not f.has("at"):
            self.errors.add("missing field 'at'", item.child_loc("at"))
        base, top = self.level(f, "base"), self.level(f, "top")
        d_along = f.choice("d_along", ("x", "y"), required=False, default="x")
        drop = f.quantity("drop", "length", required=False) or 0.0
        if not f.ok or section is None or at is None or base is None or top is None:
            return []
        if top[1] <= base[1]:
            self.errors.add(f"post '{post_id}': top level {top[0]} is not above base level {base[0]}", f.loc("top"))
            return []
        if not self.foot_below_top(f, f"post '{post_id}'", base, drop, top):
            return []
        b, d = section
        footprint = box(at, d, b) if d_along == "x" else box(at, b, d)
        return [
            Placed(
                post_id,
                "post",
                self.passed(f, ("material", "b", "d", "service", "KT", "label")),
                b,
                d,
                base[0],
                item.loc,
                item,
                f"placed from layout post {post_id}",
                point=at,
                base=base[1] - drop,
                drop=drop,
                ceiling=top[1],
                d_along=d_along,
                footprint=footprint,
            )
        ]

    def wall(self, item: Node) -> list[Placed]:
        f = FieldReader(item, WALL_KEYS, self.errors, "layout wall")
        wall_id = f.text("id", limit=120)
        section = self.section(f)
        start = self.point(f.map["from"]) if f.has("from") else None
        end = self.point(f.map["to"]) if f.has("to") else None
        for key in ("from", "to"):
            if not f.has(key):
                self.errors.add(f"missing field '{key}'", item.child_loc(key))
        base, top = self.level(f, "base"), self.level(f, "top")
        drop = f.quantity("drop", "length", required=False) or 0.0
        if not f.ok or section is None or start is None or end is None or base is None or top is None:
            return []
        if top[1] <= base[1]:
            self.errors.add(f"wall '{wall_id}': top level {top[0]} is not above base level {base[0]}", f.loc("top"))
            return []
        if not self.foot_below_top(f, f"wall '{wall_id}'", base, drop, top):
            return []
        axis = self.horizontal_axis(f, start, end, f"wall '{wall_id}'")
        if axis is None:
            return []
        b, d = section
        fields = self.passed(f)
        fields["support"] = synth("studs" if f.has("studs") else "continuous", item, "support")
        soles = self.sole(f, wall_id, axis, base, drop)
        if soles is None:
            return []
        if soles:
            studs = f.map["studs"]
            fields["studs"] = Node({**studs.value, "sole": synth(soles[0].id, studs, "sole")}, studs.file,
                                   studs.line, studs.column, studs.key, studs.key_marks)  # fmt: skip
        foot = base[1] - drop + (soles[0].d if soles else 0.0)
        return [
            *soles,
            Placed(
                wall_id,
                "wall",
                fields,
                b,
                d,
                top[0],  # the plate is drawn and named with the level it carries
                item.loc,
                item,
                f"top plate of layout wall {wall_id}",
                axis=axis,
                base=foot,
                drop=drop,
                ceiling=top[1],
                footprint=strip(axis, b),
            ),
        ]

    def sole(
        self, f: FieldReader, wall_id: str, axis: Axis, base: tuple[str, float], drop: float
    ) -> list[Placed] | None:
        """A wall's bottom plate: the studs stand on it, and it bears on what is under the wall (on the lowest level,
        continuously, on the foundation)."""
        if not f.has("sole"):
            return []
        node = f.map["sole"]
        if not f.has("studs"):
            self.errors.add("a sole plate carries studs: give 'studs' too", node.loc)
            return None
        s = FieldReader(node, SOLE_KEYS, self.errors, f"sole plate of wall '{wall_id}'")
        section = self.section(s)
        if not s.ok or section is None:
            return None
        fields = {k: s.map[k] for k in SOLE_KEYS if k in s.map}
        lowest = base[1] <= min(self.levels.values()) + 1e-9
        if lowest:
            fields["support"] = synth("continuous", node, "support")
        elif s.has("bears_on"):
            self.errors.add("'bears_on' is for a sole plate on the lowest level (on the foundation)", s.loc("bears_on"))
            return None
        b, d = section
        return [
            Placed(
                f"{wall_id}.sole",
                "sole",
                fields,
                b,
                d,
                base[0],
                node.loc,
                node,
                f"sole plate of layout wall {wall_id}" + (", on the foundation" if lowest else ""),
                axis=axis,
                top=base[1] - drop + d,
                drop=drop,
                footprint=strip(axis, b),
            )
        ]
