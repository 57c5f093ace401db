"""A model's layout, expanded into the entries of the explicit model, and the explicit model written out.

``model_sections`` joins what the reviewer typed (members, bearings, loads) with what the
layout places, finds and shares, as nodes located at the layout entries they came from; the
model reader reads the join and cannot tell the two apart (``explicit_model`` writes it out).
The expander knows nothing of the model reader: it is called by it and returns sections.
"""

from __future__ import annotations

import gc
from dataclasses import dataclass, field

from audit.core.errors import ErrorCollector
from audit.core.located_yaml import Node, node_text
from audit.inputs.area_loads import area_shares, share_entries
from audit.inputs.layout import read_layout
from audit.inputs.layout_contacts import Found, SideAt, at_xy, find_contacts, reach_up
from audit.inputs.layout_labels import found_labels, half_contacts
from audit.inputs.layout_records import Layout, Placed, metres, synth


@dataclass(frozen=True)
class Sections:
    """The model's entries, typed and placed together; ``origin`` says where each placed one came from."""

    members: list[Node]
    bearings: list[Node]
    loads: list[Node]
    frame: Node | None  # the layout's levels and grids, kept for the plans
    origin: dict[int, str] = field(default_factory=dict)  # id(node) -> where it came from
    warnings: tuple[str, ...] = ()
    layout: Layout | None = None


def model_sections(top: dict[str, Node], root: Node, errors: ErrorCollector) -> Sections:
    """The members, bearings and loads of a model, its layout expanded; errors collected."""
    # as in reading YAML: the entries made are acyclic trees, so the cycle collector is paused
    enabled = gc.isenabled()
    gc.disable()
    try:
        return _model_sections(top, root, errors)
    finally:
        if enabled:
            gc.enable()


def _model_sections(top: dict[str, Node], root: Node, errors: ErrorCollector) -> Sections:
    typed = {key: _items(top.get(key)) for key in ("members", "bearings", "loads")}
    if "layout" not in top:
        return Sections(typed["members"], typed["bearings"], typed["loads"], None)
    warnings: list[str] = []
    before = len(errors.errors)  # a material's error does not stop the layout: every section's errors in one run
    layout = read_layout(top["layout"], errors)
    if layout is None or len(errors.errors) > before:
        return Sections(typed["members"], typed["bearings"], typed["loads"], None)
    placed = reach_up(layout.placed, errors)
    found = find_contacts(placed, errors, warnings)
    warnings.extend(half_contacts(found))
    shares = area_shares(layout, placed, errors, warnings)
    origin: dict[int, str] = {}
    members = []
    for p in placed:
        node = member_entry(p)
        origin[id(node)] = f"{p.loc}: {p.origin}"
        members.append(node)
    stated = {_pair(n) for n in typed["bearings"]}
    labels = found_labels(layout.labels, found, {f"{u}/{lo}" for u, lo in stated}, errors)
    bearings = []
    for c in found:
        if (c.upper.id, c.lower.id) in stated:
            continue  # a bearing the reviewer gave overrides the one the geometry shows
        node = bearing_entry(c, labels.get(c.id))
        origin[id(node)] = f"{c.upper.loc}: found where {c.upper.id} meets {c.lower.id} at {at_xy(c.x, c.y)}"
        bearings.append(node)
    loads = []
    for item, area_list in shares:
        live = item.value.get("live") if isinstance(item.value, dict) else None
        for node in share_entries(item, area_list, live):
            origin[id(node)] = f"{item.loc}: share of area {item.value['id'].value}"
            loads.append(node)
    frame = synth(
        {k: top["layout"].value[k] for k in ("levels", "grids") if k in top["layout"].value}, top["layout"], ""
    )
    return Sections(
        typed["members"] + members,
        typed["bearings"] + bearings,
        typed["loads"] + loads,
        frame,
        origin,
        tuple(warnings),
        layout,
    )


def _items(node: Node | None) -> list[Node]:
    return list(node.value) if node is not None and isinstance(node.value, list) else []


