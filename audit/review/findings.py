"""The finding model: each kind of finding is one registered rule with its name, a weight
and fixed documentation; a finding is a frozen record that points at a check, a bearing
or a claim. Stages collect findings; writers render them; the exit status is derived.

One word per idea, the same in the memo, the terminal, the comment logs and the JSON: a
finding's *kind* is its name here (``failing``, ``missing``, ...), and its *weight* is one of
``WEIGHTS``: safety (a contact that fails), revise (a check missing, mis-loaded or with a
resistance that does not hold), clarify (an unmatched claim, a support the model does not
show) and record (confirmed or covered, listed for the record).
"""

from __future__ import annotations

from dataclasses import dataclass, field

WEIGHTS = ("safety", "revise", "clarify", "record")  # heaviest first
SEVERITIES = WEIGHTS  # the older name of the same list


@dataclass(frozen=True)
class FindingKind:
    name: str  # the kind, as every output names it
    severity: str  # its usual weight, one of WEIGHTS
    what: str  # what it checks
    why: str  # why it matters
    title: str  # a comment's title, with {what}: the check or spot it is about

    @property
    def code(self) -> str:
        """The kind's name (there is no second code for it)."""
        return self.name


KINDS: dict[str, FindingKind] = {
    k.name: k
    for k in (
        FindingKind(
            "failing",
            "safety",
            "the recomputed factored load exceeds the recomputed resistance",
            "the contact may crush; worst where the calc calls it adequate",
            "{what}: fails on recomputation",
        ),
        FindingKind(
            "missing",
            "revise",
            "a check the design requires is not in the calc",
            "an unchecked contact may crush: the bearing of a member on its support (a joist on its beam, a beam "
            "on its post) and the near-support check are the ones most often left out",
            "{what}: missing from the calc",
        ),
        FindingKind(
            "mis-loaded",
            "revise",
            "the claimed factored load differs from the recomputed one beyond tolerance",
            "a check made with the wrong load proves nothing about the real one",
            "{what}: the calc's load differs",
        ),
        FindingKind(
            "resistance-differs",
            "revise",
            "the claimed resistance differs from the recomputed one beyond tolerance",
            "a resistance taken too high overstates the capacity of the contact",
            "{what}: the calc's resistance differs",
        ),
        FindingKind(
            "unmatched-claim",
            "clarify",
            "a claim in the calc matches no required check",
            "the claim may name a location the model lacks, or a check made at the wrong place",
            "{what}: matches no required check",
        ),
        FindingKind(
            "not-covered",
            "revise",
            "a check that a typical claim covers is worse than the claim: higher Qf, lower Qr, or failing",
            "a typical check proves only the spots no worse than the one it shows",
            "{what}: not covered by the calc's typical check",
        ),
        FindingKind(
            "covered",
            "record",
            "a check that a typical claim covers, no worse than the claim",
            "the typical claim stands for this spot",
            "{what}: covered by the calc's typical check",
        ),
        FindingKind(
            "confirmed",
            "record",
            "the claim matches the recomputed check within tolerance",
            "the check stands as claimed",
            "{what}: agrees with the calc",
        ),
        FindingKind(
            "not-checked",
            "clarify",
            "a point load lands on a member modelled as continuously supported on something the model does not show",
            "the member's underside and the squeeze through it at that spot are not checked; a post or girder on a "
            "plate over studs is often the governing contact of the detail",
            "{what}: what is under it is not in the model, so its underside is not checked",
        ),
        FindingKind(
            "no-bearing-length",
            "clarify",
            "a point load on a timber member states no bearing length",
            "the member's crushing under the load is not checked: an equipment leg or a post of framing the model "
            "does not show can crush the member it stands on",
            "{what}: the crushing under point loads with no bearing length is not checked",
        ),
        FindingKind(
            "force-differs",
            "revise",
            "a force the calc states at a bearing differs, beyond tolerance, from what the model's loads give there",
            "the checks at that bearing carry the calc's force; if the calc's take-down is wrong, so are they",
            "{what}: the calc's force differs from the model's loads",
        ),
        FindingKind(
            "calc-force",
            "record",
            "a bearing whose force is taken from the calc, not from the model's take-down",
            "the review rests on the calc's own reaction there: the load path above it is not re-modelled",
            "{what}: force taken from the calc",
        ),
        FindingKind(
            "short-bearing",
            "revise",
            "the end bearing of a joist or beam is shorter than the building code's minimum length of bearing",
            "the code asks that length whatever the load: a short seat leaves no margin for the tolerances of "
            "framing, shrinkage and the member sliding off its support",
            "{what}: shorter than the code's minimum bearing length",
        ),
        FindingKind(
            "notched-end",
            "record",
            "a member notched at a bearing: its depth there, and the near-support reach, are d less the notch",
            "the notch's own shear is another clause, not checked here; the reviewer checks it under the standard",
            "{what}: notched at the bearing, its shear not checked here",
        ),
        FindingKind(
            "no-bearing-path",
            "revise",
            "a post lands between the members of a floor (joists either side) and bears on none of them",
            "nothing in the framing carries it: the load needs blocking, a rim or a member under it, or a post below",
            "{what}: no direct bearing path under it",
        ),
        FindingKind(
            "no-separation",
            "clarify",
            "untreated timber bears on concrete or masonry and the model states no separation between them",
            "wood in contact with concrete or masonry takes up its moisture: the code asks for a membrane, a sill "
            "gasket or treated wood there",
            "{what}: no separation from concrete or masonry stated",
        ),
        FindingKind(
            "uplift",
            "revise",
            "a factored combination gives an upward force through a bearing",
            "a bearing cannot resist uplift: a tie-down is needed and the load path must be confirmed",
            "{what}: uplift through the bearing",
        ),
        FindingKind(
            "hanger-capacity",
            "safety",
            "the governing factored reaction through a hanger against the capacity the firm's listing gives it",
            "a hanger loaded past its listed capacity may tear or pull out; within it, listed for the record",
            "{what}: the reaction against the hanger's listed capacity",
        ),
        FindingKind(
            "hanger-flange",
            "revise",
            "a top-flange hanger's flange reaches further across its carrier than the carrier is wide",
            "a flange that overhangs its carrier does not bear as listed: the listed capacity and the carrier's "
            "bearing under it assume the flange on the carrier over its full length",
            "{what}: the carrier is narrower than the hanger's top flange",
        ),
        FindingKind(
            "hanger-side",
            "record",
            "a face-mount hanger takes its load into the side of its carrier through fasteners",
            "that is not a bearing on the carrier's grain: no bearing check of the carrier is made there",
            "{what}: face-mount hangers load its side, not a bearing",
        ),
    )
}


