"""Floor and roof loads in kPa (or psf) on an area, shared among the members that span it.

Each member spanning the area's way takes the strip of floor half way to its neighbours on
either side (an edge member out to the area's edge), as a line load over the part of it that
lies in the area; an opening takes its strip away where it crosses (openings that overlap, or
one listed twice, take their overlap away once). What the members take adds
up to the whole area's load; a part of the area no member reaches is a warning, never dropped
in silence. Each load says how its width was made.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass

from audit.core.errors import ErrorCollector, InputError
from audit.core.located_yaml import Node
from audit.core.suggest import did_you_mean
from audit.core.units import parse_quantity
from audit.inputs.fields import FieldReader, describe_value, list_items
from audit.inputs.layout_contacts import SQUARE
from audit.inputs.layout_placer import Placer
from audit.inputs.layout_records import ROUND, Layout, Placed, metres, synth
from audit.inputs.model_keys import WIND_KEYS

AREA_KEYS = {"id", "level", "corners", "span", "loads", "live", "openings", "carried_by"}
Rect = tuple[float, float, float, float]  # x0, y0, x1, y1
# An edge member whose strip out to the area's edge is 1.4 times its neighbour's (or more) is warned:
# the edge strip is most likely carried by a rim or wall the layout does not name (the threshold of the issue
# that asked for the warning; common practice, not a code value).
EDGE_STRIP_RATIO = 1.4


@dataclass(frozen=True)
class Share:
    """One member's share of an area: a line load over ``start``..``end`` along it, per case."""

    member: str
    start: float  # m along the member
    end: float
    width: float  # tributary width (m)
    per_case: tuple[tuple[str, float], ...]  # case -> N/m (W:pressure and W:suction for wind both ways)
    how: str


def area_shares(layout: Layout, placed: tuple[Placed, ...], errors: ErrorCollector, warnings: list[str]):
    """(area entry, its shares) for every area of the layout."""
    if layout.areas is None:
        return []
    placer = Placer(layout.levels, layout.grids, errors)
    out = []
    seen: set[str] = set()
    for item in list_items(layout.areas, "layout areas", errors):
        read = _read_area(item, placer, errors)
        if read is None:
            continue
        area_id = read[0]
        if area_id in seen:
            errors.add(f"duplicate area id '{area_id}'", item.loc)
            continue
        seen.add(area_id)
        warnings.extend(opening_warnings(item, read[3], read[4]))
        out.append((item, _shares(item, read, placed, errors, warnings)))
    return out


def _read_area(item: Node, placer: Placer, errors: ErrorCollector):
    f = FieldReader(item, AREA_KEYS, errors, "layout area")
    area_id = f.text("id", limit=60)
    level = placer.level(f, "level")
    span = f.choice("span", ("x", "y"))
    corners = _rect(f.map["corners"], placer, errors) if f.has("corners") else None
    if not f.has("corners"):
        errors.add("missing field 'corners' (two opposite corners, e.g. [A/1, B/3])", item.child_loc("corners"))
    openings = []
    if f.has("openings"):
        for o in list_items(f.map["openings"], "openings", errors):
            rect = _rect(o, placer, errors)
            if rect is None:
                return None
            openings.append(rect)
    cases = _pressures(f, errors)
    on: tuple[str, ...] | None = None
    if f.has("carried_by"):
        node = f.map["carried_by"]
        if not isinstance(node.value, list):
            errors.add("carried_by lists the members or runs that carry the area, e.g. [J, GB1]", node.loc)
            return None
        on = tuple(str(n.value) for n in node.value)
    if not f.ok or level is None or corners is None or cases is None:
        return None
    return area_id, level, span, corners, tuple(openings), cases, on


def _rect(node: Node, placer: Placer, errors: ErrorCollector) -> Rect | None:
    if not isinstance(node.value, list) or len(node.value) != 2:
        errors.add(f"expected two opposite corners such as [A/1, B/3], got {describe_value(node.value)}", node.loc)
        return None
    p, q = placer.point(node.value[0]), placer.point(node.value[1])
    if p is None or q is None:
        return None
    rect = (min(p[0], q[0]), min(p[1], q[1]), max(p[0], q[0]), max(p[1], q[1]))
    if rect[2] - rect[0] < 1e-6 or rect[3] - rect[1] < 1e-6:
        errors.add("the corners do not enclose an area", node.loc)
        return None
    return rect


