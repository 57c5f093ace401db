"""Stage 6: reconcile the calc's claims with the recomputed checks.

Every required check gets exactly one outcome and every claim exactly one outcome. Numbers
that differ are diagnosed: each common slip is recomputed in turn, and the ones that
reproduce the claimed number are named. Failing checks get the smallest bearing length that
would make them pass. Claims are matched to checks in ``matching.py``, the slips recomputed in
``slips.py``, numbers compared by the one rule of ``tolerance.py``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property
from typing import Any

from audit.core.units import Display
from audit.inputs.read_claims import Claim
from audit.review import wording
from audit.review.findings import KINDS, Finding, counted, severity_rank
from audit.review.matching import label_index, match_claims  # noqa: F401  (label_index: for `explain`)
from audit.review.remedies import remedy_text
from audit.review.review import Review
from audit.review.slips import Slip, choose_slips, claimed_factors, qf_slips, qr_slips_with_load, recomputed_factors
from audit.review.tolerance import FACTOR_TOLERANCE, PRINTED_RATIO, UTILISATION_ABS_TOL, Tolerance, force_tolerance
from audit.standards.checks import RequiredCheck
from audit.standards.resistance import (
    CheckResult,
    Symbol,
)


@dataclass(frozen=True)
class Comparison:
    quantity: str  # Qf | Qr
    claimed: float
    recomputed: float
    within: bool
    direction: str  # unconservative | conservative | ""
    slips: tuple[Slip, ...]  # slips that reproduce the claimed number

    @property
    def difference(self) -> float:
        return self.claimed - self.recomputed

    @property
    def relative(self) -> float:
        return self.difference / self.recomputed if self.recomputed else math.inf


@dataclass(frozen=True)
class FactorDifference:
    name: str
    claimed: float
    recomputed: float


@dataclass(frozen=True)
class CheckOutcome:
    check_id: str
    claim_id: str  # "" when the calc does not claim it
    status: str  # failing | missing | mis-loaded | resistance-differs | confirmed
    findings: tuple[Finding, ...]
    qf: Comparison | None = None
    qr: Comparison | None = None
    factor_differences: tuple[FactorDifference, ...] = ()
    remedy: str = ""


@dataclass(frozen=True)
class ClaimOutcome:
    claim_id: str
    check_id: str  # "" when unmatched
    finding: Finding | None
    candidates: tuple[str, ...] = ()


@dataclass(frozen=True)
class Reconciliation:
    checks: tuple[CheckOutcome, ...]
    claims: tuple[ClaimOutcome, ...]
    findings: tuple[Finding, ...]  # every finding, most severe first

    @cached_property
    def _by_check(self) -> dict[str, CheckOutcome]:
        return {o.check_id: o for o in self.checks}

    def outcome(self, check_id: str) -> CheckOutcome:
        return self._by_check[check_id]

    def counts(self) -> dict[str, int]:
        return counted(self.findings)


# ---------------------------------------------------------------- comparing


def _within(claimed: float, recomputed: float, review: Review) -> bool:
    return force_tolerance(review).agrees(claimed, recomputed)


def _compare_utilisation(claimed: float, recomputed: float, review: Review) -> Comparison:
    if Tolerance(UTILISATION_ABS_TOL, review.model.project.tolerance_relative).agrees(claimed, recomputed):
        return Comparison("Qf/Qr", claimed, recomputed, True, "", ())
    direction = "unconservative" if claimed < recomputed else "conservative"
    return Comparison("Qf/Qr", claimed, recomputed, False, direction, ())


def _compare(
    quantity: str,
    claimed: float,
    recomputed: float,
    slips,
    review: Review,
    factors: dict[str, float] | None = None,
    ours: dict[str, float] | None = None,
) -> Comparison:
    """Compare one number; only when it differs are the slips (a callable giving them) recomputed.

    ``factors``: the claim's own factor list and ``ours`` the recomputed factors: a slip is named only where the
    factors it would print are the claim's.
    """
    within = _within(claimed, recomputed, review)
    if within:
        return Comparison(quantity, claimed, recomputed, True, "", ())
    too_low = claimed < recomputed
    unconservative = too_low if quantity == "Qf" else not too_low
    reproducing = [s for s in slips() if _within(claimed, s.value, review)]
    chosen = choose_slips(reproducing, claimed, factors or {}, ours or {})
    return Comparison(
        quantity, claimed, recomputed, False, "unconservative" if unconservative else "conservative", chosen
    )


def factor_differences(claim: Claim, result: CheckResult, review: Review) -> tuple[FactorDifference, ...]:
    recomputed = recomputed_factors(result, review)
    out = []
    for name, value in claimed_factors(claim, review).items():
        ours = recomputed.get(name)
        if ours is not None and not FACTOR_TOLERANCE.agrees(value, ours):
            out.append(FactorDifference(name, value, ours))
    return tuple(out)


# ---------------------------------------------------------------- reconcile


def reconcile(review: Review, claims: tuple[Claim, ...]) -> Reconciliation:
    matched, unmatched, covered = match_claims(review, claims)
    governing_of = {claim.id: check_id for check_id, claim in matched.items()}
    check_outcomes = [
        _covered_outcome(r, covered[r.check.id], governing_of[covered[r.check.id].id], review)
        if r.check.id in covered
        else _check_outcome(r, matched.get(r.check.id), review)
        for r in review.results
    ]
    claim_check = {claim.id: check_id for check_id, claim in matched.items()}
    claim_outcomes = []
    unmatched_by_id = {claim.id: (reason, cands) for claim, reason, cands in unmatched}
    for claim in claims:
        if claim.id in claim_check:
            claim_outcomes.append(ClaimOutcome(claim.id, claim_check[claim.id], None))
            continue
        reason, candidates = unmatched_by_id[claim.id]
        hint = f"nearest: {', '.join(candidates)}" if candidates else "no near candidates"
        finding = Finding(
            "unmatched-claim",
            KINDS["unmatched-claim"].severity,
            wording.unmatched(claim.label, claim.where.cite(), reason, hint),
            claim_id=claim.id,
            member=claim.member,
            page=claim.where.cite(),
            hint=hint,
        )
        claim_outcomes.append(ClaimOutcome(claim.id, "", finding, candidates))
    findings = [f for o in check_outcomes for f in o.findings]
    findings += [o.finding for o in claim_outcomes if o.finding is not None]
    findings += list(review.engine_findings)
    findings.sort(key=lambda f: (severity_rank(f.severity), f.kind, f.check_id, f.claim_id, f.bearing))
    return Reconciliation(tuple(check_outcomes), tuple(claim_outcomes), tuple(findings))


def _covered_outcome(result: CheckResult, claim: Claim, governing_id: str, review: Review) -> CheckOutcome:
    """A check a typical claim covers: covered when the claim's Qf and Qr bound its own (within tolerance)."""
    check, g = result.check, result.governing
    slack_qf, slack_qr = force_tolerance(review).slack(g.qf), force_tolerance(review).slack(g.qr)
    d = display_for(review, claim)
    reasons = []
    if claim.qf is not None and g.qf > claim.qf + slack_qf:
        reasons.append(wording.exceeds("Qf", g.qf, claim.qf, d))
    claimed_qr = claim.claimed_qr
    if claimed_qr is not None and g.qr < claimed_qr - slack_qr:
        reasons.append(wording.below("Qr", g.qr, claimed_qr, d))
    if (
        claim.qf is None
        and claimed_qr is None
        and claim.utilisation is not None
        and g.utilisation > claim.utilisation + PRINTED_RATIO.slack(claim.utilisation)
    ):
        reasons.append(f"its Qf/Qr = {g.utilisation:.2f} exceeds the claim's {claim.utilisation:.2f}")
    if not result.passes:
        reasons.append(f"it fails: Qf/Qr = {g.utilisation:.2f}")
    where = _location(result, review)
    common: dict[str, Any] = {
        "check_id": check.id,
        "bearing": check.bearing,
        "member": check.member,
        "claim_id": claim.id,
        "page": claim.where.cite(),
        "clause": review.pack.clause_for(review.model.material_of(check.member).family, check.kind),
    }
    if not reasons:
        finding = Finding(
            "covered",
            KINDS["covered"].severity,
            wording.covered(_name(check, review), where, claim.label, claim.where.cite(), governing_id),
            numbers={"qf": g.qf, "qr": g.qr},
            **common,
        )
        return CheckOutcome(check.id, claim.id, "covered", (finding,))
    severity = "safety" if not result.passes else KINDS["not-covered"].severity
    finding = Finding(
        "not-covered",
        severity,
        wording.not_covered(_name(check, review), where, claim.label, claim.where.cite(), reasons),
        numbers={"qf": g.qf, "qr": g.qr},
        **common,
    )
    return CheckOutcome(check.id, claim.id, "not-covered", (finding,))


