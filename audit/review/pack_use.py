"""How many of the rule-pack values a review used are verified, and how many are from memory.

A value is used when the review could have drawn on it: every value of the resistance pack except the
strengths of species, and the clauses of families, that no material of the model is; and every value of
the combination pack (each combination is evaluated at every check). A status that starts with "verified"
is verified (``rules --adopt`` writes it so), one that says "from memory" is recalled; any other
("common practice") is a reading of the trade that no printed table states.
"""

from __future__ import annotations

from dataclasses import dataclass

from audit.review.review import Review
from audit.standards.packs import Sourced


@dataclass(frozen=True)
class PackUse:
    used: int
    verified: int
    recalled: int

    @property
    def other(self) -> int:
        return self.used - self.verified - self.recalled


def values_used(review: Review) -> list[Sourced]:
    pack, cpack, materials = review.pack, review.cpack, review.model.materials.values()
    species = {(m.family, m.species) for m in materials}
    families = {m.family for m in materials}
    unused = {id(s.fcp) for fam, by in pack.fcp.items() for sp, s in by.items() if (fam, sp) not in species}
    unused |= {
        id(s.tension_face)
        for fam, by in pack.fcp.items()
        for sp, s in by.items()
        if (fam, sp) not in species and s.tension_face is not None
    }
    unused |= {id(s) for fam, by in pack.fc.items() for sp, s in by.items() if (fam, sp) not in species}
    unused |= {id(s) for fam, s in pack.clauses.items() if fam not in families}
    out = [s for _, s in pack.all_sourced() if id(s) not in unused]
    out += [c.source for c in cpack.combinations]
    out += [cpack.counteracting_dead, cpack.storage_companion, *cpack.patterns.values()]
    return out


def pack_use(review: Review) -> PackUse:
    statuses = [s.status.strip().lower() for s in values_used(review)]
    verified = sum(1 for s in statuses if s.startswith("verified"))
    recalled = sum(1 for s in statuses if "from memory" in s and not s.startswith("verified"))
    return PackUse(len(statuses), verified, recalled)


def _are(n: int) -> str:
    return "none is" if n == 0 else f"{n} is" if n == 1 else f"{n} are"


def pack_use_sentence(review: Review) -> str:
    """One sentence for the memo: of the values used, how many are verified and how many from memory."""
    use = pack_use(review)
    other = f"; {_are(use.other)} common practice" if use.other else ""
    return (
        f"Of the {use.used} rule-pack values this review used ({review.pack.id}, {review.cpack.id}), "
        f"{_are(use.verified)} verified against a printed edition and {_are(use.recalled)} from memory "
        f"(marked 'from memory: verify'){other}."
    )