def _pressures(f: FieldReader, errors: ErrorCollector) -> tuple[tuple[str, object], ...] | None:
    """Case -> pressure (Pa), or for wind both ways case -> {pressure, suction}."""
    if not f.has("loads"):
        errors.add("missing field 'loads' (by case, e.g. {D: 1.2 kPa, L: 1.9 kPa})", f.node.child_loc("loads"))
        return None
    node = f.map["loads"]
    if not isinstance(node.value, dict) or not node.value:
        errors.add("loads must map a load case to a pressure, e.g. {D: 1.2 kPa}", node.loc)
        return None
    out: list[tuple[str, object]] = []
    for case, item in node.value.items():
        try:
            if case == "W" and isinstance(item.value, dict):
                w = FieldReader(item, WIND_KEYS, errors, "wind both ways")
                both = {k: w.quantity(k, "stress") for k in ("pressure", "suction") if w.has(k)}
                if not w.ok or not both:
                    return None
                out.append((case, both))
            else:
                out.append((str(case), parse_quantity(item.value, "stress", item.loc)))
        except InputError as exc:
            errors.extend(exc)
            return None
    return tuple(out)


def _carriers(item: Node, read, placed: tuple[Placed, ...], errors: ErrorCollector) -> list[Placed]:
    _, level, span, (x0, y0, x1, y1), _, _, on = read
    lo, hi = (y0, y1) if span == "x" else (x0, x1)
    groups = {p.group for p in placed if p.group} | {p.id for p in placed}
    if on is not None:
        for name in on:
            if name not in groups:
                errors.add(f"unknown member or run '{name}'{did_you_mean(name, groups)}", item.child_loc("carried_by"))
    out = []
    for p in placed:
        if p.axis is None or p.kind in ("wall", "sole"):
            continue
        if on is not None and p.id not in on and p.group not in on:
            continue
        if on is None and (p.level != level[0] or abs(p.drop) > 1e-9):
            continue
        along_span = abs(p.axis.ux) if span == "x" else abs(p.axis.uy)
        if along_span < 1 - SQUARE * SQUARE:
            continue
        if lo - 1e-6 <= _cross(p, span) <= hi + 1e-6:
            out.append(p)
    return sorted(out, key=lambda p: _cross(p, span))


def _span_range(p: Placed, span: str) -> tuple[float, float]:
    axis = p.axis
    assert axis is not None
    end = axis.point(axis.length)
    a, b = (axis.start[0], end[0]) if span == "x" else (axis.start[1], end[1])
    return min(a, b), max(a, b)


def _cross(p: Placed, span: str) -> float:
    assert p.axis is not None
    return p.axis.start[1] if span == "x" else p.axis.start[0]


