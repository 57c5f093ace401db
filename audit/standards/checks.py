"""Stage 3: list every bearing check the design requires.

At each bearing, every timber member loaded on its side grain gets a local check (both
directions: the member below and the member above). At each support of a horizontal timber
member, loads on the opposite (top) face whose centres lie within the member depth d of the
support centre call for a near-support check loaded with only those loads. Members in a
bearing that get no check here are listed with the reason.
"""

from __future__ import annotations

import math
from bisect import bisect_left, bisect_right
from collections import defaultdict
from dataclasses import dataclass, field, replace
from typing import cast

from audit.core.errors import ErrorCollector, InputError
from audit.engine.contacts import (
    LENGTH_RESOLUTION,
    Contact,
    contact_on,
    face_bearings,
    load_contact,
    separate_bearings,
    spread_within,
    top_contact,
)
from audit.engine.model import Bearing, Load, Member, Model
from audit.engine.take_down import AppliedForce, Envelope, Forces, TakeDown, passed_through
from audit.standards.packs import PackCore

LOCAL = "local"
NEAR = "near-support"


@dataclass(frozen=True)
class RequiredCheck:
    id: str
    kind: str  # local | near-support
    member: str
    bearing: str
    face: str  # which face of the member the checked contact is on: top | bottom
    contact: Contact  # local: the contact; near-support: the support contact
    opposite: tuple[Contact, ...]  # near-support: the loads within d on the opposite face
    forces: Forces  # the force the check carries, per load case
    angle: float | None  # rad between load and grain, None for perpendicular
    other_member: str
    why: str  # why the check is required
    spread: tuple[tuple[str, float], ...] = ()  # near-support: distributed loads counted, (load id, m within d)
    spread_forces: Forces = field(default_factory=dict)  # the part of ``forces`` that is their share
    envelope: dict[str, Envelope] = field(default_factory=dict)  # patterned cases at a continuous member's support
    load: str = ""  # a point load's own crushing check: the load's id (``bearing`` is then the load id too)


@dataclass(frozen=True)
class Exempt:
    """A member in a bearing that gets no bearing check under this clause."""

    bearing: str
    member: str
    reason: str


UNSEEN_SUPPORT = "support not shown"
NO_LENGTH = "no bearing length"


@dataclass(frozen=True)
class Unchecked:
    """Spots on a member that cannot be checked, and why.

    ``UNSEEN_SUPPORT``: point loads on a member continuously supported on something the model
    does not show: its underside and the squeeze through it there are not checked.
    ``NO_LENGTH``: a point load that states no bearing length: the member's crushing under it
    is not checked (its contact is unknown).
    """

    member: str
    spots: tuple[tuple[str, float], ...]  # (bearing or load id, centre along the member in m)
    why: str = UNSEEN_SUPPORT


@dataclass(frozen=True)
class CheckList:
    checks: tuple[RequiredCheck, ...]
    exempt: tuple[Exempt, ...]
    unchecked: tuple[Unchecked, ...] = ()


def list_checks(model: Model, flow: TakeDown, pack: PackCore, readings: dict[str, str], near_reach: float) -> CheckList:
    """The local checks at every contact, and the near-support checks where loads lie within ``near_reach`` times
    the member depth d of a support (O86's near-support clause)."""
    checks, exempt = local_checks(model, flow, pack)
    count_spread = readings["near_support.distributed_loads"] == "within_d"
    checks.extend(_near_support_checks(model, flow, pack, count_spread, near_reach))
    return CheckList(tuple(checks), tuple(exempt), unseen_supports(model, flow, pack) + unsized_loads(model, pack))


def local_only(model: Model, flow: TakeDown, pack: PackCore) -> CheckList:
    """The checks of a standard with no near-support check: both members at every contact."""
    checks, exempt = local_checks(model, flow, pack)
    return CheckList(tuple(checks), tuple(exempt), unseen_supports(model, flow, pack) + unsized_loads(model, pack))


