"""Elevation sketches of members as neutral drawing descriptors (plain dicts of shapes).

The memo template turns the descriptors into inline SVG; nothing here knows about SVG syntax
or escaping. Every load is labelled with its size; labels are laid out in rows away from the
member so that no two overlap and no load's leader line crosses a label; check markers are
numbered from left to right. Members that would be drawn alike (same size, supports, loads
and check statuses) are drawn once, named as typical. Each check's marker carries the number of
the comment on it (the letter's numbering), so a sketch is read beside the letter; a check no
comment is on has a plain marker, and the table under the sketch lists every check left to right.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from audit.core.natural import natural_key, natural_sorted
from audit.core.units import FORCE_UNITS
from audit.report.quantities import quantities_of
from audit.review.review import Review
from audit.standards.checks import NEAR

WIDTH = 720.0
LEFT = 40.0
RIGHT = 40.0
BEAM_H = 20.0
ROW_H = 15.0
GAP = 6.0  # px kept clear between labels in a row
FONT = 8.5  # px, labels
CHAR_W = 0.6  # a character's width as a share of the font size (a generous estimate for the fonts used)
MARK_R = 7.0
BOLD = 1.2  # bold words run wider

MAX_CHECKS_DRAWN = 60  # a member with more checks than this is left to the table: a sketch would be a blur


def text_width(text: str, size: float = FONT) -> float:
    return CHAR_W * size * len(text)


@dataclass
class _Item:
    """Something to place in a row: a box [x0, x1] and, for a load, the x of its leader line."""

    x0: float
    x1: float
    leader: float | None = None
    row: int = 0
    payload: dict[str, Any] = field(default_factory=dict)


def place_in_rows(items: list[_Item]) -> int:
    """Give each item the row nearest the member where it overlaps no other label, and where it can, no
    leader line crosses it (a leader runs from its label's row to the member). Returns the rows used.

    Labels never overlap. A leader crossing a label is avoided where some row allows it; where
    none does (loads a few pixels apart), the nearest row without overlap is taken.
    """
    placed: list[_Item] = []

    def overlaps(item: _Item, row: int) -> bool:
        return any(o.row == row and item.x0 < o.x1 + GAP and o.x0 < item.x1 + GAP for o in placed)

    def crosses(item: _Item, row: int) -> bool:
        for o in placed:
            if o.row > row and o.leader is not None and item.x0 - GAP < o.leader < item.x1 + GAP:
                return True  # a leader from farther out would cross this label
            if o.row < row and item.leader is not None and o.x0 - GAP < item.leader < o.x1 + GAP:
                return True  # this leader would cross a label nearer the member
        return False

    for item in sorted(items, key=lambda i: -(i.leader if i.leader is not None else i.x0)):
        limit = 1 + max((o.row for o in placed), default=0)
        clean = next((r for r in range(limit + 1) if not overlaps(item, r) and not crosses(item, r)), None)
        if clean is None:
            clean = next(r for r in range(limit + 2) if not overlaps(item, r))
        item.row = clean
        placed.append(item)
    return 1 + max((i.row for i in placed), default=-1)


def _force_text(forces: dict[str, float], unit: str, scale: float, decimals: int = 2) -> str:
    parts = []
    for case, value in sorted(forces.items()):
        if abs(value) * scale < 0.5 * 10**-decimals:
            continue
        name = "factored" if case.startswith("factored:") else case
        shown = f"{value * scale:,.0f}" if decimals == 0 else f"{value * scale:.{decimals}f}"  # 1,000 plf
        parts.append(f"{name} {shown}")
    return (" + ".join(parts) or "0") + f" {unit}"


def member_sketches(
    review: Review,
    status_of: dict[str, str],
    words: dict[str, str],
    limit: int,
    numbers: dict[str, int] | None = None,
    only: set[str] | None = None,
) -> list[dict]:
    """Sketches of up to ``limit`` members (of those in ``only``, where given), those with failing checks first;
    alike members drawn once. ``numbers`` gives the comment number on each check, drawn in its marker."""
    numbers = numbers or {}
    checks_by_member: dict[str, list] = {}
    for r in review.results:
        checks_by_member.setdefault(r.check.member, []).append(r)

    def failing_first(member_id: str) -> tuple[bool, tuple]:
        failing = any(status_of.get(r.check.id) == "failing" for r in checks_by_member[member_id])
        return (not failing, natural_key(member_id))

    drawable = [
        m
        for m in checks_by_member
        if not review.model.members[m].vertical
        and len(checks_by_member[m]) <= MAX_CHECKS_DRAWN
        and (only is None or m in only)
    ]
    supports_of = review.supports_of
    alike: dict[tuple, list[str]] = {}
    for m in natural_sorted(drawable):
        signature = _signature(review, m, checks_by_member[m], status_of, supports_of.get(m, []), numbers)
        alike.setdefault(signature, []).append(m)
    firsts = {ms[0]: ms for ms in alike.values()}
    chosen = sorted(firsts, key=failing_first)[:limit]
    return [
        _sketch(review, m, firsts[m], checks_by_member[m], status_of, words, supports_of.get(m, []), numbers)
        for m in natural_sorted(chosen)
    ]


def _signature(review: Review, member_id: str, results, status_of, supports_below, numbers) -> tuple:
    """What a sketch shows, without the member's own name: members with one signature look the same."""
    model = review.model
    member = model.members[member_id]
    supports = tuple(sorted((round(b.upper.at or 0.0, 4), model.members[b.lower.member].id) for b in supports_below))
    loads = tuple(
        sorted(
            (
                a.kind,
                round(a.at or 0.0, 4),
                round(a.start or 0.0, 4),
                round(a.end or 0.0, 4),
                tuple(sorted((c, round(v, 1)) for c, v in a.forces.items())),
            )
            for a in review.flow.on_top.get(member_id, ())
        )
    )
    checks = tuple(
        sorted(
            (
                r.check.kind,
                r.check.face,
                round(r.check.contact.centre or 0.0, 4),
                status_of.get(r.check.id, "computed"),
                numbers.get(r.check.id, 0),  # drawn alike only where the same comments are on them
            )
            for r in results
        )
    )
    return (member.length, member.b, member.d, member.material, supports, loads, checks)


def _sketch(
    review: Review, member_id: str, same: list[str], results, status_of, words, supports_below, numbers
) -> dict[str, Any]:
    model = review.model
    member = model.members[member_id]
    span = WIDTH - LEFT - RIGHT

    def px(x: float) -> float:
        return round(LEFT + span * x / member.length, 1)

    unit = review.display.force_unit
    units = quantities_of(review)
    top: list[_Item] = []
    bottom: list[_Item] = []
    for force in review.flow.on_top.get(member_id, ()):
        if force.kind == "point" and force.at is not None:
            text = f"{force.source}: {_force_text(force.forces, unit, 1.0 / FORCE_UNITS[unit])}"
            x = px(force.at)
            w = text_width(text)
            x0 = min(max(x - 2.0, 2.0), WIDTH - 2.0 - w)  # the label starts at its leader
            top.append(_Item(x0, x0 + w, x, payload={"kind": "load", "x": x, "text": text}))
        elif force.start is not None and force.end is not None:
            per, factor, decimals = units.line_load_unit(max((abs(v) for v in force.forces.values()), default=0.0))
            text = f"{force.source}: {_force_text(force.forces, per, 1.0 / factor, decimals)}"
            x1, x2 = px(force.start), px(force.end)
            w = text_width(text)
            x0 = min(max(x1 + 2.0, 2.0), WIDTH - 2.0 - w)
            top.append(_Item(x0, x0 + w, None, payload={"kind": "uniform", "x1": x1, "x2": x2, "text": text}))
    zones, supports = [], []
    for b in supports_below:
        if b.upper.at is None:
            continue
        x = px(b.upper.at)
        label = model.members[b.lower.member].id
        supports.append({"x": x})
        w = text_width(label)
        bottom.append(_Item(x - w / 2, x + w / 2, None, payload={"kind": "support", "x": x, "text": label}))
        z1, z2 = px(max(0.0, b.upper.at - member.d)), px(min(member.length, b.upper.at + member.d))
        zones.append({"x1": z1, "x2": z2})
        words_d = "within d"
        wz = text_width(words_d)
        cz = (z1 + z2) / 2
        bottom.append(_Item(cz - wz / 2, cz + wz / 2, None, payload={"kind": "zone", "x": cz, "text": words_d}))
    ordered = sorted(
        results,
        key=lambda r: (r.check.contact.centre if r.check.contact.centre is not None else 0.0, natural_key(r.check.id)),
    )
    legend = []
    for r in ordered:
        c = r.check
        x = px(c.contact.centre if c.contact.centre is not None else 0.0)
        status = status_of.get(c.id, "computed")
        word = words[status]
        number = str(numbers.get(c.id, ""))
        mark_w = mark_width(number)
        w = mark_w + 4 + text_width(word, 8.0) * BOLD
        x0 = min(max(x - mark_w / 2, 2.0), WIDTH - 2.0 - w)
        target = bottom if (c.face == "bottom" or c.kind == NEAR) else top
        payload = {"kind": "mark", "n": number, "w": mark_w, "status": status, "word": word}
        target.append(_Item(x0, x0 + w, None, payload=payload))
        legend.append(
            {
                "n": number,
                "id": c.id,
                "kind": c.kind,
                "word": word,
                "status": status,
                "util": f"{r.governing.utilisation:.2f}",
            }
        )
    top_rows = place_in_rows(top)
    bottom_rows = place_in_rows(bottom)
    beam_y = 12.0 + ROW_H * top_rows + 10.0
    below = beam_y + BEAM_H + 16.0  # under the support blocks
    labels, leaders, uniforms, marks = [], [], [], []
    for item in top:
        y = beam_y - 12.0 - ROW_H * item.row
        p = item.payload
        if p["kind"] == "load":
            labels.append({"x": item.x0, "y": y, "text": p["text"], "size": FONT, "muted": False})
            leaders.append({"x": p["x"], "y1": y + 3.0, "y2": beam_y - 2.0})
        elif p["kind"] == "uniform":
            labels.append({"x": item.x0, "y": y, "text": p["text"], "size": FONT, "muted": False})
            uniforms.append({"x1": p["x1"], "x2": p["x2"], "y": beam_y - 7.0})
        else:
            marks.append(_mark(item, y))
    for item in bottom:
        y = below + 12.0 + ROW_H * item.row
        p = item.payload
        if p["kind"] == "mark":
            marks.append(_mark(item, y))
        else:
            labels.append({"x": item.x0, "y": y, "text": p["text"], "size": FONT, "muted": p["kind"] == "zone"})
    height = below + 12.0 + ROW_H * bottom_rows + 6.0
    others = [m for m in same if m != member_id]
    return {
        "member": member_id if not others else f"{', '.join(same)} (typical)",
        "label": member.label,
        "alike": others,
        "length": units.length(member.length),
        "d": units.size(member.d),
        "width": WIDTH,
        "height": round(height, 1),
        "beam": {"x": px(0.0), "y": round(beam_y, 1), "w": round(span, 1), "h": BEAM_H},
        "supports": supports,
        "continuous": {"x1": px(0.0), "x2": px(member.length)} if member.continuous else None,
        "zones": zones,
        "labels": labels,
        "leaders": leaders,
        "uniforms": uniforms,
        "marks": marks,
        "legend": legend,
    }


def mark_width(number: str) -> float:
    """A marker's width: a circle for no number or up to two digits, a longer pill for more."""
    return max(2 * MARK_R, text_width(number, 8.0) + 6.0)


def _mark(item: _Item, y: float) -> dict[str, Any]:
    p = item.payload
    cx = item.x0 + p["w"] / 2
    return {
        "x": round(cx, 1),
        "y": round(y - 3.0, 1),
        "w": round(p["w"], 1),
        "n": p["n"],
        "status": p["status"],
        "word": p["word"],
        "tx": round(item.x0 + p["w"] + 4, 1),
        "ty": round(y, 1),
    }
