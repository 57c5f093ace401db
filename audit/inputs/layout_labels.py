"""The calc's labels for the bearings a layout finds, and the layout's warnings about what it found.

``layout.labels`` maps a found bearing's id (``UPPER/LOWER``, as ``expand`` writes it) to the labels
the calc uses for that spot; they become the bearing's ``aliases``, as if it had been typed. A
label for a bearing the layout does not find is an error naming the near miss.

``half_contacts`` warns where a horizontal member stops at the centre line of what it sits on (a
beam drawn from grid point to grid point with no ``extend``): the contact is then half the
support, which is right for two members butting there and wrong for one that runs to the far face.
"""

from __future__ import annotations

from audit.core.errors import ErrorCollector
from audit.core.located_yaml import Node
from audit.core.suggest import did_you_mean
from audit.engine.plan_geometry import extent
from audit.inputs.layout_contacts import Found, at_xy

CENTRE_TOLERANCE = 1e-3  # m: an end within 1 mm of the support's centre line stops at it (the contact tolerance)


def found_labels(labels: Node | None, found: list[Found], stated: set[str], errors: ErrorCollector) -> dict[str, Node]:
    """Found bearing id -> the node listing its calc labels; an unknown id or a non-list is an error."""
    if labels is None:
        return {}
    if not isinstance(labels.value, dict):
        errors.add("labels maps a found bearing's id to the calc's labels, e.g. {BA/C1: [GB1 at C1]}", labels.loc)
        return {}
    ids = {c.id for c in found}
    out: dict[str, Node] = {}
    for key, node in labels.value.items():
        name = str(key)
        if name in stated:
            errors.add(f"bearing '{name}' is given in 'bearings': give its labels there as 'aliases'", node.loc)
        elif name not in ids:
            errors.add(f"the layout finds no bearing '{name}'{did_you_mean(name, ids)}", node.loc)
        elif not isinstance(node.value, list):
            errors.add(f"labels of '{name}' must be a list of the calc's labels, e.g. [GB1 at C1]", node.loc)
        else:
            out[name] = node
    return out


def half_contacts(found: list[Found]) -> list[str]:
    """A warning for each member end that stops at its support's centre line, unless another member
    butts there from the other side (then the half contact is the framing, not a slip of the layout)."""
    out = []
    halves: dict[str, list[tuple[Found, str]]] = {}
    for c in found:
        end = _end_at_centre(c)
        if end:
            halves.setdefault(c.lower.id, []).append((c, end))
    for pairs in halves.values():
        for c, end in pairs:
            if any(_butts(c, o) for o, _ in pairs if o is not c):
                continue
            length = c.upper_side.length or 0.0
            out.append(
                f"{c.upper.loc}: the {end} of '{c.upper.id}' stops at the centre line of '{c.lower.id}' at "
                f"{at_xy(c.x, c.y)}: its contact is {length * 1000:.0f} mm along it, half of what is under it; "
                f"if '{c.upper.id}' runs on to the far face, give 'extend'"
            )
    return out


def _end_at_centre(c: Found) -> str:
    """'start' or 'end' where the upper member's end lies on the lower's centre line, else ''."""
    axis = c.upper.axis
    if axis is None or c.upper_side.length is None:
        return ""
    lo, hi = extent(c.lower.footprint, axis.along)
    centre = (lo + hi) / 2
    for end, at in (("start", 0.0), ("end", axis.length)):
        inside = lo + CENTRE_TOLERANCE < at < hi - CENTRE_TOLERANCE
        if inside and abs(at - centre) <= CENTRE_TOLERANCE:
            return end
    return ""


def _butts(c: Found, other: Found) -> bool:
    """Another member stopping at the same support's centre line from the other side, on the same line."""
    a, b = c.upper.axis, other.upper.axis
    if a is None or b is None:
        return False
    same_line = abs(a.across(b.start)) <= c.upper.b / 2 + other.upper.b / 2
    return same_line and abs(a.ux * b.uy - a.uy * b.ux) < 1e-3
