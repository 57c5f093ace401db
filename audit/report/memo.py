"""Stage 7: write the review memo (one self-contained HTML file) and the findings exports.

The memo is rendered by jinja2 with autoescaping from plain view data built here; it loads
no stylesheet, font, script or image from anywhere. Output is deterministic: the date comes
from the model or the command line, and everything is ordered.
"""

from __future__ import annotations

import datetime as dt
from collections.abc import Iterator
from dataclasses import dataclass
from typing import Any

import jinja2

from audit import __version__
from audit.inputs.read_claims import Claim
from audit.report.export import check_record, rows_to_csv
from audit.review.findings import KINDS, SEVERITIES, Finding
from audit.review.reconcile import Reconciliation
from audit.review.review import Review, uplift_threshold
from audit.standards.checks import NEAR

STATUS_WORDS = {
    "failing": "FAILS",
    "missing": "MISSING",
    "mis-loaded": "MIS-LOADED",
    "resistance-differs": "QR DIFFERS",
    "confirmed": "CONFIRMED",
    "covered": "COVERED (TYP.)",
    "not-covered": "NOT COVERED",
    "computed": "PASSES",
}
SKETCH_LIMIT = 400  # members drawn; a larger building lists the rest in the table only
DERIVATION_LIMIT = 2000  # above this many checks the memo is trimmed to stay quick to open:
LARGE_DERIVATIONS = 300  # derivations of failing checks only, at most this many
LARGE_SKETCHES = 40

CAUTIONS = (
    "This memo supports the reviewer's judgement and never replaces it.",
    "Every factor in the rule pack must be verified against the edition of CSA O86 and the building code "
    "adopted where the building stands; values marked 'from memory: verify' have not been checked against a "
    "printed edition.",
    "The engineer of record, local codes and licensed practice govern.",
    "bearing-audit recomputes only what the review model states: a member, bearing or load missing from the "
    "model is missing from this review. It does not design.",
)


@dataclass(frozen=True)
class MemoOptions:
    date: dt.date | None = None
    title: str = "Bearing review memo"


def _env() -> jinja2.Environment:
    return jinja2.Environment(
        loader=jinja2.PackageLoader("audit.report", "templates"),
        autoescape=jinja2.select_autoescape(default=True, default_for_string=True),
        undefined=jinja2.StrictUndefined,
        trim_blocks=True,
        lstrip_blocks=True,
    )


def kn(value: float | None) -> str:
    if value is None:
        return "—"
    text = f"{value / 1000:.2f}"
    return "0.00" if text == "-0.00" else text


