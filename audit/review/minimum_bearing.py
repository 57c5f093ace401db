"""The minimum bearing length at each end of a joist or beam: a check kind of its own, by length, not force.

A building code asks a least length of bearing at the ends of joists and beams whatever the
load (``rules/minimum-bearing-recalled.yaml``, by the project's standard). Each end support of a
timber joist or beam (its first and last bearing along it) is compared with the minimum for its
role and what it bears on; a shorter contact is a ``short-bearing`` finding naming both lengths and
the clause. Plates, sills, studs and posts are not held to it; neither is an interior support.
"""

from __future__ import annotations

from audit.core.units import Display
from audit.engine.contacts import shorter
from audit.engine.model import Bearing, Model
from audit.review import wording
from audit.review.details import member_roles
from audit.review.findings import KINDS, Finding
from audit.standards.checks import CheckList
from audit.standards.minimum_bearing import minimum_for

MASONRY = ("masonry", "concrete")


def end_supports(model: Model) -> dict[str, list[Bearing]]:
    """Member id -> its bearings at the first and last support along it (one when it has one)."""
    under: dict[str, list[Bearing]] = {}
    for b in model.bearings:
        if b.upper.at is not None and not model.members[b.upper.member].vertical:
            under.setdefault(b.upper.member, []).append(b)
    out = {}
    for member, bearings in under.items():
        ordered = sorted(bearings, key=lambda b: b.upper.at or 0.0)
        out[member] = [ordered[0]] if len(ordered) == 1 else [ordered[0], ordered[-1]]
    return out


def short_bearing_findings(model: Model, checklist: CheckList, standard: str, display: Display) -> tuple[Finding, ...]:
    """A finding for each end bearing of a timber joist or beam shorter than the code's minimum for it."""
    roles = member_roles(model)
    length_at = {(c.bearing, c.member): c.contact.length for c in checklist.checks if c.kind == "local" and not c.load}
    out = []
    for member, bearings in end_supports(model).items():
        role = roles.get(member, "")
        if role not in ("joist", "beam"):
            continue
        for b in bearings:
            length = length_at.get((b.id, member))
            if length is None:
                continue  # not a timber member, or no check there: nothing the minimum speaks of
            below = model.materials[model.members[b.lower.member].material]
            rule = minimum_for(standard, role, "masonry" if below.family in MASONRY else "wood")
            if rule is None or not shorter(length, rule.length):
                continue
            out.append(
                Finding(
                    "short-bearing",
                    KINDS["short-bearing"].severity,
                    wording.short_bearing(b.id, member, role, length, rule.length, rule.clause, rule.status, display),
                    bearing=b.id,
                    member=member,
                    clause=rule.clause,
                    numbers={"length": length, "minimum": rule.length},
                )
            )
    return tuple(out)
