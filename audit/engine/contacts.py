"""The geometry of each contact: lengths along the grain, widths across it, end distances, loads within reach.

No standard's rules here: a standard decides which contacts need checks and what resists them;
this module says how big each contact is and why (every extent comes with the note of where
it came from), for whichever standard reads it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from audit.core.errors import InputError
from audit.engine.model import Bearing, Load, Member, Model, Side
from audit.engine.take_down import AppliedForce

# Ties are decided at a stated resolution, not by float noise: lengths along a member (an end distance
# against the least one a factor needs, a bearing length against a factor's limit, a contact's edge or a
# position against the member's end) are compared in whole steps of 0.01 mm, so 75 mm typed as 2.952756 in
# or as 75 mm, or a support a nanometre from the end, give the same result in SI and US input.
LENGTH_RESOLUTION = 1e-5  # m (0.01 mm)


def in_steps(length: float) -> int:
    """A length in whole steps of ``LENGTH_RESOLUTION``: what ties are decided on."""
    return round(length / LENGTH_RESOLUTION)


def shorter(a: float, b: float) -> bool:
    """``a`` is shorter than ``b`` at the stated resolution (a tie is not shorter)."""
    return in_steps(a) < in_steps(b) if math.isfinite(a) and math.isfinite(b) else a < b


def longer(a: float, b: float) -> bool:
    """``a`` is longer than ``b`` at the stated resolution (a tie is not longer)."""
    return in_steps(a) > in_steps(b) if math.isfinite(a) and math.isfinite(b) else a > b


def snapped(length: float) -> float:
    """The length at the stated resolution."""
    return in_steps(length) * LENGTH_RESOLUTION


@dataclass(frozen=True)
class Contact:
    """One face's bearing on a member: length along the grain, width across it."""

    source: str  # bearing id or load id
    length: float  # m
    width: float  # m
    end_distance: float  # m, from the member end to the near edge of the bearing
    centre: float | None  # m along the member
    length_note: str
    width_note: str
    start: float = 0.0  # m along the member, where the contact begins


def least_extent(options: list[tuple[float | None, str]]) -> tuple[float, str]:
    """The smallest stated extent and where it came from (the note names the others it beat)."""
    given = [(value, why) for value, why in options if value is not None]
    value, why = min(given, key=lambda o: in_steps(o[0]))  # of extents equal at the resolution, the first stated
    beaten = [f"{w}, {v * 1000:.0f} mm" for v, w in given if w != why and longer(v, value)]
    return value, why + (f" (less than {'; '.join(beaten)})" if beaten else "")


def contact_on(member: Member, other: Member, bearing: Bearing) -> Contact:
    """The true contact on ``member`` at ``bearing``: along its grain, and across it.

    Across the grain the contact is never wider than the member itself, nor than what bears
    on it: a post's width (or a stated plate), a crossing member's extent along its own grain
    (its stated seat), a seat stated on either side. A stated plate or seat limits, never widens.
    """
    side, far = bearing.side_of(member.id), bearing.side_of(other.id)
    if bearing.hanger and side.length is not None:  # each member bears on the hanger, not on the other member
        length, length_note, width, width_note = _on_hanger(member, side, bearing)
        return _placed(member, side, bearing, length, length_note, width, width_note)
    if side.length is not None:
        length, length_note = side.length, "stated in the model"
    elif other.vertical:
        length, length_note = other.d, f"depth d of post {other.id}"
    else:
        length, length_note = other.b, f"width of {other.id} (square crossing)"
    if not other.vertical and not member.vertical:  # a crossing: the patch is limited both ways
        length, length_note = least_extent(
            [
                (length, length_note),
                (other.b, f"b of {other.id}"),
                (far.width, f"seat width stated on {other.id}"),
                (bearing.width, "stated plate or seat width"),
            ]
        )
        across = far.length if far.length is not None else member.b
        across_note = f"seat length stated on {other.id}"
        if far.length is None:
            across_note = f"full width of {member.id} (square crossing)"
    elif bearing.width is not None:
        across, across_note = bearing.width, "stated plate or seat width"
    else:
        across, across_note = other.b, f"b of post {other.id}"
    width, width_note = least_extent(
        [
            (across, across_note),
            (member.b, f"b of {member.id}"),
            (side.width, f"seat width stated on {member.id}"),
            (bearing.width, "stated plate or seat width"),
        ]
    )
    return _placed(member, side, bearing, length, length_note, width, width_note)


def _on_hanger(member: Member, side: Side, bearing: Bearing) -> tuple[float, str, float, str]:
    """A member's contact on a hanger: the seat under the carried member, the top flange on the carrier (the reader
    states both on the side, from the connector pack); across the grain no wider than the member."""
    part = "seat" if member.id == bearing.upper.member else "top flange"
    length = side.length if side.length is not None else 0.0
    width, width_note = least_extent(
        [(side.width, f"{part} of hanger {bearing.hanger} across {member.id}"), (member.b, f"b of {member.id}")]
    )
    return length, f"{part} of hanger {bearing.hanger}", width, width_note


