"""The records of a framing layout and its vocabulary: grids, placed members, the layout read, synthesised nodes."""

from __future__ import annotations

from dataclasses import dataclass, field

from audit.core.errors import Location
from audit.core.located_yaml import Node
from audit.engine.plan_geometry import Axis, Point, Polygon

LAYOUT_KEYS = {"levels", "grids", "members", "runs", "posts", "walls", "areas", "labels"}
# Fields a placed member passes to the member reader as written, so their errors point at the layout line.
PASSED = ("material", "b", "d", "service", "KT", "support", "bears_on", "plies", "ply_thickness", "label", "studs")
# The work is bounded per model, not per entry: ten runs each under its own cap would still place
# hundreds of thousands of members from a few lines. Twice the largest building benchmarked
# (50,000 bearings, about 25,000 members) is allowed.
LAYOUT_MEMBERS = 50_000

MEMBER_KEYS = {"id", "from", "to", "level", "drop", "extend", "free_ends", "calc_force", "notch", *PASSED}
RUN_KEYS = {
    "id",
    "prefix",
    "calc_force",
    "notch",
    "between",
    "span",
    "spacing",
    "first",
    "last",
    "level",
    "drop",
    "extend",
    "typical",
    "hanger",
    *PASSED,
} - {
    "support",
    "bears_on",
    "studs",
}
POST_KEYS = {"id", "at", "base", "drop", "top", "d_along", "material", "b", "d", "service", "KT", "label"}
WALL_KEYS = {"id", "from", "to", "base", "drop", "top", "extend", "sole", *PASSED} - {"support", "bears_on"}
GRID_KEYS = {"x", "y"}  # also the two keys of a line given as {x: ..} or {y: ..}
POINT_KEYS = {"grid", "dx", "dy"}
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
    hanger: str = ""  # a run's members frame into the side of what carries them, in this hanger
    calc_ends: tuple[tuple[str, Node], ...] = ()  # (start | end, the calc's force there per case), as written
    notch_ends: tuple[tuple[str, Node], ...] = ()  # (start | end, the notch depth cut out at that end), as written
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
    labels: Node | None = None  # found bearing id -> the calc's labels for it (read by layout_labels)


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
