"""A post that lands between the members of a floor and bears on none of them: no direct bearing path.

A layout places each post on its base level and finds what it stands on. A post whose foot lies
between two horizontal members topped at that level, running the same way (joists either side of
it), yet over neither, has no bearing at its foot: the floor's sheathing is then all that carries it.
The reviewer asks for blocking, a rim or a member under it (modelled, so its bearing is checked), or
a post below. Posts of an explicit model without a place in plan, and the studs of a wall, are not
looked at: where a post stands is then not known.
"""

from __future__ import annotations

import math

from audit.engine.model import Member, Model, Place
from audit.review.findings import KINDS, Finding

LEVEL = 1e-3  # m: a top within 1 mm of the post's foot is at its level (the layout's contact tolerance)
REACH = 1.2  # m: a member further than this either side is not a neighbour of the post (twice the widest joist
# spacing, 610 mm: common practice)


def _axis(place: Place) -> tuple[float, float, float] | None:
    (x0, y0), (x1, y1) = place.start, place.end
    length = math.hypot(x1 - x0, y1 - y0)
    return None if length <= 0.0 else ((x1 - x0) / length, (y1 - y0) / length, length)


def _beside(post: Place, member: Member) -> tuple[float, float] | None:
    """(signed distance of the post's centre across the member's axis, direction key) when the post's centre lies
    within the member's length and the member's top is at the post's foot; else None."""
    place = member.place
    if place is None or abs(place.top - post.base) > LEVEL:
        return None
    axis = _axis(place)
    if axis is None:
        return None
    ux, uy, length = axis
    dx, dy = post.start[0] - place.start[0], post.start[1] - place.start[1]
    along = dx * ux + dy * uy
    if not 0.0 <= along <= length:
        return None
    return -dx * uy + dy * ux, round(abs(ux), 3)


def no_path_findings(model: Model, roles: dict[str, str]) -> tuple[Finding, ...]:
    standing = {b.upper.member for b in model.bearings}
    out = []
    for post in model.members.values():
        if not post.vertical or post.place is None or post.id in standing or roles.get(post.id) == "stud":
            continue
        sides: dict[float, list[tuple[float, Member]]] = {}
        for m in model.members.values():
            if m.vertical or m.continuous:
                continue
            found = _beside(post.place, m)
            if found is None or abs(found[0]) > REACH:
                continue
            sides.setdefault(found[1], []).append((found[0], m))
        for beside in sides.values():
            left = [(abs(t), m) for t, m in beside if t > m.b / 2]
            right = [(abs(t), m) for t, m in beside if t < -m.b / 2]
            if not left or not right:
                continue
            (a, ma), (b, mb) = min(left, key=lambda x: x[0]), min(right, key=lambda x: x[0])
            out.append(
                Finding(
                    "no-bearing-path",
                    KINDS["no-bearing-path"].severity,
                    f"{post.id} lands between {ma.id} and {mb.id} ({a * 1000:.0f} mm and {b * 1000:.0f} mm from "
                    f"their centres) and bears on neither: its load has no direct bearing path into the framing "
                    f"below. Show the blocking, rim or member under {post.id} (modelled, so its bearing is checked) "
                    "or a post below it.",
                    bearing=post.id,
                    member=post.id,
                )
            )
            break
    return tuple(out)