def _shares(item: Node, read, placed: tuple[Placed, ...], errors: ErrorCollector, warnings: list[str]) -> list[Share]:
    """Slice the area across its span at every member end and opening edge; in each slice, the
    members that run through it share it by tributary width (half way to the next on each side)."""
    area_id, _, span, rect, openings, cases, _ = read
    x0, y0, x1, y1 = rect
    (s_lo, s_hi), (c_lo, c_hi) = ((x0, x1), (y0, y1)) if span == "x" else ((y0, y1), (x0, x1))
    carriers = _carriers(item, read, placed, errors)
    whole = (x1 - x0) * (y1 - y0) - _open_area(openings, span, (s_lo, s_hi), (c_lo, c_hi))
    if not carriers:
        errors.add(f"area '{area_id}': no member spans it the {span} way", item.loc)
        return []
    ranges = {p.id: _span_range(p, span) for p in carriers}
    cuts = {s_lo, s_hi}
    cuts.update(v for r in ranges.values() for v in r if s_lo < v < s_hi)
    for o in openings:
        cuts.update(v for v in ((o[0], o[2]) if span == "x" else (o[1], o[3])) if s_lo < v < s_hi)
    points = sorted(cuts)
    pieces: dict[str, list[list[float]]] = {}  # member -> [[s0, s1, width, n, count]]
    words: dict[str, str] = {}
    taken = 0.0
    heavy: dict[str, tuple[float, str, float, float]] = {}  # edge member -> its width, neighbour's, the edge
    groups: dict[tuple[float, float], list[Placed]] = {}  # members of one run share their span range
    for p in carriers:
        groups.setdefault(ranges[p.id], []).append(p)
    for s0, s1 in itertools.pairwise(points):
        mid = (s0 + s1) / 2
        here = sorted(
            (p for (lo, hi), members in groups.items() if lo <= mid <= hi for p in members),
            key=lambda p: _cross(p, span),
        )
        across = _openings_across(openings, span, mid)
        widths: list[tuple[Placed, float]] = []
        for n, p in enumerate(here):
            c = _cross(p, span)
            left = c_lo if n == 0 else (_cross(here[n - 1], span) + c) / 2
            right = c_hi if n == len(here) - 1 else (c + _cross(here[n + 1], span)) / 2
            width = right - left - _covered(across, left, right)
            widths.append((p, right - left))  # the strip as the rule gives it, openings aside
            if width <= 1e-9:
                continue
            taken += width * (s1 - s0)
            words.setdefault(p.id, _width_words(n, here, left, right, c_lo, c_hi))
            runs = pieces.setdefault(p.id, [])
            if runs and abs(runs[-1][2] - width) < 1e-9 and abs(runs[-1][1] - s0) < 1e-9:
                runs[-1][1] = s1
            else:
                runs.append([s0, s1, width])
        for name, seen in heavy_edges(widths, (c_lo, c_hi)).items():
            heavy.setdefault(name, seen)
    for name, (width, neighbour, other, edge) in heavy.items():
        warnings.append(
            f"{item.loc}: area '{area_id}': '{name}', the member nearest its edge at {edge:g} m, takes the strip "
            f"out to that edge: {width * 1000:.0f} mm wide, {width / other:.2f} times the {other * 1000:.0f} mm "
            f"of '{neighbour}'; if a rim, wall or blocking carries that edge, give the area's 'carried_by' "
            "or bring its corner to the first member"
        )
    out: list[Share] = []
    for p in carriers:
        for s0, s1, width in pieces.get(p.id, []):
            start, end = _along(p, span, s0, s1)
            out.append(Share(p.id, start, end, width, _line_loads(cases, width), f"area {area_id}: {words[p.id]}"))
    if whole - taken > 1e-6 * max(1.0, whole):
        warnings.append(
            f"{item.loc}: area '{area_id}': {whole - taken:.3f} m2 of its {whole:.3f} m2 reach no member "
            "(the members spanning it stop short of its edges)"
        )
    return out


def heavy_edges(
    widths: list[tuple[Placed, float]], edges: tuple[float, float]
) -> dict[str, tuple[float, str, float, float]]:
    """Edge members of one slice whose strip out to the area's edge is at least ``EDGE_STRIP_RATIO`` times
    their neighbour's: the rule that gives the edge strip to the first member then loads it well past the rest."""
    out: dict[str, tuple[float, str, float, float]] = {}
    if len(widths) < 2:
        return out
    for (p, width), (q, other), edge in ((widths[0], widths[1], edges[0]), (widths[-1], widths[-2], edges[1])):
        if other > 1e-9 and width >= EDGE_STRIP_RATIO * other - 1e-9:
            out[p.id] = (width, q.id, other, edge)
    return out


def _along(p: Placed, span: str, s0: float, s1: float) -> tuple[float, float]:
    """Span coordinates as positions along the member, from its start."""
    axis = p.axis
    assert axis is not None
    u = axis.ux if span == "x" else axis.uy
    start_s = axis.start[0] if span == "x" else axis.start[1]
    q0, q1 = sorted(((s0 - start_s) * u, (s1 - start_s) * u))
    return round(max(q0, 0.0), ROUND), round(min(q1, axis.length), ROUND)


def _width_words(n: int, carriers: list[Placed], left: float, right: float, c_lo: float, c_hi: float) -> str:
    sides = []
    for _bound, edge, k in ((left, c_lo, n - 1), (right, c_hi, n + 1)):
        if 0 <= k < len(carriers):
            sides.append(f"half way to {carriers[k].id}")
        else:
            sides.append(f"to the area's edge at {edge:g} m")
    return f"tributary width {(right - left) * 1000:.0f} mm ({sides[0]}; {sides[1]})"


def _line_loads(cases, width: float) -> tuple[tuple[str, float], ...]:
    out: list[tuple[str, float]] = []
    for case, value in cases:
        if isinstance(value, dict):
            out += [(f"W:{k}", round(v * width, 3)) for k, v in value.items()]
        else:
            out.append((case, round(float(value) * width, 3)))
    return tuple(out)


