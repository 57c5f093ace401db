"""Plans of each level as neutral drawing descriptors (plain dicts of shapes), for models with a layout.

A level's plan shows its members (outlines in plan), the posts and walls under them, the grid
lines with their names, the zone within d of each support where a near-support check applies
(hatched), and every bearing marked by its outcome with a shape of its own (a cross fails, a
triangle asks for something, a circle passes, a diamond is not checked here), named in the
legend: never colour alone. Members with a comment carry the comment numbers; labels are placed
where they overlap no other label, and a label that finds no room is listed under the plan.
"""

from __future__ import annotations

from collections import defaultdict
from dataclasses import dataclass
from typing import Any

from audit.core.natural import natural_key
from audit.engine.model import Member
from audit.engine.plan_geometry import Axis, box, strip
from audit.report.quantities import quantities_of
from audit.report.sketch import FONT, text_width
from audit.review.comments import Comment
from audit.review.review import Review
from audit.standards.checks import NEAR

WIDTH = 760.0
MARGIN = 46.0
MAX_HEIGHT = 620.0
LABEL_H = FONT + 2.0
# The outcome of a bearing: its worst check's status, drawn as a shape
RANK = ["failing", "mis-loaded", "missing", "not-covered", "resistance-differs", "confirmed", "covered", "computed"]
SHAPES = {
    "failing": ("cross", "fails"),
    "mis-loaded": ("triangle", "asks for something (missing, mis-loaded, not covered, Qr differs)"),
    "missing": ("triangle", ""),
    "not-covered": ("triangle", ""),
    "resistance-differs": ("triangle", ""),
    "confirmed": ("circle", "passes (confirmed, covered by a typical claim, or recomputed)"),
    "covered": ("circle", ""),
    "computed": ("circle", ""),
    "": ("diamond", "no bearing check here (not timber, or exempt)"),
}


@dataclass
class _Frame:
    x0: float
    y1: float
    scale: float

    def xy(self, x: float, y: float) -> tuple[float, float]:
        return (round(MARGIN + (x - self.x0) * self.scale, 2), round(MARGIN + (self.y1 - y) * self.scale, 2))


def _footprint(m: Member):
    p = m.place
    assert p is not None
    if m.vertical:
        along_x, along_y = (m.d, m.b) if p.d_along == "x" else (m.b, m.d)
        return box(p.start, along_x, along_y)
    return strip(Axis.between(p.start, p.end), m.b)


def _levels_of(review: Review) -> dict[str, list[Member]]:
    """Each level's horizontal members, and the posts and walls carrying them."""
    members = review.model.members
    out: dict[str, list[Member]] = defaultdict(list)
    for m in members.values():
        if m.place is not None and not m.vertical and m.level:
            out[m.level].append(m)
    for b in review.model.bearings:
        upper, lower = members[b.upper.member], members[b.lower.member]
        if lower.place is None or upper.place is None or upper.vertical:
            continue
        if lower.vertical and lower not in out[upper.level]:
            out[upper.level].append(lower)
    return out


def level_plans(review: Review, status_of: dict[str, str], comments: list[Comment]) -> list[dict[str, Any]]:
    frame = review.model.frame
    if frame is None:
        return []
    on_level = _levels_of(review)
    numbers: dict[str, list[int]] = defaultdict(list)
    for c in comments:
        if c.quiet:
            continue
        for place in c.places:
            if c.number not in numbers[place.member]:
                numbers[place.member].append(c.number)
    outcome: dict[str, str] = {}
    for r in review.results:
        status = status_of.get(r.check.id, "computed")
        prior = outcome.get(r.check.bearing)
        if prior is None or RANK.index(status) < RANK.index(prior):
            outcome[r.check.bearing] = status
    plans = []
    for level in sorted(frame.levels, key=lambda name: frame.levels[name]):
        members = on_level.get(level, [])
        if members:
            plans.append(_plan(review, level, members, outcome, numbers))
    return plans


