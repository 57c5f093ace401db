"""Timber bearing on concrete or masonry with no separation stated: a note asking what keeps them apart.

Wood in contact with concrete or masonry takes up its moisture; building codes ask for a
separation (a damp-proof membrane, a sill gasket) or treated wood there (common practice; NBC
9.23.2.2 as recalled, from memory: verify). The review cannot see the detail, so where the model
states none (``separation`` on the bearing, or on a continuous member over ``bears_on`` concrete or
masonry) and the timber is not treated (KT 1.0), it asks.
"""

from __future__ import annotations

from audit.engine.model import Member, Model
from audit.review.findings import KINDS, Finding

MINERAL = ("concrete", "masonry")
CLAUSE = "NBC 9.23.2.2; IRC R317.1 (as recalled, from memory: verify)"


def _timber(model: Model, member: Member) -> bool:
    family = model.materials[member.material].family
    return family not in (*MINERAL, "steel") and member.kt == 1.0


def _finding(member: Member, under: str, where: str, bearing: str) -> Finding:
    return Finding(
        "no-separation",
        KINDS["no-separation"].severity,
        f"{member.id} bears on {under} {where} and the model states no separation between them: state the "
        "damp-proof membrane or sill gasket there, or that the wood is preservative-treated, as the code asks.",
        bearing=bearing,
        member=member.id,
        clause=CLAUSE,
    )


def no_separation_findings(model: Model) -> tuple[Finding, ...]:
    out = []
    for b in model.bearings:
        if b.separation:
            continue
        for timber, other in ((b.upper, b.lower), (b.lower, b.upper)):
            member, below = model.members[timber.member], model.members[other.member]
            if _timber(model, member) and model.materials[below.material].family in MINERAL:
                out.append(_finding(member, below.id, f"at bearing {b.id}", b.id))
    for m in model.members.values():
        under = model.materials.get(m.bears_on) if m.continuous else None
        if under is not None and under.family in MINERAL and not m.separation and _timber(model, m):
            out.append(_finding(m, f"{under.family} ({m.bears_on})", "along its length", m.id))
    return tuple(out)
