"""Placing the repeated framing of a layout: runs of members, posts, and walls with their sole plates."""

from __future__ import annotations

import math
from dataclasses import dataclass

from audit.core.located_yaml import Node
from audit.engine.plan_geometry import Axis, box, strip
from audit.inputs.fields import FieldReader
from audit.inputs.layout_placer import Placer
from audit.inputs.layout_records import (
    LAYOUT_MEMBERS,
    PASSED,
    POST_KEYS,
    ROUND,
    RUN_KEYS,
    SOLE_KEYS,
    WALL_KEYS,
    Placed,
    synth,
)


def place_run(placer: Placer, item: Node) -> list[Placed]:
    f = FieldReader(item, RUN_KEYS, placer.errors, "layout run")
    run_id = f.text("id", limit=60)
    level = placer.level(f, "level")
    section = placer.section(f)
    spacing = f.quantity("spacing", "length", positive=True)
    first = f.quantity("first", "length", required=False) or 0.0
    last = f.quantity("last", "length", required=False) or 0.0
    drop = f.quantity("drop", "length", required=False) or 0.0
    prefix = f.text("prefix", required=False, limit=60)
    typical = f.text("typical", required=False, limit=100) or run_id
    hanger = f.text("hanger", required=False, limit=120)
    lines = {key: pair for key in ("between", "span") if (pair := _line_pair(placer, f, item, key)) is not None}
    if not f.ok or level is None or section is None or spacing is None or len(lines) != 2:
        return []
    (a0, a1), (s0, s1) = lines["between"], lines["span"]
    ends = placer.calc_ends(f, {s0[2]: "start", s1[2]: "end"})
    notches = placer.calc_ends(f, {s0[2]: "start", s1[2]: "end"}, "notch")
    if a0[0] == s0[0]:
        placer.errors.add("a run's 'between' and 'span' lines must cross (x lines and y lines)", item.loc)
        return []
    b = section[0]
    if spacing < b - 1e-9:
        placer.errors.add(f"spacing {spacing * 1000:.0f} mm is less than b = {b * 1000:.0f} mm", f.loc("spacing"))
        return []
    lo, hi = a0[1], a1[1]
    sign, total = (1.0 if hi >= lo else -1.0), abs(hi - lo)
    reach = total - last  # the offset of the run's last member
    if not 0.0 <= first <= reach + 1e-9 or last < 0.0:
        placer.errors.add("first and last must lie between the run's two lines, first before last", item.loc)
        return []
    if (reach - first) / spacing > 20000:
        placer.errors.add(f"run '{run_id}' would place more than 20000 members", item.loc)
        return []
    if (reach - first) / spacing + 1 > placer.room:
        placer.errors.add(
            f"run '{run_id}' would take the layout past {LAYOUT_MEMBERS:,} members in all; split the layout",
            item.loc,
        )
        placer.room = -1
        return []
    offsets = [first + k * spacing for k in range(math.floor((reach - first) / spacing + 1e-9) + 1)]
    if reach - offsets[-1] >= b - 1e-9:
        offsets.append(reach)  # the last member of the run, ``last`` short of its far line
    centres = [lo + sign * o for o in offsets]
    name = prefix if prefix else f"{run_id}-{s0[2]}-{s1[2]}-"
    shape = RunShape(run_id, name, typical, level, drop, section, a0[0], s0, s1, ends, hanger, notches)
    return _run_members(placer, f, item, shape, centres)


@dataclass(frozen=True)
class RunShape:
    """What every member of a run shares: its names, level, section, the lines it spans and its calc's ends."""

    run_id: str
    name: str  # the members' ids: name + their number
    typical: str
    level: tuple[str, float]
    drop: float
    section: tuple[float, float]
    across: str  # the axis of the 'between' lines: "x" or "y"
    s0: tuple[str, float, str]
    s1: tuple[str, float, str]
    ends: tuple[tuple[str, Node], ...]
    hanger: str = ""  # the hanger its members frame into their carriers' sides in
    notches: tuple[tuple[str, Node], ...] = ()


def _run_members(placer: Placer, f: FieldReader, item: Node, run: RunShape, centres: list[float]) -> list[Placed]:
    """The members of a run, one at each centre, each spanning the run's two span lines."""
    run_id, level, drop, s0, s1 = run.run_id, run.level, run.drop, run.s0, run.s1
    b, d = run.section
    out = []
    for n, c in enumerate(centres, start=1):
        if run.across == "x":
            start, end = (c, s0[1]), (c, s1[1])
        else:
            start, end = (s0[1], c), (s1[1], c)
        axis = placer.horizontal_axis(f, start, end, f"run '{run_id}'")
        if axis is None:
            return []
        member_id = f"{run.name}{n}"
        out.append(
            Placed(
                member_id,
                "run",
                placer.passed(f, tuple(k for k in PASSED if k in RUN_KEYS)),
                b,
                d,
                level[0],
                item.loc,
                item,
                f"member {n} of {len(centres)} of layout run {run_id}, at {run.across} = {round(c, ROUND):g} m",
                axis=axis,
                top=level[1] - drop,
                drop=drop,
                typical=(run.typical,),
                group=run_id,
                hanger=run.hanger,
                calc_ends=run.ends,
                notch_ends=run.notches,
                footprint=strip(axis, b),
            )
        )
    return out