def _placed(
    member: Member, side: Side, bearing: Bearing, length: float, length_note: str, width: float, width_note: str
) -> Contact:
    """The contact placed along the member at the side's centre, cut at the member's ends."""
    centre = side.at if side.at is not None else 0.0
    start, end = centre - 0.5 * length, centre + 0.5 * length
    if start < 0.0 or end > member.length:
        cut = shorter(start, 0.0) or longer(end, member.length)  # past the end by more than the resolution
        start, end = max(start, 0.0), min(end, member.length)
        length = end - start
        length_note += ", cut at the member end" if cut else ""
    end_distance = snapped(min(start, member.length - end))
    return Contact(bearing.id, length, width, end_distance, side.at, length_note, width_note, start)


def top_contact(model: Model, member: Member, item: AppliedForce, bearings_by_id, loads_by_id) -> Contact:
    if item.from_bearing:
        bearing = bearings_by_id[item.source]
        return contact_on(member, model.members[bearing.upper.member], bearing)
    load = loads_by_id[item.source]
    if load.length is None:
        raise InputError(
            f"point load '{load.id}' lies within d of a support of '{member.id}': give its bearing 'length' "
            "so the near-support check can be made",
            load.loc,
        )
    return load_contact(member, load)


def load_contact(member: Member, load: Load) -> Contact:
    """The contact of a point load that states its bearing length: along the member, the length (cut at the
    member ends); across it, the stated width, never more than the member's b."""
    assert load.at is not None and load.length is not None  # a point load on a horizontal member, with a length
    start = max(load.at - 0.5 * load.length, 0.0)
    end = min(load.at + 0.5 * load.length, member.length)
    length_note = "stated in the model" + (", cut at the member end" if shorter(end - start, load.length) else "")
    width, width_note = least_extent([(load.width, "stated in the model"), (member.b, f"b of {member.id}")])
    end_distance = snapped(min(start, member.length - end))
    return Contact(load.id, end - start, width, end_distance, load.at, length_note, width_note, start)


def spread_within(
    loads: list[AppliedForce], lo: float, hi: float, member_length: float
) -> list[tuple[AppliedForce, float]]:
    """The distributed loads that reach into [lo, hi] (cut at the member ends), with the length inside."""
    lo, hi = max(lo, 0.0), min(hi, member_length)
    out = []
    for item in loads:
        if item.start is None or item.end is None:
            continue
        within = min(hi, item.end) - max(lo, item.start)
        if within > 1e-9:
            out.append((item, within))
    return out


@dataclass(frozen=True)
class FaceBearing:
    """Contacts on one face that overlap or touch along the member, taken as one bearing.

    Contacts that overlap along the member cannot share its face there: they sit side by side
    across it (rafters from both sides of a ridge, joists from both sides of a beam at one
    station), so the one bearing's width is their total area over its length, the sum of the
    widths for seats of one length (the standard caps it at the member's width). Contacts that
    only touch end to end keep the narrowest width, as separate ones do.
    """

    start: float  # m along the member
    length: float  # m, from the first contact's start to the last one's end
    end_distance: float  # m, the least of the contacts'
    width: float  # m: side by side, the contacts' total area / length; end to end, the narrowest
    sources: tuple[str, ...]
    widths: tuple[float, ...]  # m, each contact's own width
    side_by_side: bool  # some of the contacts overlap along the member


def face_bearings(contacts: tuple[Contact, ...]) -> list[FaceBearing]:
    """The contacts as separate bearings: those that touch or overlap count as one."""
    groups: list[list[Contact]] = []
    reach = -math.inf
    for c in sorted(contacts, key=lambda c: (c.start, c.source)):
        if groups and not longer(c.start, reach):  # touching at the stated resolution
            groups[-1].append(c)
            reach = max(reach, c.start + c.length)
        else:
            groups.append([c])
            reach = c.start + c.length
    out = []
    for group in groups:
        start = group[0].start
        end = max(c.start + c.length for c in group)
        length = end - start
        area = math.fsum(c.length * c.width for c in group)
        overlap = any(
            longer(a.start + a.length, b.start) and longer(b.start + b.length, a.start)
            for i, a in enumerate(group)
            for b in group[i + 1 :]
        )
        if not overlap:  # one contact, or contacts end to end along the member: the narrowest governs
            width = min(c.width for c in group)
        elif all(in_steps(c.start) == in_steps(start) and in_steps(c.length) == in_steps(length) for c in group):
            width = math.fsum(c.width for c in group)  # seats of one length side by side: their widths add
        else:
            width = area / length
        out.append(
            FaceBearing(
                start,
                length,
                min(c.end_distance for c in group),
                width,
                tuple(c.source for c in group),
                tuple(c.width for c in group),
                overlap,
            )
        )
    return out


def separate_bearings(contacts: tuple[Contact, ...]) -> list[tuple[float, float]]:
    """The contacts as (length, end distance) of separate bearings: those that touch or overlap count as one."""
    return [(b.length, b.end_distance) for b in face_bearings(contacts)]
