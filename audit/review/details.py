"""Kinds of detail: the role each member plays in the framing, read from the shape of the model.

A reviewer speaks of alike contacts at once ("joists on wall plates: the check of the plate
under each joist"), so the missing checks that recompute comfortably are grouped by the kind
of detail: the check's kind and face, and the role and material family of both members. Roles
come from what the model states, whether a layout placed it or it was typed in:

- a *stud* is a vertical member in a row of three or more of one section, at most
  ``STUD_SPACING`` apart, under one horizontal member: that member is a *wall plate*, and a
  horizontal member the studs stand on is a *sole plate*;
- a horizontal member continuously supported is a *sill* where it bears on concrete or masonry, else
  a *plate* (on a wall the model does not show);
- a *joist* is a horizontal member that shares its section and its supports with at least two
  others (a run of joists);
- every other vertical member is a *post*, every other horizontal one a *beam*.
"""

from __future__ import annotations

from dataclasses import dataclass
from itertools import pairwise

from audit.engine.model import Bearing, Model
from audit.standards.checks import NEAR, RequiredCheck

STUD_SPACING = 0.610  # m; studs stand at 406 or 610 mm centres (common practice), never wider apart
ROW = 3  # members in a row before they are studs of a wall or joists of a run
PLURAL = {
    "stud": "studs",
    "post": "posts",
    "wall plate": "wall plates",
    "sole plate": "sole plates",
    "joist": "joists",
    "beam": "beams",
    "sill": "sills",
    "plate": "plates",
}
FAMILY_WORDS = {"sawn_lumber": "lumber", "engineered": "engineered"}  # the rest read as they are named


@dataclass(frozen=True)
class Detail:
    """A kind of detail: the check's kind and face, and the role and family of the member checked and the other."""

    kind: str  # local | near-support
    face: str  # top | bottom: the face of the checked member that bears
    checked: tuple[str, str]  # (role, family) of the member checked
    other: tuple[str, str]  # (role, family) of the member it bears against

    def words(self) -> str:
        """'Lumber joists on glulam beams: the check of the beam under each joist'."""
        upper, lower = (self.other, self.checked) if self.face == "top" else (self.checked, self.other)
        pair = f"{_named(upper)} on {_named(lower)}"
        checked, other = self.checked[0], self.other[0]
        if self.kind == NEAR:
            what = f"the near-support check of the {checked} over each {other}"
        elif self.face == "top":
            what = f"the check of the {checked} under each {other}"
        else:
            what = f"the bearing of each {checked} on its {other}"
        return f"{pair[:1].upper()}{pair[1:]}: {what}"


def _named(role: tuple[str, str]) -> str:
    name, family = role
    return f"{FAMILY_WORDS.get(family, family)} {PLURAL.get(name, name + 's')}".strip()


def member_roles(model: Model) -> dict[str, str]:
    """Member id -> its role (stud, post, wall plate, sole plate, joist, beam)."""
    members = model.members
    supports: dict[str, list[Bearing]] = {}
    for b in model.bearings:
        supports.setdefault(b.upper.member, []).append(b)
    studs: set[str] = set()
    plates: set[str] = set()
    for m in members.values():
        if m.vertical:
            continue
        under = [b for b in supports.get(m.id, []) if members[b.lower.member].vertical]
        if _a_row_of_studs(model, under):
            plates.add(m.id)
            studs.update(b.lower.member for b in under)
    soles = {b.lower.member for b in model.bearings if b.upper.member in studs and not members[b.lower.member].vertical}
    runs: dict[tuple, list[str]] = {}
    for m in members.values():
        if m.vertical or m.id in plates or m.id in soles or len(supports.get(m.id, [])) < 2:
            continue
        key = (m.material, round(m.b, 6), round(m.d, 6), frozenset(b.lower.member for b in supports[m.id]))
        runs.setdefault(key, []).append(m.id)
    joists = {mid for ids in runs.values() if len(ids) >= ROW for mid in ids}
    roles = {}
    for m in members.values():
        if m.vertical:
            roles[m.id] = "stud" if m.id in studs else "post"
        elif m.id in plates:
            roles[m.id] = "wall plate"
        elif m.id in soles:
            roles[m.id] = "sole plate"
        elif m.continuous:
            below = model.materials.get(m.bears_on)
            roles[m.id] = "sill" if below is not None and below.family in ("concrete", "masonry") else "plate"
        else:
            roles[m.id] = "joist" if m.id in joists else "beam"
    return roles


def _a_row_of_studs(model: Model, under: list[Bearing]) -> bool:
    if len(under) < ROW:
        return False
    sections = {(model.members[b.lower.member].material, model.members[b.lower.member].b) for b in under}
    if len(sections) != 1 or any(b.upper.at is None for b in under):
        return False
    at = sorted(b.upper.at or 0.0 for b in under)
    return all(b - a <= STUD_SPACING + 1e-9 for a, b in pairwise(at))


def detail_of(check: RequiredCheck, model: Model, roles: dict[str, str]) -> Detail:
    def role(member_id: str) -> tuple[str, str]:
        if member_id not in model.members:
            return "point load", ""  # a point load's own crushing check: the other side is the load, not a member
        return roles.get(member_id, "beam"), model.material_of(member_id).family

    return Detail(check.kind, check.face, role(check.member), role(check.other_member))