def _pair(node: Node) -> tuple[str, str]:
    """(upper, lower) member ids of a typed bearing, as far as they can be read; broken ones are the reader's."""
    if not isinstance(node.value, dict):
        return "", ""
    out = []
    for role in ("upper", "lower"):
        side = node.value.get(role)
        if side is not None and isinstance(side.value, dict) and "member" in side.value:
            side = side.value["member"]
        out.append(node_text(side) if side is not None and not isinstance(side.value, (dict, list)) else "")
    return out[0], out[1]


def member_entry(p: Placed) -> Node:
    entry: dict[str, object] = {"id": p.id}
    for key in ("material", "b", "d"):
        if key in p.fields:
            entry[key] = p.fields[key]
    if p.vertical:
        assert p.point is not None
        entry["length"] = metres((p.top or 0.0) - (p.base or 0.0))
        entry["orientation"] = "vertical"
    else:
        assert p.axis is not None
        entry["length"] = metres(p.axis.length)
    entry["level"] = p.level
    entry.update({k: v for k, v in p.fields.items() if k not in entry})
    entry["place"] = _place(p)
    entry["note"] = p.origin
    return synth(entry, p.source, "")


def _place(p: Placed) -> dict[str, object]:
    if p.vertical:
        assert p.point is not None
        return {
            "at": [metres(p.point[0]), metres(p.point[1])],
            "base": metres(p.base or 0.0),
            "top": metres(p.top or 0.0),
            "d_along": p.d_along,
        }
    assert p.axis is not None
    end = p.axis.point(p.axis.length)
    return {
        "from": [metres(p.axis.start[0]), metres(p.axis.start[1])],
        "to": [metres(end[0]), metres(end[1])],
        "top": metres(p.top or 0.0),
    }


def bearing_entry(c: Found, aliases: Node | None = None) -> Node:
    sides: dict[str, object] = {}
    for role, p, s in (("upper", c.upper, c.upper_side), ("lower", c.lower, c.lower_side)):
        side: dict[str, object] = {"member": p.id}
        if s.at is not None:
            side["at"] = metres(s.at)
        if s.at is not None and s.length is not None:
            side["length"] = metres(s.length)
        notch = _at_end(p, s, p.notch_ends) if role == "upper" else None  # a notched end sits on its support
        if notch is not None:
            side["notch"] = notch  # as written on the layout entry, by the end the bearing is at
        sides[role] = side
    entry: dict[str, object] = {"id": c.id, **sides}
    if c.hanger:
        entry["hanger"] = c.hanger  # the seat gives the contact
    if c.width is not None:
        entry["width"] = metres(c.width)
    if aliases is not None:
        entry["aliases"] = aliases  # the calc's labels, as written in layout.labels
    typical = _typical(c)
    if typical:
        entry["typical"] = list(typical)
    given = _calc_force_at(c)
    if given is not None:
        entry["calc_force"] = given
    lengths = ", ".join(
        f"{s.length * 1000:.0f} mm along {p.id}"
        for p, s in ((c.upper, c.upper_side), (c.lower, c.lower_side))
        if s.length is not None
    )
    how = f" in hanger {c.hanger}, framing into its side" if c.hanger else ""
    entry["note"] = f"found from the layout: {c.upper.id} on {c.lower.id}{how}" + (f", {lengths}" if lengths else "")
    return synth(entry, c.upper.source, "")


def _calc_force_at(c: Found) -> Node | None:
    """The calc's force at this bearing, where the member above states one for the end the bearing is at."""
    return _at_end(c.upper, c.upper_side, c.upper.calc_ends)


def _at_end(p: Placed, side: SideAt, by_end: tuple[tuple[str, Node], ...]) -> Node | None:
    """What a member states for the end a bearing is at (within d of it), where it states one."""
    axis, at = p.axis, side.at
    if not by_end or axis is None or at is None:
        return None
    end = "start" if at <= p.d else ("end" if at >= axis.length - p.d else "")
    return next((node for name, node in by_end if name == end), None)


def _typical(c: Found) -> tuple[str, ...]:
    """A run's bearings share labels a typical claim can name: the run's, and the run's on its support."""
    if not c.upper.typical and not c.lower.typical:
        return ()
    upper = c.upper.typical[0] if c.upper.typical else c.upper.id
    lower = c.lower.typical[0] if c.lower.typical else c.lower.id
    return ((upper,) if c.upper.typical else ()) + (f"{upper} on {lower}",)
