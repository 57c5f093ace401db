"""Plan geometry of framing: member footprints, their overlaps, and a grid index to find them.

Plain floats in metres, x and y in plan. A footprint is a convex polygon (a rectangle for a
member or a post); two footprints overlap where their intersection has area. The grid index
hashes each footprint's bounding box into square cells, so candidate pairs are only those
sharing a cell: a floor of thousands of joists is not a test of every pair.
"""

from __future__ import annotations

import math
from collections import defaultdict
from collections.abc import Iterable, Iterator, Sequence
from dataclasses import dataclass

Point = tuple[float, float]
Polygon = tuple[Point, ...]

CELL = 1.0  # m; a joist 4 m long touches about five cells, a post one


@dataclass(frozen=True)
class Axis:
    """A member's axis in plan: where it starts, its unit direction and its length."""

    start: Point
    ux: float
    uy: float
    length: float

    @staticmethod
    def between(p: Point, q: Point) -> Axis:
        dx, dy = q[0] - p[0], q[1] - p[1]
        length = math.hypot(dx, dy)
        return Axis(p, dx / length, dy / length, length)

    def along(self, p: Point) -> float:
        """Distance of ``p``'s projection from the start, along the axis."""
        return (p[0] - self.start[0]) * self.ux + (p[1] - self.start[1]) * self.uy

    def across(self, p: Point) -> float:
        """Signed distance of ``p`` from the axis (left positive)."""
        return -(p[0] - self.start[0]) * self.uy + (p[1] - self.start[1]) * self.ux

    def point(self, s: float, t: float = 0.0) -> Point:
        return (self.start[0] + s * self.ux - t * self.uy, self.start[1] + s * self.uy + t * self.ux)


def strip(axis: Axis, width: float) -> Polygon:
    """The rectangle ``width`` wide centred on the axis, over its whole length."""
    h = width / 2
    return (axis.point(0, -h), axis.point(axis.length, -h), axis.point(axis.length, h), axis.point(0, h))


def box(centre: Point, along_x: float, along_y: float) -> Polygon:
    x, y = centre
    hx, hy = along_x / 2, along_y / 2
    return ((x - hx, y - hy), (x + hx, y - hy), (x + hx, y + hy), (x - hx, y + hy))


def area(poly: Sequence[Point]) -> float:
    """Unsigned area by the shoelace formula."""
    total = 0.0
    for i, (x0, y0) in enumerate(poly):
        x1, y1 = poly[(i + 1) % len(poly)]
        total += x0 * y1 - x1 * y0
    return abs(total) / 2


def _counter_clockwise(poly: Polygon) -> Polygon:
    signed = sum(x0 * y1 - x1 * y0 for (x0, y0), (x1, y1) in zip(poly, poly[1:] + poly[:1], strict=True))
    return poly if signed >= 0 else tuple(reversed(poly))


def clip(subject: Polygon, window: Polygon) -> Polygon:
    """The intersection of two convex polygons (Sutherland-Hodgman clipping); () when they do not overlap."""
    out = list(_counter_clockwise(subject))
    window = _counter_clockwise(window)
    for i, a in enumerate(window):
        b = window[(i + 1) % len(window)]
        if not out:
            break

        def inside(p: Point, a: Point = a, b: Point = b) -> float:
            return (b[0] - a[0]) * (p[1] - a[1]) - (b[1] - a[1]) * (p[0] - a[0])

        points, out = out, []
        for j, p in enumerate(points):
            q = points[(j + 1) % len(points)]
            fp, fq = inside(p), inside(q)
            if fp >= 0:
                out.append(p)
            if (fp >= 0) != (fq >= 0):
                t = fp / (fp - fq)
                out.append((p[0] + t * (q[0] - p[0]), p[1] + t * (q[1] - p[1])))
    return tuple(out)


def extent(poly: Polygon, measure) -> tuple[float, float]:
    """The least and greatest of ``measure`` (e.g. ``axis.along``) over a polygon's corners."""
    values = [measure(p) for p in poly]
    return min(values), max(values)


def centroid(poly: Polygon) -> Point:
    n = len(poly)
    return (sum(p[0] for p in poly) / n, sum(p[1] for p in poly) / n)


def bounds(poly: Polygon) -> tuple[float, float, float, float]:
    xs, ys = [p[0] for p in poly], [p[1] for p in poly]
    return min(xs), min(ys), max(xs), max(ys)


class GridIndex:
    """Footprints hashed by the square cells their bounding boxes touch."""

    def __init__(self, cell: float = CELL) -> None:
        self.cell = cell
        self.cells: dict[tuple[int, int], list[int]] = defaultdict(list)

    def _cells(self, poly: Polygon) -> Iterator[tuple[int, int]]:
        x0, y0, x1, y1 = bounds(poly)
        c = self.cell
        for i in range(math.floor(x0 / c), math.floor(x1 / c) + 1):
            for j in range(math.floor(y0 / c), math.floor(y1 / c) + 1):
                yield i, j

    def add(self, key: int, poly: Polygon) -> None:
        for cell in self._cells(poly):
            self.cells[cell].append(key)

    def near(self, poly: Polygon) -> set[int]:
        """Keys of every footprint sharing a cell with ``poly``."""
        found: set[int] = set()
        for cell in self._cells(poly):
            found.update(self.cells.get(cell, ()))
        return found

    def pairs(self) -> Iterable[tuple[int, int]]:
        """Each pair of keys sharing at least one cell, once, lower key first, in sorted order."""
        seen: set[tuple[int, int]] = set()
        for keys in self.cells.values():
            for a_index, a in enumerate(keys):
                for b in keys[a_index + 1 :]:
                    seen.add((a, b) if a < b else (b, a))
        return sorted(seen)


def is_upright_box(poly: Polygon) -> bool:
    """Whether a polygon is a rectangle with sides along x and y (most framing is)."""
    if len(poly) != 4:
        return False
    for i, (x0, y0) in enumerate(poly):
        x1, y1 = poly[(i + 1) % 4]
        if abs(x1 - x0) > 1e-12 and abs(y1 - y0) > 1e-12:
            return False
    return True


def overlap_region(p: Polygon, q: Polygon, pb, qb, both_upright: bool) -> Polygon:
    """The intersection of two convex footprints given with their bounding boxes; () when apart.

    Two upright rectangles overlap in the rectangle of their bounding boxes' overlap: no clipping.
    """
    if not (pb[0] < qb[2] and qb[0] < pb[2] and pb[1] < qb[3] and qb[1] < pb[3]):
        return ()
    if both_upright:
        x0, y0, x1, y1 = max(pb[0], qb[0]), max(pb[1], qb[1]), min(pb[2], qb[2]), min(pb[3], qb[3])
        return ((x0, y0), (x1, y0), (x1, y1), (x0, y1))
    return clip(p, q)