def display_for(review: Review, claim: Claim | None = None) -> Display:
    """Forces in the claim's own unit where it has one, else in the project's."""
    if claim is not None and claim.unit:
        return Display(claim.unit)
    return review.display


def _name(check: RequiredCheck, review: Review) -> str:
    """The check as engineers name it (``wording.check_name``)."""
    return wording.check_name(check, review.model.members.get(check.other_member))


def _location(result: CheckResult, review: Review) -> str:
    bearing = review.model.bearings_by_id.get(result.check.bearing)
    if bearing is None:
        return f"point load {result.check.load}"
    aliases = f" (calc: {', '.join(bearing.aliases)})" if bearing.aliases else ""
    return f"bearing {bearing.id}{aliases}"


def failing_without_claims(review: Review) -> tuple[Finding, ...]:
    """A review run with no claims yet still has a comment for each check that fails on recomputation."""
    return tuple(
        f
        for r in review.results
        if not r.passes
        for f in _check_outcome(r, None, review, claims_given=False).findings
        if f.kind == "failing"
    )


def _check_outcome(result: CheckResult, claim: Claim | None, review: Review, claims_given: bool = True) -> CheckOutcome:
    check = result.check
    where = _location(result, review)
    common: dict[str, Any] = {
        "check_id": check.id,
        "bearing": check.bearing,
        "member": check.member,
        "clause": review.pack.clause_for(review.model.material_of(check.member).family, check.kind),
        "page": claim.where.cite() if claim else "",
        "claim_id": claim.id if claim else "",
    }
    d = display_for(review, claim)
    findings: list[Finding] = []
    remedy = ""
    if not result.passes:
        remedy = remedy_text(result, review)
        findings.append(_failing(result, claim, review, claims_given, remedy, where, d, common))
    if claim is None:
        findings.append(_missing(result, review, where, d, common))
        return CheckOutcome(check.id, "", "failing" if not result.passes else "missing", tuple(findings), remedy=remedy)
    qf_cmp, qr_cmp = _comparisons(result, claim, review)
    if qf_cmp is None and qr_cmp is None and claim.utilisation is not None:
        findings += _ratio_only(result, claim.utilisation, review, where, d, common)
    diffs = factor_differences(claim, result, review)
    findings += _differences(result, (qf_cmp, qr_cmp), diffs, review, where, d, common)
    status = (
        "failing"
        if not result.passes
        else next((f.kind for f in findings if f.kind in ("mis-loaded", "resistance-differs")), "confirmed")
    )
    if status == "confirmed":
        g = result.governing
        text = wording.confirmed(_name(check, review), where, g.qf, g.qr, d)
        findings.append(Finding("confirmed", "record", text, **common))
    return CheckOutcome(check.id, claim.id, status, tuple(findings), qf_cmp, qr_cmp, diffs, remedy)