def local_checks(model: Model, flow: TakeDown, pack: PackCore) -> tuple[list[RequiredCheck], list[Exempt]]:
    """Both directions at every bearing, each timber member loaded on its side grain, and every timber member
    under a point load that states its bearing length: a local check each."""
    checks, exempt = _bearing_checks(model, flow, pack)
    return checks + point_load_checks(model, flow, pack), exempt


def _point_loads(model: Model, pack: PackCore) -> list[Load]:
    """Point loads on horizontal timber members, each once (a load of several cases is one load)."""
    seen: dict[str, Load] = {}
    for load in model.loads:
        member = model.members[load.member]
        if load.kind != "point" or load.at is None or member.vertical or load.id in seen:
            continue
        if _no_check_reason(model, member, pack):
            continue
        seen[load.id] = load
    return list(seen.values())


def point_load_checks(model: Model, flow: TakeDown, pack: PackCore) -> list[RequiredCheck]:
    """The crushing of the member under each point load that states its bearing length (an equipment leg, a post
    of framing the model does not show): its width is the member's b unless the load states one."""
    out = []
    errors = ErrorCollector()
    applied = {(m, a.source): a for m, items in flow.on_top.items() for a in items if not a.from_bearing}
    for load in _point_loads(model, pack):
        if load.length is None:
            continue
        if load.id in model.bearings_by_id:  # its check would take the bearing's place and id
            errors.add(f"point load id '{load.id}' is also a bearing's id: give the load an id of its own", load.loc)
            continue
        member = model.members[load.member]
        item = applied.get((member.id, load.id))
        forces = dict(item.forces) if item is not None else {}
        if not any(forces.values()):
            continue  # a load of nothing in every case needs no check (the take-down has zeroed its float noise)
        contact = load_contact(member, load)
        out.append(
            RequiredCheck(
                id=f"{load.id}:{member.id}",
                kind=LOCAL,
                member=member.id,
                bearing=load.id,
                face="top",
                contact=contact,
                opposite=(),
                forces=forces,
                angle=None,
                other_member=load.id,  # what bears on the member: the load itself
                why=(
                    f"point load {load.id} bears on the side grain of {member.id} over "
                    f"{load.length * 1000:.0f} mm: the member under it is crushed"
                ),
                load=load.id,
            )
        )
    errors.raise_if_any()
    return out


def unsized_loads(model: Model, pack: PackCore) -> tuple[Unchecked, ...]:
    """Point loads on timber members that state no bearing length: the crushing under them cannot be checked."""
    spots: dict[str, list[tuple[str, float]]] = defaultdict(list)
    for load in _point_loads(model, pack):
        if load.length is None and load.at is not None:
            spots[load.member].append((load.id, load.at))
    return tuple(
        Unchecked(member, tuple(sorted(found, key=lambda s: s[1])), NO_LENGTH)
        for member, found in sorted(spots.items())
    )


def _bearing_checks(model: Model, flow: TakeDown, pack: PackCore) -> tuple[list[RequiredCheck], list[Exempt]]:
    """Both directions at every bearing: each timber member loaded on its side grain gets a local check."""
    checks: list[RequiredCheck] = []
    exempt: list[Exempt] = []
    for bearing in model.bearings:
        upper = model.members[bearing.upper.member]
        lower = model.members[bearing.lower.member]
        forces = flow.bearing_forces.get(bearing.id, {})
        # nothing in any case, float noise zeroed by the take-down: no threshold in newtons, so the building
        # with every load scaled lists the same checks
        unloaded = not any(forces.values()) and not any(e.low for e in flow.envelopes.get(bearing.id, {}).values())
        for member, other, face in ((lower, upper, "top"), (upper, lower, "bottom")):
            reason = (
                _no_check_reason(model, member, pack)
                or ("no load passes through this bearing in any load case" if unloaded else "")
                or (face_mount_reason(model, bearing) if face == "top" else "")
            )
            if reason:
                exempt.append(Exempt(bearing.id, member.id, reason))
                continue
            checks.append(
                RequiredCheck(
                    id=f"{bearing.id}:{member.id}",
                    kind=LOCAL,
                    member=member.id,
                    bearing=bearing.id,
                    face=face,
                    contact=contact_on(member, other, bearing),
                    opposite=(),
                    forces=dict(forces),
                    angle=bearing.side_of(member.id).angle,
                    other_member=other.id,
                    why=_local_why(member, other, face),
                    envelope=flow.envelopes.get(bearing.id, {}),
                )
            )
    return checks, exempt


