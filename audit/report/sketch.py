"""Elevation sketches of members as neutral drawing descriptors (plain dicts of shapes).

The memo template turns the descriptors into inline SVG; nothing here knows about SVG
syntax or escaping. Each check on the member gets a numbered marker and a legend line with
its status in words.
"""

from __future__ import annotations

from typing import Any

from audit.review.review import Review
from audit.standards.checks import NEAR

WIDTH = 720.0
LEFT = 40.0
RIGHT = 40.0
BEAM_Y = 96.0
BEAM_H = 22.0


MAX_CHECKS_DRAWN = 60  # a member with more checks than this is left to the table: a sketch would be a blur


def member_sketches(review: Review, status_of: dict[str, str], words: dict[str, str], limit: int) -> list[dict]:
    """Sketches of up to ``limit`` members, those with failing checks first."""
    checks_by_member: dict[str, list] = {}
    for r in review.results:
        checks_by_member.setdefault(r.check.member, []).append(r)

    def failing_first(member_id: str) -> tuple[bool, str]:
        return (not any(status_of.get(r.check.id) == "failing" for r in checks_by_member[member_id]), member_id)

    drawable = [
        m
        for m in checks_by_member
        if not review.model.members[m].vertical and len(checks_by_member[m]) <= MAX_CHECKS_DRAWN
    ]
    chosen = sorted(drawable, key=failing_first)[:limit]
    return [_sketch(review, m, checks_by_member[m], status_of, words) for m in sorted(chosen)]


def _sketch(review: Review, member_id: str, results, status_of, words) -> dict[str, Any]:
    model = review.model
    member = model.members[member_id]
    span = WIDTH - LEFT - RIGHT

    def px(x: float) -> float:
        return round(LEFT + span * x / member.length, 1)

    supports = []
    zones = []
    for b in model.bearings:
        if b.upper.member != member_id:
            continue
        x = b.upper.at
        if x is None:
            continue
        supports.append({"x": px(x), "label": model.members[b.lower.member].id})
        zones.append({"x1": px(max(0.0, x - member.d)), "x2": px(min(member.length, x + member.d))})
    loads = []
    for item in review.flow.on_top.get(member_id, ()):
        if item.kind == "point" and item.at is not None:
            loads.append({"x": px(item.at), "label": item.source})
    uniforms = []
    for item in review.flow.on_top.get(member_id, ()):
        if item.kind == "uniform" and item.start is not None and item.end is not None:
            uniforms.append({"x1": px(item.start), "x2": px(item.end), "label": item.source})
    supports_line = {"x1": px(0.0), "x2": px(member.length)} if member.continuous else None
    marks = []
    legend = []
    for number, r in enumerate(sorted(results, key=lambda r: r.check.id), start=1):
        c = r.check
        x = c.contact.centre if c.contact.centre is not None else 0.0
        below = c.face == "bottom" or c.kind == NEAR
        status = status_of.get(c.id, "computed")
        row = (number - 1) % 2
        y = BEAM_Y + BEAM_H + 44 + 16 * row if below else BEAM_Y - 58 - 16 * row
        at = px(x)
        # words read to the right of the marker, or to its left near the right-hand end
        left = at > WIDTH - RIGHT - 70
        marks.append(
            {
                "x": at,
                "y": y,
                "n": number,
                "status": status,
                "word": words[status],
                "tx": at - 10 if left else at + 10,
                "anchor": "end" if left else "start",
            }
        )
        legend.append(
            {
                "n": number,
                "id": c.id,
                "kind": c.kind,
                "word": words[status],
                "status": status,
                "util": f"{r.governing.utilisation:.2f}",
            }
        )
    return {
        "member": member_id,
        "label": member.label,
        "length_mm": f"{member.length * 1000:.0f}",
        "d_mm": f"{member.d * 1000:.0f}",
        "width": WIDTH,
        "height": 214.0,
        "beam": {"x": px(0.0), "y": BEAM_Y, "w": round(span, 1), "h": BEAM_H},
        "supports": supports,
        "continuous": supports_line,
        "zones": zones,
        "loads": loads,
        "uniforms": uniforms,
        "marks": marks,
        "legend": legend,
    }
