"""Remedies for a failing check, each verified by the standard's own check before the memo offers it.

A remedy is the check with one thing changed (a longer bearing, a plate the full width of the
member, another species of the member's family) run again through the standard's resistance
(``Standard.resist``) together with the other checks of the same member, so that whatever the
standard takes from the neighbouring contacts (EN 1995-1-1's effective length and kc,90 spacing)
is taken as in the real check. There is no second copy of any check here.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from audit.core.errors import InputError
from audit.engine.contacts import Contact
from audit.engine.model import Model
from audit.review.review import Review
from audit.standards.checks import LOCAL, NEAR, CheckList, RequiredCheck
from audit.standards.resistance import CheckResult

LENGTH_STEP = 2e-4  # m: the length search stops at a fifth of a millimetre, then rounds up to whole millimetres


@dataclass(frozen=True)
class Room:
    """Where the contact may grow along the member: between the nearest contacts on the same face (or the
    member's ends), with the checks of those contacts, which the standard may read (EC5's effective length)."""

    start: float  # m
    end: float  # m
    neighbours: tuple[RequiredCheck, ...]


def room_of(review: Review, check: RequiredCheck) -> Room:
    """The nearest other contact on each side of the check's, on the same face of the same member."""
    c = check.contact
    before: RequiredCheck | None = None
    after: RequiredCheck | None = None
    for other in review.checks_on.get(check.member, ()):
        if other.face != check.face or other.bearing == check.bearing:
            continue
        o = other.contact
        if o.start + o.length <= c.start + 1e-9 and (
            before is None or o.start + o.length > before.contact.start + before.contact.length
        ):
            before = other
        elif o.start >= c.start + c.length - 1e-9 and (after is None or o.start < after.contact.start):
            after = other
    length = review.model.members[check.member].length
    return Room(
        before.contact.start + before.contact.length if before is not None else 0.0,
        after.contact.start if after is not None else length,
        tuple(x for x in (before, after) if x is not None),
    )


def recheck(review: Review, check: RequiredCheck, model: Model | None = None) -> CheckResult:
    """The check (a changed contact, or on a changed model) as the standard computes it, beside the nearest
    contacts on its face."""
    model = review.model if model is None else model
    neighbours = room_of(review, check).neighbours
    results = review.standard.resist(CheckList((check, *neighbours), ()), model, review.pack, review.cpack)
    return next(r for r in results if r.check.id == check.id)


def with_contact(check: RequiredCheck, room: Room, member_length: float, length: float, width: float) -> RequiredCheck:
    """The check with its contact grown about its centre, kept within its room (a contact flush with an end, or
    with a neighbour, grows away from it)."""
    c = check.contact
    grown = length - c.length
    start = min(max(c.start - grown / 2, room.start), max(room.end - length, room.start))
    near_start = c.start <= member_length - (c.start + c.length)
    moved = (c.start - start) if near_start else (start + length) - (c.start + c.length)
    end_distance = max(c.end_distance - max(moved, 0.0), 0.0)
    contact: Contact = replace(c, length=length, width=width, start=start, end_distance=end_distance)
    return replace(check, contact=contact)


@dataclass(frozen=True)
class Tried:
    """One remedy run through the standard's check: what was changed and what the check then gives."""

    what: str  # length | plate | species
    length: float  # m, the bearing length tried
    width: float  # m, the contact width tried
    result: CheckResult
    species: str = ""
    fcp: float = 0.0  # Pa, the species' strength, where a species is tried

    @property
    def utilisation(self) -> float:
        return self.result.governing.utilisation

    @property
    def passes(self) -> bool:
        return self.result.passes


def length_factor_text(review: Review, result: CheckResult) -> str:
    name = review.standard.length_factor
    factor = next((f for f in result.factors if f.name == name), None)
    return f"{name} = {factor.value:.2f}" if factor is not None else ""


def shortest_passing(review: Review, result: CheckResult, width: float) -> Tried | None:
    """The shortest bearing (whole millimetres) at ``width`` that passes the standard's check and stays clear of
    the neighbouring contacts, or None."""
    check = result.check
    member_length = review.model.members[check.member].length
    room = room_of(review, check)

    def tried(length: float) -> CheckResult:
        return recheck(review, with_contact(check, room, member_length, length, width))

    lo, hi = check.contact.length, max(room.end - room.start, check.contact.length)
    if not tried(hi).passes:
        return None
    present = tried(lo)
    if present.passes:
        return Tried("length", lo, width, present)
    while hi - lo > LENGTH_STEP:
        mid = 0.5 * (lo + hi)
        if tried(mid).passes:
            hi = mid
        else:
            lo = mid
    # the first whole millimetre at or above the last failing length that passes (hi passes, within LENGTH_STEP)
    length = math.ceil(lo * 1000.0 - 1e-6) / 1000.0
    found = tried(length)
    while not found.passes and length + 0.001 <= room.end - room.start + 1e-9:
        length += 0.001
        found = tried(length)
    if not found.passes:  # the whole room, not a whole number of millimetres
        length, found = hi, tried(hi)
    return Tried("length", length, width, found)