def assumptions(review: Review) -> list[str]:
    pack = review.pack
    out = [
        "Members on two supports are solved by statics; members on three or more supports by the stiffness "
        "method for a continuous beam of constant EI on unyielding supports.",
        *_pattern_lines(review),
        "Spans run between bearing centres; loads beyond an end support act on an overhang.",
        *(
            f"{choice.title}: {choice.text(review.readings[name])} [reading {review.readings[name]}]."
            for name, choice in pack.choices.items()
        ),
        "Near-support checks are made where point loads or bearings on the top face have their centres within "
        "the member depth d of the support centre.",
        "A plate on a stud wall (support: studs) stands on studs placed at their spacing from the plate's start, "
        "with an end stud, and on the stud packs the model gives, each replacing the studs it covers; the plate is "
        "checked over each loaded stud and pack and squeezed where a load above lies within d of one. Members "
        "continuously supported (support: continuous) get local checks under every bearing on them; their "
        "underside is checked only where the model shows what is under them, and point loads on one whose support "
        "is not shown are listed as not checked. A bearing no load passes through needs no check.",
        "Contact area on each member: along its grain, the bearing length on it (where the model gives none, "
        "the other member's width for a square crossing, or a post's depth); across its grain, the least of its "
        "own width b, the other member's extent across it (a post's width, or a crossing member's seat along its "
        "own grain) and any stated plate or seat width. A stated plate or seat limits the contact, never widens it.",
        "Glulam bears on its compression-face laminations where loads land on its top face and on its "
        "tension-face laminations at its supports, for a layup installed as designed (an inverted layup is not "
        "modelled); a near-support check loads both faces and takes the lesser fcp. Each family's findings cite "
        "its own clause from the rule pack.",
        "Specified loads are taken as given: snow, wind and earthquake loads must already include their "
        "importance factors (the tool applies none). Wind given as pressure and suction is taken each way in every "
        "combination with wind; live load marked storage takes the pack's storage companion factor and counts as "
        "long-term load in the KD formula where the rule pack says so.",
        "KD per combination: permanent 0.65, short term 1.15, standard term 1.00 or the long-term formula where "
        "the specified dead load at the check exceeds its L + S load. The governing combination is the one with "
        "the highest Qf/Qr.",
    ]
    threshold, whose = uplift_threshold(review.model, pack)
    out.append(
        f"Calculated uplift below {threshold / 1000:.2f} kN ({whose}) is a minor note, likely continuity of the "
        "statics; larger uplift is a major finding."
        if threshold > 0
        else "Every calculated uplift is a major finding (no note threshold set by the project or the rule pack)."
    )
    if review.model.factored_groups:
        out.append(
            "Already-factored loads act in their own groups, each with its stated duration; they are not "
            "combined with specified loads."
        )
    return out


def _pattern_lines(review: Review) -> list[str]:
    cpack = review.cpack
    if not cpack.patterns:
        return ["Every span of a continuous member carries the whole of each load case (no pattern loading)."]
    placed = "; ".join(
        f"{case} at {low:g} or {high:g} of its value on each span [{p.clause}]"
        for case, p in sorted(cpack.patterns.items())
        for low, high in [p.value]
    )
    return [
        f"Pattern loading at the supports of members on three or more supports: {placed}, whichever is worse at each "
        "check; the check names its governing pattern. Loads pass down to the members below with every span "
        "loaded.",
        f"Uplift is looked for under every combination with dead load at {cpack.counteracting_dead.value:g}D where it "
        "counteracts and every patterned case at its least favourable placing.",
    ]


def _finding_view(f: Finding, review: Review, reconciliation: Reconciliation | None, claims: dict[str, Claim]):
    outcome = reconciliation.outcome(f.check_id) if reconciliation and f.check_id else None
    claim = claims.get(outcome.claim_id) if outcome and outcome.claim_id else claims.get(f.claim_id)
    result = review.result(f.check_id) if f.check_id else None
    rows = []
    if result is not None and claim is not None:  # a missing check's numbers are in its message
        g = result.governing
        cmp_qf = outcome.qf if outcome else None
        cmp_qr = outcome.qr if outcome else None
        rows.append(
            ("Qf (kN)", kn(claim.qf) if claim else "not claimed", kn(g.qf), kn(cmp_qf.difference) if cmp_qf else "")
        )
        rows.append(
            (
                "Qr (kN)",
                kn(claim.claimed_qr) if claim else "not claimed",
                kn(g.qr),
                kn(cmp_qr.difference) if cmp_qr else "",
            )
        )
        rows.append(
            (
                "Qf/Qr",
                f"{claim.qf / claim.claimed_qr:.2f}" if claim and claim.qf and claim.claimed_qr else "",
                f"{g.utilisation:.2f}",
                "",
            )
        )
    return {
        "code": f.code,
        "kind": f.kind,
        "severity": f.severity,
        "message": f.message,
        "check_id": f.check_id,
        "bearing": f.bearing,
        "member": f.member,
        "page": f.page or (claim.where.cite() if claim else ""),
        "clause": f.clause,
        "rows": rows,
        "governing": result.governing.combination if result else "",
        "claim_text": claim.text if claim else "",
    }


