"""Where placed members bear on each other, found from their geometry.

Two members bear on each other where their footprints overlap in plan and the underside of
one meets the top of the other (within ``LEVEL_TOLERANCE``). Posts and walls first reach up
to the underside of whatever is over them. The bearing centre and length along each member
come from the overlap of the footprints. Members that overlap in space, an end that sits on
nothing, two supports under one end, and crossings at a skew are reported with the members
and coordinates. Candidate pairs come from a grid index, never a test of every pair.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass, replace

from audit.core.errors import ErrorCollector
from audit.engine.plan_geometry import (
    GridIndex,
    Polygon,
    area,
    bounds,
    centroid,
    extent,
    is_upright_box,
    overlap_region,
)
from audit.inputs.layout_records import ROUND, Placed

Box = tuple[float, float, float, float]  # x0, y0, x1, y1
LEVEL_TOLERANCE = 1e-3  # m: an underside within 1 mm of a top bears on it
AREA_TOLERANCE = 1e-6  # m2: footprints touching along an edge do not bear
SQUARE = math.sin(math.radians(0.5))  # members within half a degree of square (or parallel) count as such


@dataclass(frozen=True)
class SideAt:
    """Where a contact lies along one member: centre and length (None for a post), seat width when stated."""

    at: float | None
    length: float | None


@dataclass(frozen=True)
class Found:
    upper: Placed
    lower: Placed
    upper_side: SideAt
    lower_side: SideAt
    width: float | None  # contact width across a post's carried member, where the post is turned
    x: float
    y: float
    region: Polygon
    hanger: str = ""  # the upper member frames into the lower's side in this hanger

    @property
    def id(self) -> str:
        return f"{self.upper.id}/{self.lower.id}"


def at_xy(x: float, y: float) -> str:
    return f"({round(x, 4) + 0.0:.3f} m, {round(y, 4) + 0.0:.3f} m)"  # never -0.000


def reach_up(placed: tuple[Placed, ...], errors: ErrorCollector) -> tuple[Placed, ...]:
    """Posts and walls with their tops found: the lowest underside over them, at most their top level."""
    fixed = [p for p in placed if p.top is not None]
    index = GridIndex()
    for i, p in enumerate(fixed):
        index.add(i, p.footprint)
    out = []
    for p in placed:
        if p.top is not None:
            out.append(p)
            continue
        base, ceiling = p.base or 0.0, p.ceiling or 0.0
        undersides = [
            q.bottom
            for q in (fixed[i] for i in sorted(index.near(p.footprint)))
            if base + LEVEL_TOLERANCE < q.bottom <= ceiling + LEVEL_TOLERANCE and _overlap(p.footprint, q.footprint)
        ]
        top = min(undersides, default=ceiling)
        if not p.vertical and top - p.d <= base + LEVEL_TOLERANCE:
            errors.add(
                f"wall '{p.id}': its plate ({p.d * 1000:.0f} mm deep) does not fit under what is over it "
                f"(underside at {top:.3f} m, base at {base:.3f} m)",
                p.loc,
            )
        out.append(replace(p, top=top))
    return tuple(out)


def _overlap(
    p: Polygon, q: Polygon, pb: Box | None = None, qb: Box | None = None, upright: bool | None = None
) -> Polygon:
    """Where two footprints overlap with area (touching along an edge is not overlapping); () when they do not."""
    pb, qb = pb or bounds(p), qb or bounds(q)
    both = upright if upright is not None else is_upright_box(p) and is_upright_box(q)
    region = overlap_region(p, q, pb, qb, both)
    return region if len(region) >= 3 and area(region) > AREA_TOLERANCE else ()


def find_contacts(placed: tuple[Placed, ...], errors: ErrorCollector, warnings: list[str]) -> list[Found]:
    """Every bearing the geometry shows, in the order of the members above."""
    index = GridIndex()
    for i, p in enumerate(placed):
        index.add(i, p.footprint)
    boxes = [bounds(p.footprint) for p in placed]
    upright = [is_upright_box(p.footprint) for p in placed]
    found: list[Found] = []
    tops = [p.top or 0.0 for p in placed]
    bottoms = [p.bottom for p in placed]
    for i, j in index.pairs():
        if bottoms[i] > tops[j] + LEVEL_TOLERANCE or bottoms[j] > tops[i] + LEVEL_TOLERANCE:
            continue  # one wholly above the other, not touching: neither a contact nor a clash
        a, b = placed[i], placed[j]
        region = _overlap(a.footprint, b.footprint, boxes[i], boxes[j], upright[i] and upright[j])
        if not region:
            continue
        if abs(a.bottom - (b.top or 0.0)) <= LEVEL_TOLERANCE:
            upper, lower = a, b
        elif abs(b.bottom - (a.top or 0.0)) <= LEVEL_TOLERANCE:
            upper, lower = b, a
        else:
            framed = _framed_in(a, b, region) or _framed_in(b, a, region)
            if framed is not None:
                found.append(framed)
                continue
            low, high = max(a.bottom, b.bottom), min(a.top or 0.0, b.top or 0.0)
            if high - low > LEVEL_TOLERANCE:
                x, y = centroid(region)
                errors.add(
                    f"members '{a.id}' and '{b.id}' overlap in space at {at_xy(x, y)}, "
                    f"elevations {low:.3f} m to {high:.3f} m",
                    b.loc,
                )
            continue
        contact = _contact(upper, lower, region, errors, warnings)
        if contact is not None:
            found.append(contact)
    order = {p.id: n for n, p in enumerate(placed)}
    found.sort(key=lambda c: (order[c.upper.id], c.upper_side.at or 0.0, order[c.lower.id]))
    return _settle_ends(found, placed, errors, warnings)


def _contact(
    upper: Placed, lower: Placed, region: Polygon, errors: ErrorCollector, warnings: list[str]
) -> Found | None:
    x, y = centroid(region)
    if upper.axis is not None and lower.axis is not None:
        cross = abs(upper.axis.ux * lower.axis.uy - upper.axis.uy * lower.axis.ux)
        dot = abs(upper.axis.ux * lower.axis.ux + upper.axis.uy * lower.axis.uy)
        if cross < SQUARE:
            warnings.append(
                f"{upper.loc}: '{upper.id}' lies along '{lower.id}' at {at_xy(x, y)}; a contact along a member is "
                "not a bearing the layout finds: give it in 'bearings' if it carries load"
            )
            return None
        if dot > SQUARE:
            errors.add(
                f"'{upper.id}' crosses '{lower.id}' at a skew at {at_xy(x, y)}; give that bearing in 'bearings'",
                upper.loc,
            )
            return None
    width = None
    post, beam = (upper, lower) if upper.vertical else (lower, upper)
    if post.vertical and beam.axis is not None:
        lo, hi = extent(region, beam.axis.across)
        if abs((hi - lo) - min(post.b, beam.b)) > 1e-6:
            width = round(hi - lo, ROUND)  # a turned post: its d lies across the member it meets
    upper_side, lower_side = _side(upper, region), _side(lower, region)
    if upper.axis is not None and lower.axis is not None:
        # within SQUARE of square the crossing counts as square, its contact too: along each member no
        # longer than the other is wide (a member a hair off its grid line must not make a longer bearing)
        upper_side = _at_most(upper_side, lower.b)
        lower_side = _at_most(lower_side, upper.b)
    return Found(upper, lower, upper_side, lower_side, width, x, y, region)


def _framed_in(carried: Placed, carrier: Placed, region: Polygon) -> Found | None:
    """A member of a run that names a hanger, its end in the side of a horizontal member it crosses square and whose
    top it does not rise above: a bearing in the hanger (its contact is the hanger's seat, which the model reader
    takes from the connector pack), centred on the overlap along each member; else None."""
    if not carried.hanger or carried.axis is None or carrier.axis is None:
        return None
    if (carried.top or 0.0) > (carrier.top or 0.0) + LEVEL_TOLERANCE:
        return None
    if abs(carried.axis.ux * carrier.axis.ux + carried.axis.uy * carrier.axis.uy) > SQUARE:
        return None  # not square: not a hanger the layout places
    lo, hi = extent(region, carried.axis.along)
    if lo > LEVEL_TOLERANCE and hi < carried.axis.length - LEVEL_TOLERANCE:
        return None  # the carrier crosses it away from its ends: not framing in
    upper_side = _side(carried, region)
    lower_side = _side(carrier, region)
    x, y = centroid(region)
    return Found(
        carried, carrier, SideAt(upper_side.at, None), SideAt(lower_side.at, None), None, x, y, region, carried.hanger
    )


def _at_most(side: SideAt, length: float) -> SideAt:
    if side.length is None or side.length <= length:
        return side
    return SideAt(side.at, round(length, ROUND))


def _side(p: Placed, region: Polygon) -> SideAt:
    if p.axis is None:
        return SideAt(None, None)
    lo, hi = extent(region, p.axis.along)
    lo, hi = max(lo, 0.0), min(hi, p.axis.length)
    return SideAt(round((lo + hi) / 2, ROUND), round(hi - lo, ROUND))


def _settle_ends(found: list[Found], placed: tuple[Placed, ...], errors: ErrorCollector, warnings: list[str]):
    """Refuse what the geometry cannot settle: an end over two supports, a post foot on two, an end on nothing."""
    below: dict[str, list[Found]] = {}
    for c in found:
        below.setdefault(c.upper.id, []).append(c)
    dropped: set[int] = set()
    for p in placed:
        supports = below.get(p.id, [])
        if p.vertical:
            if len(supports) > 1:
                names = " and ".join(f"'{c.lower.id}'" for c in supports)
                errors.add(f"the foot of post '{p.id}' at {at_xy(*p.point or (0, 0))} lies over both {names}", p.loc)
            continue
        if p.kind in ("wall", "sole") or "support" in p.fields:
            continue  # plates: a sole on a floor is carried along its length, a top plate by its studs
        spans = sorted(
            (((c.upper_side.at or 0.0) - (c.upper_side.length or 0.0) / 2, c) for c in supports), key=lambda sc: sc[0]
        )
        for (s0, c0), (s1, c1) in itertools.pairwise(spans):
            end0 = s0 + (c0.upper_side.length or 0.0)
            if s1 < end0 - 1e-6:
                errors.add(
                    f"'{p.id}' at {at_xy(c1.x, c1.y)} lies over both '{c0.lower.id}' and '{c1.lower.id}'; "
                    "give the bearing you mean in 'bearings'",
                    p.loc,
                )
                dropped.add(id(c1))
        _check_ends(p, [s for s in spans], errors, warnings)
    return [c for c in found if id(c) not in dropped]


def _check_ends(p: Placed, spans: list[tuple[float, Found]], errors: ErrorCollector, warnings: list[str]) -> None:
    axis = p.axis
    assert axis is not None
    length = axis.length
    for end, distance in (
        ("start", min((s for s, _ in spans), default=math.inf)),
        ("end", min((length - s - (c.upper_side.length or 0.0) for s, c in spans), default=math.inf)),
    ):
        if distance <= p.d + 1e-6 or end in p.free_ends:
            continue
        x, y = axis.point(0.0 if end == "start" else length)
        if len(spans) < 2:
            errors.add(
                f"the {end} of '{p.id}' at {at_xy(x, y)} sits on nothing (level {p.level}, underside at "
                f"{p.bottom:.3f} m); place a support under it, or give 'free_ends' for a cantilever",
                p.loc,
            )
        else:
            warnings.append(
                f"{p.loc}: the {end} of '{p.id}' at {at_xy(x, y)} overhangs its nearest support by "
                f"{distance * 1000:.0f} mm (more than d); give 'free_ends: [{end}]' if that is meant"
            )