def face_mount_reason(model: Model, bearing: Bearing) -> str:
    """Why the carrier of a face-mount hanger gets no bearing check there ('' for any other bearing): the hanger's
    fasteners take the load into the carrier's side, which is not a bearing on its grain."""
    hanger = model.hangers.get(bearing.hanger)
    if hanger is None or hanger.kind != "face-mount":
        return ""
    return (
        f"face-mount hanger {hanger.id}: the load enters the side of {bearing.lower.member} through the hanger's "
        "fasteners, not a bearing on its grain"
    )


def unseen_supports(model: Model, flow: TakeDown, pack: PackCore) -> tuple[Unchecked, ...]:
    """Continuous members whose support is not shown, with the point loads that land on them."""
    out = []
    for member in model.members.values():
        if not member.continuous or _no_check_reason(model, member, pack):
            continue
        under = model.materials.get(member.bears_on)
        if under is not None and not pack.is_timber(under.family):
            continue  # a sill on concrete or masonry is continuously supported in fact
        spots = tuple(
            (a.source, a.at) for a in flow.on_top.get(member.id, ()) if a.kind == "point" and a.at is not None
        )
        if spots:
            out.append(Unchecked(member.id, tuple(sorted(spots, key=lambda s: s[1]))))
    return tuple(out)


def _no_check_reason(model: Model, member: Member, pack: PackCore) -> str:
    material = model.materials[member.material]
    if not pack.is_timber(material.family):
        return f"{material.family.replace('_', ' ')}: checked under its own standard"
    if member.vertical:
        return "loaded on end grain (compression parallel to grain is another clause)"
    return ""


def _local_why(member: Member, other: Member, face: str) -> str:
    if face == "top":
        return f"{other.id} bears on the side grain of {member.id}: the supporting member is crushed"
    return f"{member.id} bears on {other.id}: the member above is crushed on its own side grain at its support"


def _near_support_checks(
    model: Model, flow: TakeDown, pack: PackCore, count_spread: bool, reach: float
) -> list[RequiredCheck]:
    supports_of: dict[str, list[Bearing]] = defaultdict(list)
    for bearing in model.bearings:
        supports_of[bearing.upper.member].append(bearing)
    loads_by_id = {load.id: load for load in model.loads}
    bearings_by_id = {b.id: b for b in model.bearings}
    side_loaded = {b.id for b in model.bearings if face_mount_reason(model, b)}  # not on the top face: no squeeze
    out: list[RequiredCheck] = []
    errors = ErrorCollector()  # found after reading, but reported like reader errors: all, once each
    for member_id in sorted(supports_of):
        member = model.members[member_id]
        if member.vertical or _no_check_reason(model, member, pack):
            continue
        top = sorted(
            (
                a
                for a in flow.on_top.get(member_id, ())
                if a.kind == "point" and a.at is not None and a.source not in side_loaded
            ),
            key=lambda a: a.at if a.at is not None else 0.0,
        )
        if not top:
            continue
        spread_loads = [a for a in flow.on_top.get(member_id, ()) if a.kind == "uniform"] if count_spread else []
        positions = [cast(float, a.at) for a in top]  # filtered above: every one is placed
        for support in supports_of[member_id]:
            depth = depth_at(member, support)
            limit = reach * depth  # a notched end: the depth left at the support is what the load squeezes through
            x = cast(float, support.upper.at)  # a support of a horizontal member is placed along it
            tie = 0.5 * LENGTH_RESOLUTION  # a load d away to the stated resolution is within d, in SI and US input
            near = top[bisect_left(positions, x - limit - tie) : bisect_right(positions, x + limit + tie)]
            if not near:
                continue
            lower = model.members[support.lower.member]
            support_contact = contact_on(member, lower, support)
            try:
                opposite = tuple(top_contact(model, member, a, bearings_by_id, loads_by_id) for a in near)
            except InputError as exc:
                errors.extend(exc)
                continue
            forces: Forces = defaultdict(float)
            for item in near:
                for case, value in item.forces.items():
                    forces[case] += value
            spread = spread_within(spread_loads, x - limit, x + limit, member.length)
            spread_forces: Forces = defaultdict(float)
            for item, within in spread:
                for case, value in item.forces.items():
                    forces[case] += value * within
                    spread_forces[case] += value * within
            names = ", ".join(a.source for a in near)
            if spread:
                names += " and " + ", ".join(f"{within * 1000:.0f} mm of {item.source}" for item, within in spread)
            out.append(
                RequiredCheck(
                    id=f"{support.id}:{member_id}:near",
                    kind=NEAR,
                    member=member_id,
                    bearing=support.id,
                    face="bottom",
                    contact=support_contact,
                    opposite=opposite,
                    forces=dict(forces),
                    angle=None,
                    other_member=lower.id,
                    why=(
                        f"{names} on the top of {member_id} within d = {depth * 1000:.0f} mm of the "
                        f"support on {lower.id}{_notched(member, support)}: the load squeezes through the depth"
                    ),
                    spread=tuple((item.source, within) for item, within in spread),
                    spread_forces=dict(spread_forces),
                    envelope=_near_envelope(near, spread_forces),
                )
            )
    errors.raise_if_any()
    return out


