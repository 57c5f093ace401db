"""The model's ``bearings``: the members above and below, where and how long each contact is."""

from __future__ import annotations

import math
from dataclasses import replace

from audit.core.errors import ErrorCollector, Location
from audit.core.located_yaml import Node
from audit.engine.contacts import longer, shorter
from audit.engine.model import Bearing, Hanger, Side, normalise_label
from audit.inputs.connectors import unknown_hanger
from audit.inputs.fields import FieldReader, list_items
from audit.inputs.model_keys import BEARING_KEYS, SIDE_KEYS
from audit.inputs.model_members import KnownMembers, case_twin, label_list
from audit.standards.packs import CombinationPack


def _read_side(node: Node, role: str, known: KnownMembers, errors: ErrorCollector) -> Side | None:
    if isinstance(node.value, str) or (node.raw and not isinstance(node.value, (dict, list))):
        node = Node({"member": node}, node.file, node.line, node.column, node.key)
    f = FieldReader(node, SIDE_KEYS, errors, f"bearing {role}")
    member_id = f.text("member")
    if not f.ok:
        return None
    member = known.resolve(member_id, f.loc("member"), errors)
    if member is None:
        return None
    at = None
    if not member.vertical:
        at = f.quantity("at", "length")
        if at is not None and (shorter(at, 0.0) or longer(at, member.length)):  # ties at the stated resolution
            errors.add(
                f"bearing centre at {at * 1000:.0f} mm is outside member '{member_id}' "
                f"(length {member.length * 1000:.0f} mm)",
                f.loc("at"),
            )
            return None
        if at is not None:
            at = min(max(at, 0.0), member.length)  # within the resolution of an end: at the end
    elif f.has("at"):
        errors.add(f"'{member_id}' is vertical: its bearings are at its ends, give no 'at'", f.loc("at"))
        return None
    length = f.quantity("length", "length", required=False, positive=True)
    if length is not None and longer(length, member.length):
        errors.add(
            f"bearing length {length * 1000:.0f} mm is longer than member '{member_id}' "
            f"({member.length * 1000:.0f} mm)",
            f.loc("length"),
        )
        return None
    width = f.quantity("width", "length", required=False, positive=True)
    if width is not None and width > member.b + 1e-9:
        errors.add(
            f"seat width {width * 1000:.0f} mm is wider than member '{member_id}' (b = {member.b * 1000:.0f} mm)",
            f.loc("width"),
        )
        return None
    angle = f.quantity("angle", "angle", required=False)
    if angle is not None and not 0.0 < angle <= math.pi / 2 + 1e-12:
        errors.add("angle between load and grain must be more than 0 and at most 90 deg", f.loc("angle"))
        return None
    notch = f.quantity("notch", "length", required=False) or 0.0
    if notch < 0.0 or not shorter(notch, member.d):
        errors.add(
            f"notch depth {notch * 1000:.0f} mm must be at least 0 and less than the depth of '{member_id}' "
            f"(d = {member.d * 1000:.0f} mm)",
            f.loc("notch"),
        )
        return None
    if not f.ok:
        return None
    return Side(member_id, at, length, angle, width, node.loc, notch)


def read_bearings(
    node: Node,
    known: KnownMembers,
    combos: CombinationPack,
    errors: ErrorCollector,
    hangers: dict[str, Hanger] | None = None,
) -> tuple[Bearing, ...]:
    out: list[Bearing] = []
    seen: dict[str, Location] = {}
    twins: dict[str, str] = {}
    aliases_seen: dict[str, str] = {}
    for item in list_items(node, "bearings", errors):
        f = FieldReader(item, BEARING_KEYS, errors, "bearing")
        if not f.ok:
            continue
        for role in ("upper", "lower"):
            if role not in f.map:
                errors.add(f"missing field '{role}'", item.child_loc(role))
        if "upper" not in f.map or "lower" not in f.map:
            continue
        upper = _read_side(f.map["upper"], "upper", known, errors)
        lower = _read_side(f.map["lower"], "lower", known, errors)
        width = f.quantity("width", "length", required=False, positive=True)
        aliases = label_list(f, "aliases", "aliases must be a list of labels", errors)
        typical = label_list(f, "typical", "typical must be a list of labels that several bearings share", errors)
        if aliases is None or typical is None:
            continue
        if upper is None or lower is None or not f.ok:
            continue
        if upper.member == lower.member:
            errors.add(f"member '{upper.member}' cannot bear on itself", item.loc)
            continue
        hanger_id = f.text("hanger", required=False, limit=120)
        if hanger_id:
            seated = _in_hanger(hanger_id, hangers or {}, upper, lower, f, known, errors)
            if seated is None:
                continue
            upper, lower = seated
        if not _crossing_fits(upper, lower, f, known, errors):
            continue
        bearing_id = f.text("id", required=False, limit=120) or f"{upper.member}/{lower.member}"
        if bearing_id in seen:
            hint = "" if f.has("id") else " (two bearings join the same members: give each an 'id')"
            errors.add(f"duplicate bearing id '{bearing_id}'{hint}", f.loc("id") if f.has("id") else item.loc)
            continue
        if case_twin(bearing_id, "bearing", twins, f.loc("id") if f.has("id") else item.loc, errors):
            continue
        seen[bearing_id] = item.loc
        for alias in aliases:
            other = aliases_seen.get(normalise_label(alias))
            if other is not None and other != bearing_id:
                errors.add(f"alias '{alias}' is already used by bearing '{other}'", f.loc("aliases"))
            aliases_seen[normalise_label(alias)] = bearing_id
        note = f.text("note", required=False)
        calc_force = read_calc_force(f.map["calc_force"], combos, errors) if f.has("calc_force") else ()
        if calc_force is None:
            continue
        separation = f.text("separation", required=False, limit=200)
        out.append(
            Bearing(
                bearing_id, upper, lower, width, aliases, typical, note, calc_force, item.loc, hanger_id, separation
            )
        )
    ids = {normalise_label(b.id): b.id for b in out}
    own = {normalise_label(a): b.id for b in out for a in b.aliases} | ids
    for b in out:
        for label in b.typical:
            owner = own.get(normalise_label(label))
            if owner is not None:
                errors.add(
                    f"typical label '{label}' of bearing '{b.id}' is the id or alias of bearing '{owner}': a shared "
                    "label must differ from every single bearing's",
                    b.loc,
                )
    for b in out:
        for alias in b.aliases:
            owner = ids.get(normalise_label(alias))
            if owner is not None and owner != b.id:
                errors.add(f"alias '{alias}' of bearing '{b.id}' is the id of bearing '{owner}'", b.loc)
    return tuple(out)