def _check_rows(review: Review, reconciliation: Reconciliation | None, claims: dict[str, Claim]):
    groups: dict[tuple[str, str], list[dict[str, Any]]] = {}
    for r in review.results:
        member = review.model.members[r.check.member]
        outcome = reconciliation.outcome(r.check.id) if reconciliation else None
        status = outcome.status if outcome else ("failing" if not r.passes else "computed")
        claim = claims.get(outcome.claim_id) if outcome and outcome.claim_id else None
        groups.setdefault((member.level or "(no level)", member.id), []).append(
            {
                "id": r.check.id,
                "kind": r.check.kind,
                "qf": kn(r.governing.qf),
                "qr": kn(r.governing.qr),
                "util": f"{r.governing.utilisation:.2f}",
                "governing": r.governing.combination,
                "claim": f"{claim.id} ({claim.where.cite()})" if claim else "—",
                "status": STATUS_WORDS[status],
                "status_class": status,
            }
        )
    out = []
    for level in sorted({k[0] for k in groups}):
        members = [{"id": m, "rows": groups[(lv, m)]} for lv, m in sorted(groups) if lv == level]
        out.append({"level": level, "members": members})
    return out


def _derivations(review: Review, status_of: dict[str, str]) -> tuple[list[dict[str, Any]], bool]:
    """Derivations of every check, or on a large building of the first failing ones."""
    out: list[dict[str, Any]] = []
    all_checks = len(review.results) <= DERIVATION_LIMIT
    for r in review.results:
        if not all_checks and (status_of.get(r.check.id) != "failing" or len(out) >= LARGE_DERIVATIONS):
            continue
        rec = check_record(r)
        out.append(
            {
                "id": r.check.id,
                "why": r.check.why,
                "formula": "Qr' = (2/3) phi Fcp Ab' KB KZcp" if r.check.kind == NEAR else "Qr = phi Fcp Ab KB KZcp",
                "area": r.area_reason,
                "factors": [
                    (f.name, f"{f.value:.3f}" if f.name != "fcp" else f"{f.value / 1e6:.2f} MPa", f.reason, f.clause)
                    for f in r.factors
                ],
                "forces": ", ".join(f"{case} {v:.2f} kN" for case, v in rec["forces_kN"].items()) or "none",
                "governing": r.governing,
                "kd_reason": r.governing.kd_reason,
                "qf": kn(r.governing.qf),
                "qr": kn(r.governing.qr),
                "util": f"{r.governing.utilisation:.3f}",
            }
        )
    return out, all_checks


def build_view(
    review: Review, reconciliation: Reconciliation | None, claims: tuple[Claim, ...], options: MemoOptions
) -> dict[str, Any]:
    from audit.report.sketch import MAX_CHECKS_DRAWN, member_sketches

    p = review.model.project
    claims_by_id = {c.id: c for c in claims}
    findings = reconciliation.findings if reconciliation else review.engine_findings
    shown = [f for f in findings if f.kind != "confirmed"]
    counts = {k: 0 for k in KINDS}
    for f in findings:
        counts[f.kind] += 1
    by_severity = {s: sum(1 for f in shown if f.severity == s) for s in SEVERITIES}
    date = options.date or p.date
    status_of = (
        {o.check_id: o.status for o in reconciliation.checks}
        if reconciliation
        else {r.check.id: ("failing" if not r.passes else "computed") for r in review.results}
    )
    derivations, all_derivations = _derivations(review, status_of)
    sketch_limit = SKETCH_LIMIT if all_derivations else LARGE_SKETCHES
    return {
        "title": options.title,
        "project": p,
        "date": date.isoformat() if date else "undated",
        "version": __version__,
        "pack": review.pack,
        "cpack": review.cpack,
        "summary": _summary(review, reconciliation, counts, claims),
        "counts": [(KINDS[k].code, k, n) for k, n in counts.items()],
        "by_severity": by_severity,
        "findings": [_finding_view(f, review, reconciliation, claims_by_id) for f in shown],
        "groups": _check_rows(review, reconciliation, claims_by_id),
        "exempt": review.checklist.exempt,
        "sketches": member_sketches(review, status_of, STATUS_WORDS, sketch_limit),
        "sketch_limit": sketch_limit,
        "max_checks_drawn": MAX_CHECKS_DRAWN,
        "derivations": derivations,
        "all_derivations": all_derivations,
        "derivation_limit": DERIVATION_LIMIT,
        "large_derivations": LARGE_DERIVATIONS,
        "assumptions": assumptions(review),
        "cautions": CAUTIONS,
        "kinds": list(KINDS.values()),
        "has_claims": reconciliation is not None,
    }