def depth_at(member: Member, bearing: Bearing) -> float:
    """The member's depth at a bearing: its d, less the notch cut out of it there."""
    return member.d - bearing.side_of(member.id).notch


def _notched(member: Member, bearing: Bearing) -> str:
    notch = bearing.side_of(member.id).notch
    return f" (d {member.d * 1000:.0f} mm notched {notch * 1000:.0f} mm there)" if notch > 0.0 else ""


def _near_envelope(near: list[AppliedForce], spread_forces: Forces) -> dict[str, Envelope]:
    """Qf' at the worst pattern of the members above: each bearing within d at its high (or low), as it is carried."""
    envelope = passed_through(tuple(near))
    return {
        case: replace(env, high=env.high + spread_forces.get(case, 0.0), low=env.low + spread_forces.get(case, 0.0))
        for case, env in envelope.items()
    }


def top_bearing(check: RequiredCheck, reading: str) -> tuple[float, float]:
    """(L2 candidate, its end distance) on the loaded face of a near-support check, under the pack's reading.

    ``longest_single``: the longest of the separate bearings within d (touching ones merged);
    ``summed``: every length added, the nearest end distance.
    """
    if reading == "summed":
        return math.fsum(c.length for c in check.opposite), min(c.end_distance for c in check.opposite)
    return max(separate_bearings(check.opposite), key=lambda b: b[0])


def near_support_width(check: RequiredCheck) -> float:
    """b of Ab': the least of the support contact's width and each bearing's within d, where bearings side by side
    across the member (overlapping along it) count as one whose width is their sum; the support contact is never
    wider than the member, so neither is b."""
    return min([check.contact.width, *(b.width for b in face_bearings(check.opposite))])


def side_by_side_text(check: RequiredCheck) -> str:
    """How side-by-side bearings within d were counted, for the derivation ('' when there are none)."""
    parts = []
    for b in face_bearings(check.opposite):
        if b.side_by_side:
            widths = " + ".join(f"{w * 1000:.0f}" for w in b.widths)
            capped = (
                f", taken as {check.contact.width * 1000:.0f} mm (the support contact's width, within b)"
                if b.width > check.contact.width + 1e-9
                else ", no wider than b"
            )
            parts.append(
                f"{', '.join(b.sources)} side by side across the member: one bearing {b.width * 1000:.0f} mm wide "
                f"({widths} mm over {b.length * 1000:.0f} mm){capped}"
            )
    return "; ".join(parts)


def near_support_geometry(check: RequiredCheck, reading: str) -> tuple[float, float, float]:
    """(L1, L2, b) for a near-support check: the shorter and longer face lengths, the width of Ab'."""
    support_length = check.contact.length
    top_length = top_bearing(check, reading)[0]
    return min(support_length, top_length), max(support_length, top_length), near_support_width(check)