def _openings_across(openings: tuple[Rect, ...], span: str, s: float) -> list[tuple[float, float]]:
    """The cross-span intervals of the openings that the line at span coordinate ``s`` passes through."""
    out = []
    for o in openings:
        os0, os1, oc0, oc1 = (o[0], o[2], o[1], o[3]) if span == "x" else (o[1], o[3], o[0], o[2])
        if os0 <= s <= os1:
            out.append((oc0, oc1))
    return out


def _covered(intervals: list[tuple[float, float]], lo: float, hi: float) -> float:
    """How much of lo..hi the intervals cover together: where openings overlap (or one is listed twice),
    the overlap is open once, not twice."""
    total, reach = 0.0, lo
    for a, b in sorted(intervals):
        a, b = max(a, reach), min(b, hi)
        if b > a:
            total += b - a
            reach = b
    return total


def _open_area(
    openings: tuple[Rect, ...], span: str, s_range: tuple[float, float], c_range: tuple[float, float]
) -> float:
    """The area the openings take out of the area together (their union inside it), slice by slice."""
    s_lo, s_hi = s_range
    edges = {s_lo, s_hi}
    for o in openings:
        edges.update(v for v in ((o[0], o[2]) if span == "x" else (o[1], o[3])) if s_lo < v < s_hi)
    return sum(
        (s1 - s0) * _covered(_openings_across(openings, span, (s0 + s1) / 2), *c_range)
        for s0, s1 in itertools.pairwise(sorted(edges))
    )


def opening_warnings(item: Node, rect: Rect, openings: tuple[Rect, ...]) -> list[str]:
    """An opening as large as its area or larger, or lying (partly) outside it, is most likely a typo."""
    area_id = item.value["id"].value if isinstance(item.value, dict) and "id" in item.value else "area"
    nodes = item.value["openings"].value if isinstance(item.value, dict) and "openings" in item.value else []
    whole = (rect[2] - rect[0]) * (rect[3] - rect[1])
    out = []
    seen: set[Rect] = set()
    for node, o in zip(nodes, openings, strict=False):
        if o in seen:
            out.append(f"{node.loc}: area '{area_id}': the same opening is listed twice; it is taken away once")
        seen.add(o)
        size, inside = (o[2] - o[0]) * (o[3] - o[1]), _overlap_area(o, rect)
        if inside >= whole * (1 - 1e-9):
            out.append(f"{node.loc}: area '{area_id}': the opening covers the whole area, which then carries nothing")
        elif inside < size * (1 - 1e-9):
            where = "lies outside the area" if inside <= 1e-12 else "lies partly outside the area"
            out.append(
                f"{node.loc}: area '{area_id}': the opening {where}; only the part inside "
                f"({inside:.3f} of {size:.3f} m2) is taken away"
            )
    return out


def _overlap_area(o: tuple[float, float, float, float], rect: tuple[float, float, float, float]) -> float:
    w = max(0.0, min(o[2], rect[2]) - max(o[0], rect[0]))
    h = max(0.0, min(o[3], rect[3]) - max(o[1], rect[1]))
    return w * h


def share_entries(item: Node, shares: list[Share], live: Node | None) -> list[Node]:
    """The shares as the loads section of the explicit model would give them."""
    area_id = item.value["id"].value if isinstance(item.value, dict) and "id" in item.value else "area"
    counts: dict[str, int] = {}
    for s in shares:
        counts[s.member] = counts.get(s.member, 0) + 1
    seen: dict[str, int] = {}
    out = []
    for s in shares:
        seen[s.member] = seen.get(s.member, 0) + 1
        suffix = f":{seen[s.member]}" if counts[s.member] > 1 else ""
        specified: dict[str, object] = {}
        wind = {k.split(":", 1)[1]: f"{abs(v)!r} N/m" for k, v in s.per_case if k.startswith("W:")}
        for case, value in s.per_case:
            if not case.startswith("W:"):
                specified[case] = f"{value!r} N/m"
        if wind:
            specified["W"] = wind
        entry: dict[str, object] = {
            "id": f"{area_id}:{s.member}{suffix}",
            "member": s.member,
            "type": "uniform",
            "from": metres(s.start),
            "to": metres(s.end),
            "specified": specified,
        }
        if live is not None:
            entry["live"] = live
        entry["note"] = f"{s.how}, over {s.start:g} m to {s.end:g} m"
        out.append(synth(entry, item, ""))
    return out