def _summary(review: Review, rec: Reconciliation | None, counts: dict[str, int], claims) -> str:
    n = len(review.results)
    if rec is None:
        failing = sum(1 for r in review.results if not r.passes)
        return f"{n} required bearing checks recomputed at {len(review.model.bearings)} bearings; {failing} fail."
    return (
        f"Of {n} required bearing checks at {len(review.model.bearings)} bearings, the calc claims "
        f"{n - counts['missing']} ({len(claims)} claims read). {counts['failing']} fail on recomputation, "
        f"{counts['missing']} are missing, {counts['mis-loaded']} carry a load that differs, "
        f"{counts['resistance-differs']} a resistance that differs, {counts['unmatched-claim']} claims match no "
        f"required check, and {counts['confirmed']} are confirmed."
    )


def render_memo(
    review: Review, reconciliation: Reconciliation | None, claims: tuple[Claim, ...], options: MemoOptions
) -> str:
    return "".join(memo_chunks(review, reconciliation, claims, options))


def memo_chunks(
    review: Review, reconciliation: Reconciliation | None, claims: tuple[Claim, ...], options: MemoOptions
) -> Iterator[str]:
    """The memo in pieces, for writing a large one without holding it whole."""
    view = build_view(review, reconciliation, claims, options)
    return _env().get_template("memo.html.j2").generate(**view)


# ---------------------------------------------------------------- exports

FINDING_COLUMNS = [
    "code",
    "kind",
    "severity",
    "check",
    "bearing",
    "member",
    "claim",
    "calc_reference",
    "clause",
    "claimed",
    "recomputed",
    "message",
]


def finding_rows(findings: tuple[Finding, ...]) -> list[list[Any]]:
    rows = []
    for f in findings:
        claimed = f.numbers.get("claimed")
        recomputed = f.numbers.get("recomputed", f.numbers.get("qf"))
        rows.append(
            [
                f.code,
                f.kind,
                f.severity,
                f.check_id,
                f.bearing,
                f.member,
                f.claim_id,
                f.page,
                f.clause,
                "" if claimed is None else f"{claimed / 1000:.3f}",
                "" if recomputed is None else f"{recomputed / 1000:.3f}",
                f.message,
            ]
        )
    return rows


def findings_csv(findings: tuple[Finding, ...]) -> str:
    return rows_to_csv(FINDING_COLUMNS, finding_rows(findings))


def findings_json(review: Review, rec: Reconciliation | None, findings: tuple[Finding, ...]) -> str:
    return "".join(findings_json_chunks(review, rec, findings))


def findings_json_chunks(review: Review, rec: Reconciliation | None, findings: tuple[Finding, ...]) -> Iterator[str]:
    from audit.report.export import json_chunks, review_record

    data = review_record(review)
    data["findings"] = (dict(zip(FINDING_COLUMNS, row, strict=True)) for row in finding_rows(findings))
    if rec is not None:
        data["check_outcomes"] = [
            {"check": o.check_id, "claim": o.claim_id or None, "status": o.status, "remedy": o.remedy or None}
            for o in rec.checks
        ]
        data["claim_outcomes"] = [
            {"claim": o.claim_id, "check": o.check_id or None, "candidates": list(o.candidates)} for o in rec.claims
        ]
    return json_chunks(data)