def _failing(
    result: CheckResult,
    claim: Claim | None,
    review: Review,
    claims_given: bool,
    remedy: str,
    where: str,
    d: Display,
    common: dict[str, Any],
) -> Finding:
    """A check that fails on recomputation, with what the calc says of it and the remedies that pass."""
    g = result.governing
    said_ok = claim is None or claim.adequate is not False
    stance = (
        "no claims of the calc were given to compare"
        if not claims_given
        else "the calc does not check it"
        if claim is None
        else "the calc calls it adequate"
        if claim.adequate is not False
        else "the calc also finds it inadequate"
    )
    text = wording.failing(
        _name(result.check, review), where, g.qf, g.qr, g.utilisation, g.combination, stance, remedy, d
    )
    return Finding(
        "failing", "safety" if said_ok else "revise", text, hint=remedy, numbers={"qf": g.qf, "qr": g.qr}, **common
    )


def _missing(result: CheckResult, review: Review, where: str, d: Display, common: dict[str, Any]) -> Finding:
    check, g = result.check, result.governing
    text = wording.missing(_name(check, review), where, check.why, g.qf, g.qr, g.combination, d)
    return Finding("missing", KINDS["missing"].severity, text, numbers={"qf": g.qf, "qr": g.qr}, **common)


def _comparisons(result: CheckResult, claim: Claim, review: Review) -> tuple[Comparison | None, Comparison | None]:
    """The claim's Qf and Qr against the recomputed ones; a load slip found in Qf carries into the diagnosis of Qr
    (the calc's loads set its duration factor), and the claim's factors choose among the slips."""
    g = result.governing
    qf_cmp = None
    if claim.qf is not None:
        qf_cmp = _compare("Qf", claim.qf, g.qf, lambda: qf_slips(result, review), review)
    claimed_qr = claim.claimed_qr
    if claimed_qr is None:
        return qf_cmp, None
    load = next((s for s in qf_cmp.slips if s.load is not None), None) if qf_cmp is not None else None
    qr_cmp = _compare(
        "Qr",
        claimed_qr,
        g.qr,
        lambda: qr_slips_with_load(result, review, load),
        review,
        claimed_factors(claim, review),
        recomputed_factors(result, review),
    )
    return qf_cmp, qr_cmp