def _line_pair(
    placer: Placer, f: FieldReader, item: Node, key: str
) -> tuple[tuple[str, float, str], tuple[str, float, str]] | None:
    """The two parallel grid lines of a run's ``between`` or ``span``; None (and f not ok) if they are not."""
    node = f.map.get(key)
    if node is None:
        placer.errors.add(f"missing field '{key}' (two grid lines, e.g. [1, 3])", item.child_loc(key))
        f.ok = False
        return None
    if not isinstance(node.value, list) or len(node.value) != 2:
        placer.errors.add(f"{key} must be two grid lines, e.g. [A, B]", node.loc)
        f.ok = False
        return None
    pair = [placer.line(n) for n in node.value]
    if pair[0] is None or pair[1] is None:
        f.ok = False
        return None
    if pair[0][0] != pair[1][0]:
        placer.errors.add(f"the two lines of {key} must be parallel (both x or both y lines)", node.loc)
        f.ok = False
        return None
    return pair[0], pair[1]


def _foot_below_top(
    placer: Placer, f: FieldReader, what: str, base: tuple[str, float], drop: float, top: tuple[str, float]
) -> bool:
    """A drop (negative: raised) that puts the foot at or above the top is the post's or wall's own
    error, not a fault of the member it was to carry."""
    foot = base[1] - drop
    if foot < top[1]:
        return True
    placer.errors.add(
        f"{what}: with drop {drop * 1000:g} mm below level {base[0]} its foot is at {foot:.3f} m, not below "
        f"its top at level {top[0]} ({top[1]:.3f} m)",
        f.loc("drop"),
    )
    return False


def place_post(placer: Placer, item: Node) -> list[Placed]:
    f = FieldReader(item, POST_KEYS, placer.errors, "layout post")
    post_id = f.text("id", limit=120)
    section = placer.section(f)
    at = placer.point(f.map["at"]) if f.has("at") else None
    if not f.has("at"):
        placer.errors.add("missing field 'at'", item.child_loc("at"))
    base, top = placer.level(f, "base"), placer.level(f, "top")
    d_along = f.choice("d_along", ("x", "y"), required=False, default="x")
    drop = f.quantity("drop", "length", required=False) or 0.0
    if not f.ok or section is None or at is None or base is None or top is None:
        return []
    if top[1] <= base[1]:
        placer.errors.add(f"post '{post_id}': top level {top[0]} is not above base level {base[0]}", f.loc("top"))
        return []
    if not _foot_below_top(placer, f, f"post '{post_id}'", base, drop, top):
        return []
    b, d = section
    footprint = box(at, d, b) if d_along == "x" else box(at, b, d)
    return [
        Placed(
            post_id,
            "post",
            placer.passed(f, ("material", "b", "d", "service", "KT", "label")),
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


def place_wall(placer: Placer, item: Node) -> list[Placed]:
    f = FieldReader(item, WALL_KEYS, placer.errors, "layout wall")
    wall_id = f.text("id", limit=120)
    section = placer.section(f)
    start = placer.point(f.map["from"]) if f.has("from") else None
    end = placer.point(f.map["to"]) if f.has("to") else None
    for key in ("from", "to"):
        if not f.has(key):
            placer.errors.add(f"missing field '{key}'", item.child_loc(key))
    base, top = placer.level(f, "base"), placer.level(f, "top")
    drop = f.quantity("drop", "length", required=False) or 0.0
    if not f.ok or section is None or start is None or end is None or base is None or top is None:
        return []
    if top[1] <= base[1]:
        placer.errors.add(f"wall '{wall_id}': top level {top[0]} is not above base level {base[0]}", f.loc("top"))
        return []
    if not _foot_below_top(placer, f, f"wall '{wall_id}'", base, drop, top):
        return []
    axis = placer.horizontal_axis(f, start, end, f"wall '{wall_id}'")
    if axis is None:
        return []
    b, d = section
    fields = placer.passed(f)
    fields["support"] = synth("studs" if f.has("studs") else "continuous", item, "support")
    soles = _sole(placer, f, wall_id, axis, base, drop)
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


def _sole(
    placer: Placer, f: FieldReader, wall_id: str, axis: Axis, base: tuple[str, float], drop: float
) -> list[Placed] | None:
    """A wall's bottom plate: the studs stand on it, and it bears on what is under the wall (on the lowest level,
    continuously, on the foundation)."""
    if not f.has("sole"):
        return []
    node = f.map["sole"]
    if not f.has("studs"):
        placer.errors.add("a sole plate carries studs: give 'studs' too", node.loc)
        return None
    s = FieldReader(node, SOLE_KEYS, placer.errors, f"sole plate of wall '{wall_id}'")
    section = placer.section(s)
    if not s.ok or section is None:
        return None
    fields = {k: s.map[k] for k in SOLE_KEYS if k in s.map}
    lowest = base[1] <= min(placer.levels.values()) + 1e-9
    if lowest:
        fields["support"] = synth("continuous", node, "support")
    elif s.has("bears_on"):
        placer.errors.add("'bears_on' is for a sole plate on the lowest level (on the foundation)", s.loc("bears_on"))
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