def _plan(review: Review, level: str, members: list[Member], outcome: dict[str, str], numbers) -> dict[str, Any]:
    frame = review.model.frame
    assert frame is not None
    shapes = {m.id: _footprint(m) for m in members}
    xs = [p[0] for s in shapes.values() for p in s] + list(frame.grid_x.values())
    ys = [p[1] for s in shapes.values() for p in s] + list(frame.grid_y.values())
    x0, x1, y0, y1 = min(xs), max(xs), min(ys), max(ys)
    scale = min((WIDTH - 2 * MARGIN) / max(x1 - x0, 1e-3), (MAX_HEIGHT - 2 * MARGIN) / max(y1 - y0, 1e-3))
    f = _Frame(x0, y1, scale)
    height = round(2 * MARGIN + (y1 - y0) * scale, 2)
    labels: list[dict[str, Any]] = []
    grids = []
    for name, x in sorted(frame.grid_x.items(), key=lambda kv: kv[1]):
        sx, _ = f.xy(x, y1)
        grids.append({"x1": sx, "y1": MARGIN - 14, "x2": sx, "y2": height - MARGIN + 14, "name": name})
        _try_label(labels, name, sx, MARGIN - 22, True)
    for name, y in sorted(frame.grid_y.items(), key=lambda kv: kv[1]):
        _, sy = f.xy(x0, y)
        grids.append({"x1": MARGIN - 14, "y1": sy, "x2": WIDTH - MARGIN + 14, "y2": sy, "name": name})
        _try_label(labels, name, MARGIN - 26, sy, True)
    outlines = []
    for m in members:
        kind = "post" if m.vertical else ("wall" if m.note.startswith("top plate") else "member")
        outlines.append(
            {"id": m.id, "kind": kind, "points": " ".join(f"{a},{b}" for a, b in (f.xy(*p) for p in shapes[m.id]))}
        )
    ids = {m.id for m in members}
    zones, marks = [], []
    for r in review.results:
        if r.check.kind == NEAR and r.check.member in ids and not review.model.members[r.check.member].vertical:
            zones.append(_zone(review.model.members[r.check.member], r.check.contact.centre or 0.0, f))
    for b in review.model.bearings:
        upper = review.model.members[b.upper.member]
        if upper.id not in ids or upper.vertical:
            continue
        p = upper.place
        assert p is not None
        x, y = f.xy(*Axis.between(p.start, p.end).point(b.upper.at or 0.0))
        marks.append({"x": x, "y": y, "shape": SHAPES[outcome.get(b.id, "")][0], "bearing": b.id})
    missed = []
    for m in sorted(members, key=lambda m: (not numbers.get(m.id), natural_key(m.id))):
        nums = numbers.get(m.id)
        text = ("#" + ", #".join(str(n) for n in nums[:4]) + ("…" if len(nums) > 4 else "")) if nums else ""
        if not text and (m.note.startswith("member ") or m.vertical):
            continue  # members of a run and posts are named only when a comment is on them
        text = f"{m.id} {text}".strip() if text and len(m.id) <= 8 else (text or m.id)
        centre = _centre(m, f)
        if not _try_label(labels, text, centre[0] + 4, centre[1] - 5, False) and nums:
            missed.append(f"{m.id}: {', '.join(str(n) for n in nums)}")
    return {
        "level": level,
        "elevation": frame.levels[level],
        "elevation_text": quantities_of(review).elevation(frame.levels[level]),
        "width": WIDTH,
        "height": height,
        "grids": grids,
        "outlines": outlines,
        "zones": zones,
        "marks": marks,
        "labels": labels,
        "missed": missed,
    }


def _centre(m: Member, f: _Frame) -> tuple[float, float]:
    p = m.place
    assert p is not None
    return f.xy((p.start[0] + p.end[0]) / 2, (p.start[1] + p.end[1]) / 2)


def _zone(m: Member, centre: float, f: _Frame) -> str:
    p = m.place
    assert p is not None
    axis = Axis.between(p.start, p.end)
    lo, hi = max(centre - m.d, 0.0), min(centre + m.d, axis.length)
    part = Axis.between(axis.point(lo), axis.point(hi))
    return " ".join(f"{a},{b}" for a, b in (f.xy(*q) for q in strip(part, m.b * 1.6)))


def _boxes_overlap(a: tuple[float, float, float, float], b: tuple[float, float, float, float]) -> bool:
    return a[0] < b[2] + 2 and b[0] < a[2] + 2 and a[1] < b[3] + 1 and b[1] < a[3] + 1


def label_box(label: dict[str, Any]) -> tuple[float, float, float, float]:
    """The box a label's text takes: x0, y0 (top), x1, y1 (baseline), in the drawing's px."""
    w = text_width(label["text"])
    x = label["x"] - w / 2 if label["anchor"] == "middle" else label["x"]
    return x, label["y"] - FONT, x + w, label["y"] + 2


def _try_label(labels: list[dict[str, Any]], text: str, x: float, y: float, centred: bool) -> bool:
    """Place a label at the first of a few spots near (x, y) where it overlaps no other label."""
    for dx, dy in ((0, 0), (0, -LABEL_H), (0, LABEL_H), (0, -2 * LABEL_H), (0, 2 * LABEL_H), (24, 0), (-24, 0)):
        label = {"text": text, "x": round(x + dx, 2), "y": round(y + dy, 2), "anchor": "middle" if centred else "start"}
        box_ = label_box(label)
        if box_[0] < 0 or box_[2] > WIDTH:
            continue
        if not any(_boxes_overlap(box_, label_box(o)) for o in labels):
            labels.append(label)
            return True
    return False