def _ratio_only(
    result: CheckResult, claimed: float, review: Review, where: str, d: Display, common: dict[str, Any]
) -> list[Finding]:
    """A claim that states only Qf/Qr confirms nothing unless that ratio agrees."""
    g = result.governing
    cmp = _compare_utilisation(claimed, g.utilisation, review)
    if cmp.within:
        return []
    text = wording.ratio_only(
        _name(result.check, review), where, claimed, g.utilisation, cmp.direction, g.qf, g.qr, g.combination, d
    )
    severity = "revise" if cmp.direction == "unconservative" else "clarify"
    numbers = {"claimed": claimed, "recomputed": g.utilisation}
    return [Finding("resistance-differs", severity, text, numbers=numbers, quantity="Qf/Qr", **common)]


def _differences(
    result: CheckResult,
    comparisons: tuple[Comparison | None, Comparison | None],
    diffs: tuple[FactorDifference, ...],
    review: Review,
    where: str,
    d: Display,
    common: dict[str, Any],
) -> list[Finding]:
    """A finding for Qf and for Qr where each differs beyond tolerance; Qr's names the factors that differ."""
    out = []
    for cmp, kind in zip(comparisons, ("mis-loaded", "resistance-differs"), strict=True):
        if cmp is None or cmp.within:
            continue
        severity = "revise" if cmp.direction == "unconservative" else "clarify"
        factors = diffs if kind == "resistance-differs" else ()
        text = _difference_message(cmp, _name(result.check, review), where, factors, d, review.standard.symbols)
        numbers = {"claimed": cmp.claimed, "recomputed": cmp.recomputed}
        out.append(Finding(kind, severity, text, numbers=numbers, quantity=cmp.quantity, **common))
    return out


def _difference_message(
    cmp: Comparison, name: str, where: str, diffs, d: Display, symbols: dict[str, Symbol] | None = None
) -> str:
    stresses = {s for s, sym in (symbols or {}).items() if sym.dimension == "stress"}
    notes = [
        f"{x.name} claimed {_fmt_factor(x.name, x.claimed, stresses)}, "
        f"recomputed {_fmt_factor(x.name, x.recomputed, stresses)}"
        for x in diffs
    ]
    return wording.differs(
        name,
        where,
        cmp.quantity,
        cmp.claimed,
        cmp.recomputed,
        cmp.relative,
        cmp.direction,
        notes,
        [s.text for s in cmp.slips],
        d,
    )


def _fmt_factor(name: str, value: float, stresses: set[str] | frozenset[str] = frozenset({"fcp"})) -> str:
    if name == "Ab":
        return f"{value * 1e6:,.0f} mm²"
    if name in ("length", "width"):
        return f"{value * 1000:.0f} mm"
    if name in stresses:
        return f"{value / 1e6:.2f} MPa"
    return f"{value:.3f}"