# Kinds of a part or detail only some models have (hangers, notches, seats on concrete, posts between joists, short
# seats): counted and listed only where a finding of the kind was made, so a letter's summary stays on its first page
# and lists what this building has.
PART_KINDS = frozenset(
    {
        "hanger-capacity",
        "hanger-flange",
        "hanger-side",
        "short-bearing",
        "notched-end",
        "no-bearing-path",
        "no-separation",
    }
)


def counted(findings) -> dict[str, int]:
    """Findings by kind, in the order of KINDS: every kind, but a part's kinds only where they were found."""
    out = {k: 0 for k in KINDS}
    for f in findings:
        out[f.kind] += 1
    return {k: n for k, n in out.items() if n or k not in PART_KINDS}


@dataclass(frozen=True)
class Finding:
    kind: str  # a key of KINDS
    severity: str  # its weight, one of WEIGHTS
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

    def __post_init__(self) -> None:
        if self.kind not in KINDS or self.severity not in WEIGHTS:
            msg = f"a finding of kind {self.kind!r} with weight {self.severity!r}: not one of KINDS and WEIGHTS"
            raise ValueError(msg)

    @property
    def code(self) -> str:
        return self.kind

    @property
    def weight(self) -> str:
        return self.severity


def severity_rank(severity: str) -> int:
    return WEIGHTS.index(severity)