def read_calc_force(
    node: Node, combos: CombinationPack, errors: ErrorCollector
) -> tuple[tuple[str, float], ...] | None:
    """The calc's force through a bearing per specified load case, e.g. {D: 12 kN, L: 20 kN}; None on an error."""
    if not isinstance(node.value, dict) or not node.value:
        errors.add("calc_force gives the calc's force per load case, e.g. {D: 12 kN, L: 20 kN}", node.loc)
        return None
    f = FieldReader(node, set(combos.cases), errors, "calc_force")
    out = []
    for case in f.map:
        value = f.quantity(case, "force")
        if value is not None:
            out.append((case, value))
    return tuple(out) if f.ok else None


def _crossing_fits(upper: Side, lower: Side, f: FieldReader, known: KnownMembers, errors: ErrorCollector) -> bool:
    """Where two horizontal members cross, the contact along one cannot be longer than the other is wide."""
    members = known.members
    if members[upper.member].vertical or members[lower.member].vertical:
        return True  # a post may stand on (or carry) a plate longer than itself
    ok = True
    for side, other, role in ((upper, lower, "upper"), (lower, upper, "lower")):
        width = members[other.member].b
        if side.length is not None and longer(side.length, width):  # ties at the stated resolution
            errors.add(
                f"bearing length {side.length * 1000:.0f} mm along '{side.member}' is more than the "
                f"{width * 1000:.0f} mm width of '{other.member}' crossing it; a longer contact needs a plate "
                "or seat, modelled as its own member",
                f.map[role].value["length"].loc,
            )
            ok = False
    return ok


def _in_hanger(
    name: str,
    hangers: dict[str, Hanger],
    upper: Side,
    lower: Side,
    f: FieldReader,
    known: KnownMembers,
    errors: ErrorCollector,
) -> tuple[Side, Side] | None:
    """The two sides of a bearing in a hanger: the carried member (upper) on the hanger's seat, and for a top-flange
    hanger the carrier (lower) under its flange; None, with the error, where the hanger is unknown or does not fit.

    On the carried member the contact is the seat: its length along the member's grain, its width across it (no
    wider than the member); a seat that would reach past the member's end is moved in to end at it (the member's end
    sits in the hanger). Under a top flange the carrier is loaded over the flange length across its top and,
    along its grain, over the hanger's width, taken as the seat's and no more than the carried member's b."""
    hanger = hangers.get(name)
    if hanger is None:
        errors.add(unknown_hanger(name, hangers), f.loc("hanger"))
        return None
    carried, carrier = known.members[upper.member], known.members[lower.member]
    given = [key for key, value in (("length", upper.length), ("width", upper.width)) if value is not None]
    if f.has("width"):
        given.append("width (on the bearing)")
    if hanger.kind == "top-flange" and (lower.length is not None or lower.width is not None):
        given.append("the carrier's length or width")
    if given:
        errors.add(f"hanger '{name}' gives the contact: state no {', '.join(given)} as well", f.loc("hanger"))
        return None
    if carried.vertical or carrier.vertical:
        errors.add(f"hanger '{name}' joins two horizontal members: a carried member and its carrier", f.loc("hanger"))
        return None
    seat_width = hanger.seat_width if shorter(hanger.seat_width, carried.b) else None
    at = upper.at
    if at is not None and not shorter(carried.length, hanger.seat_length):
        half = 0.5 * hanger.seat_length  # the member's end sits in the hanger: the seat never reaches past it
        at = min(max(at, half), carried.length - half)
    upper = replace(upper, at=at, length=hanger.seat_length, width=seat_width)
    if hanger.kind == "top-flange" and hanger.flange_length is not None:
        across = hanger.flange_length if shorter(hanger.flange_length, carrier.b) else None
        lower = replace(lower, length=min(hanger.seat_width, carried.b), width=across)
    return upper, lower
