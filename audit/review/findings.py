"""The finding model: each kind of finding is one registered rule with a code, a severity
and fixed documentation; a finding is a frozen record that points at a check, a bearing
or a claim. Stages collect findings; writers render them; the exit status is derived.
"""

from __future__ import annotations

from dataclasses import dataclass, field

SEVERITIES = ("critical", "major", "minor", "info")


@dataclass(frozen=True)
class FindingKind:
    code: str  # short, in review words: how comments and logs tag the kind
    name: str
    severity: str
    what: str  # what it checks
    why: str  # why it matters
    title: str  # a comment's title, with {what}: the check or spot it is about


KINDS: dict[str, FindingKind] = {
    k.name: k
    for k in (
        FindingKind(
            "CRUSH",
            "failing",
            "critical",
            "the recomputed factored load exceeds the recomputed resistance",
            "the contact may crush; worst where the calc calls it adequate",
            "{what}: fails on recomputation",
        ),
        FindingKind(
            "ABSENT",
            "missing",
            "major",
            "a check the design requires is not in the calc",
            "an unchecked contact may crush: the bearing of a member on its support (a joist on its beam, a beam "
            "on its post) and the near-support check are the ones most often left out",
            "{what}: missing from the calc",
        ),
        FindingKind(
            "LOAD",
            "mis-loaded",
            "major",
            "the claimed factored load differs from the recomputed one beyond tolerance",
            "a check made with the wrong load proves nothing about the real one",
            "{what}: the calc's load differs",
        ),
        FindingKind(
            "CAPACITY",
            "resistance-differs",
            "major",
            "the claimed resistance differs from the recomputed one beyond tolerance",
            "a resistance taken too high overstates the capacity of the contact",
            "{what}: the calc's resistance differs",
        ),
        FindingKind(
            "ORPHAN",
            "unmatched-claim",
            "minor",
            "a claim in the calc matches no required check",
            "the claim may name a location the model lacks, or a check made at the wrong place",
            "{what}: matches no required check",
        ),
        FindingKind(
            "TYP-GAP",
            "not-covered",
            "major",
            "a check that a typical claim covers is worse than the claim: higher Qf, lower Qr, or failing",
            "a typical check proves only the spots no worse than the one it shows",
            "{what}: not covered by the calc's typical check",
        ),
        FindingKind(
            "TYP",
            "covered",
            "info",
            "a check that a typical claim covers, no worse than the claim",
            "the typical claim stands for this spot",
            "{what}: covered by the calc's typical check",
        ),
        FindingKind(
            "AGREES",
            "confirmed",
            "info",
            "the claim matches the recomputed check within tolerance",
            "the check stands as claimed",
            "{what}: agrees with the calc",
        ),
        FindingKind(
            "UNSEEN",
            "not-checked",
            "minor",
            "a point load lands on a member modelled as continuously supported on something the model does not show",
            "the member's underside and the squeeze through it at that spot are not checked; a post or girder on a "
            "plate over studs is often the governing contact of the detail",
            "{what}: what is under it is not in the model, so its underside is not checked",
        ),
        FindingKind(
            "FORCE",
            "force-differs",
            "major",
            "a force the calc states at a bearing differs, beyond tolerance, from what the model's loads give there",
            "the checks at that bearing carry the calc's force; if the calc's take-down is wrong, so are they",
            "{what}: the calc's force differs from the model's loads",
        ),
        FindingKind(
            "GIVEN",
            "calc-force",
            "info",
            "a bearing whose force is taken from the calc, not from the model's take-down",
            "the review rests on the calc's own reaction there: the load path above it is not re-modelled",
            "{what}: force taken from the calc",
        ),
        FindingKind(
            "LIFT",
            "uplift",
            "major",
            "a factored combination gives an upward force through a bearing",
            "a bearing cannot resist uplift: a tie-down is needed and the load path must be confirmed",
            "{what}: uplift through the bearing",
        ),
    )
}


@dataclass(frozen=True)
class Finding:
    kind: str  # a key of KINDS
    severity: str
    message: str
    check_id: str = ""
    bearing: str = ""
    member: str = ""
    claim_id: str = ""
    page: str = ""  # where in the calc, when a claim is involved
    clause: str = ""
    hint: str = ""
    numbers: dict[str, float] = field(default_factory=dict, compare=False)
    quantity: str = ""  # Qf | Qr | Qf/Qr: the number compared, where ``numbers`` holds claimed and recomputed

    @property
    def code(self) -> str:
        return KINDS[self.kind].code


def severity_rank(severity: str) -> int:
    return SEVERITIES.index(severity)