def stronger_species(review: Review, result: CheckResult) -> Tried | None:
    """The weakest species of the member's family in the rule pack, stronger than its own, that passes at the
    present contact; None where none does (or the family has no species in the pack)."""
    check = result.check
    model = review.model
    member = model.members[check.member]
    material = model.materials[member.material]
    table = review.pack.fcp.get(material.family, {})
    own = material.fcp or 0.0
    for species, strength in sorted(table.items(), key=lambda item: item[1].fcp.value):
        if species == material.species or strength.fcp.value <= own + 1.0:
            continue
        grade = material.grade if not strength.grades or material.grade in strength.grades else strength.grades[0]
        other = replace(
            material,
            id=f"{material.id} as {species}",
            species=species,
            grade=grade,
            fcp=strength.fcp.value,
            fcp_tension_face=strength.tension_face.value if strength.tension_face else None,
            fc=review.pack.fc_for(material.family, species, grade),
        )
        changed = replace(
            model,
            materials={**model.materials, other.id: other},
            members={**model.members, member.id: replace(member, material=other.id)},
        )
        try:
            found = recheck(review, check, changed)
        except InputError:  # the species lacks a value this check needs (fc at an angle): not a remedy
            continue
        if found.passes:
            return Tried("species", check.contact.length, check.contact.width, found, species, strength.fcp.value)
    return None


def remedies(review: Review, result: CheckResult) -> tuple[Tried, ...]:
    """Every remedy tried that passes the standard's own check: a longer bearing at the present width, a plate
    the full width of the member (at the present length, else the shortest that passes), another species."""
    check = result.check
    member = review.model.members[check.member]
    out = []
    longer = shortest_passing(review, result, check.contact.width)
    if longer is not None:
        out.append(longer)
    if check.contact.width < member.b - 1e-9:
        plate = shortest_passing(review, result, member.b)
        if plate is not None and (longer is None or plate.length < longer.length - 1e-9):
            out.append(replace(plate, what="plate"))
    species = stronger_species(review, result)
    if species is not None:
        out.append(species)
    return tuple(out)


def remedy_text(result: CheckResult, review: Review) -> str:
    """The remedies that pass, each with the Qf/Qr the standard's check gives it; or that none tried passes."""
    check = result.check
    member = review.model.members[check.member]
    other = review.model.members.get(check.other_member)  # None for a point load's own check
    material = review.model.materials[member.material]
    face = "support" if check.kind == NEAR else "bearing"
    width_mm = check.contact.width * 1000
    found = remedies(review, result)
    if not found:
        tried = [f"no {face} length along the grain (clear of the next contacts) at {width_mm:.0f} mm contact width"]
        if check.contact.width < member.b - 1e-9:
            tried.append(f"no bearing plate the full {member.b * 1000:.0f} mm width of {member.id}")
        family = material.family.replace("_", " ")
        tried.append(f"no stronger species of {family} in rule pack {review.pack.id}")
        text = (
            "No remedy tried passes the check: "
            + ", ".join(tried[:-1])
            + f" and {tried[-1]}; a reinforced contact or a redesign is needed."
        )
        if check.kind == NEAR:
            text += " The near-support area is limited by the bearing on the opposite face."
        return text
    parts = []
    for t in found:
        ratio = f"Qf/Qr = {t.utilisation:.2f}"
        if t.what == "length":
            factor = length_factor_text(review, t.result)
            text = (
                f"a {face} length of at least {t.length * 1000:.0f} mm at {width_mm:.0f} mm width "
                f"({', '.join(x for x in (factor, ratio) if x)})"
            )
            if check.kind == LOCAL and other is not None and not other.vertical and t.length > other.b + 1e-9:
                text += f" (longer than {other.id} is wide: a bearing plate, seat or blocking)"
        elif t.what == "plate":
            long = "" if t.length <= check.contact.length + 1e-9 else f", at least {t.length * 1000:.0f} mm long"
            text = f"a bearing plate the full {member.b * 1000:.0f} mm width of {member.id}{long} ({ratio})"
        else:
            text = f"{t.species} ({t.fcp / 1e6:.2f} MPa) for {member.id} at the present contact ({ratio})"
        parts.append(text)
    return "Passes with " + "; or with ".join(parts) + "."
