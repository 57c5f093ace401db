"""Review comments: what a reviewer sends back, one per problem, each naming its places, the worst first.

Comments are triaged by consequence (``build_comments``):

- a check that fails, or that is missing and recomputes at Qf/Qr of at least the project's
  ``own_comment_from`` (0.9 by default), gets a comment of its own; so does a check whose calc
  claim differs (a claim of one spot is one comment);
- a typical claim is one comment naming every place it does not hold (its governing check's
  differences and the places it does not cover), not one comment per place;
- missing checks that recompute comfortably are grouped by the kind of detail
  (``details.Detail``): one comment naming the count and the worst place, asking for one typical
  check there; every place is listed in the comment (and so in the appendix and the logs);
- notes without a check (uplift, a force the calc states) are grouped by member; confirmed and
  covered checks are listed for the record, alike ones together.

A comment's title comes from the finding kind's own wording in ``findings.py`` and the detail's
words, so the memo, the comment logs and the terminal say the same thing. Comments are numbered
in a fixed order (weight, then own comments before groups, the worst first, then place), so the
same inputs give the same numbers on every run.
"""

from __future__ import annotations

from collections import defaultdict
from dataclasses import dataclass, replace

from audit.core.natural import natural_key
from audit.core.units import Display
from audit.inputs.read_claims import Claim
from audit.review import wording
from audit.review.details import detail_of, member_roles
from audit.review.findings import KINDS, WEIGHTS, Finding, severity_rank
from audit.review.reconcile import Reconciliation, failing_without_claims
from audit.review.review import Review
from audit.standards.checks import NEAR, RequiredCheck

QUIET = {"covered", "confirmed", "calc-force"}  # listed for the record, after every comment that asks for something
BY_MEMBER = {"uplift", "force-differs", "calc-force"}  # notes without a check: one comment per member and kind
BY_MEMBER_FOR_RECORD = {"hanger-capacity", "hanger-side"}  # hangers and their side loads: one per carrier and weight


@dataclass(frozen=True)
class Compared:
    quantity: str  # Qf | Qr | Qf/Qr | capacity (a hanger's listed capacity)
    unit: str  # kN, or "" for a ratio
    claimed: float | None  # in ``unit``; None where the calc gives none
    recomputed: float | None


@dataclass(frozen=True)
class Place:
    """One spot a comment is about, with the number compared there."""

    check_id: str
    bearing: str
    calc_label: str  # the calc's own label for the spot (first alias), else ""
    member: str
    claim_id: str
    page: str
    compared: tuple[Compared, ...]  # each number compared (or recomputed, where the calc has none)
    points: tuple[str, ...]  # every finding message at this spot


@dataclass(frozen=True)
class Comment:
    number: int
    kind: str  # the leading finding's kind
    weight: str  # the leading finding's severity
    title: str  # calc's label first, then what is wrong
    places: tuple[Place, ...]
    clause: str
    ask: str = ""  # what the reviewer asks for, where the title alone does not say it
    closed: bool = False  # closed by an accepted response: kept for the record

    @property
    def code(self) -> str:
        """The kind's name (one word per idea: there is no second code)."""
        return self.kind

    @property
    def weight_word(self) -> str:
        return self.weight

    @property
    def quiet(self) -> bool:
        return self.kind in QUIET or self.weight == "record" or self.closed  # record: asks for nothing


WEIGHT_WORDS = {w: w for w in WEIGHTS}  # a weight is shown as it is named


def what_check(check: RequiredCheck, review: Review) -> str:
    """The check in the words a reviewer uses (``wording.check_name``)."""
    return wording.check_name(check, review.model.members.get(check.other_member))


def _group_words(checks: list[RequiredCheck], review: Review) -> str:
    return wording.group_name(checks, review.model.members.get(checks[0].other_member))


def _calc_label(review: Review, bearing_id: str) -> str:
    bearing = review.model.bearings_by_id.get(bearing_id)
    return bearing.aliases[0] if bearing is not None and bearing.aliases else ""


def _where(place: Place) -> str:
    return f"{place.calc_label} ({place.bearing})" if place.calc_label else place.bearing


def _place(findings: list[Finding], review: Review, units: dict[str, str] | None = None) -> Place:
    """One spot; forces in the unit of the claim there (``units``: claim id -> unit), else the project's."""
    lead = min(findings, key=lambda f: severity_rank(f.severity))
    claim_id = next((f.claim_id for f in findings if f.claim_id), "")
    unit = (units or {}).get(claim_id) or review.display.force_unit
    d = Display(unit)
    compared = []
    for f in findings:
        if "claimed" in f.numbers and f.quantity:
            if f.quantity == "Qf/Qr":
                compared.append(Compared(f.quantity, "", f.numbers["claimed"], f.numbers["recomputed"]))
            else:
                compared.append(
                    Compared(f.quantity, unit, d.value(f.numbers["claimed"]), d.value(f.numbers["recomputed"]))
                )
    if not compared and "qf" in lead.numbers and lead.check_id:
        compared.append(Compared("Qf", unit, None, d.value(lead.numbers["qf"])))
        if "qr" in lead.numbers:
            compared.append(Compared("Qr", unit, None, d.value(lead.numbers["qr"])))
    elif not compared and "capacity" in lead.numbers:  # a hanger: its reaction against the firm's listed capacity
        compared.append(Compared("Qf", unit, None, d.value(lead.numbers["qf"])))
        compared.append(Compared("capacity", unit, None, d.value(lead.numbers["capacity"])))
    return Place(
        check_id=lead.check_id,
        bearing=lead.bearing,
        calc_label=_calc_label(review, lead.bearing),
        member=lead.member,
        claim_id=claim_id,
        page=next((f.page for f in findings if f.page), ""),
        compared=tuple(sorted(compared, key=lambda c: ("Qf", "Qr", "Qf/Qr", "capacity").index(c.quantity))),
        points=tuple(f.message for f in sorted(findings, key=lambda f: severity_rank(f.severity))),
    )


def _title(kind: str, what: str, places: list[Place]) -> str:
    text = KINDS[kind].title.format(what=what)
    if len(places) == 1:
        return f"{_where(places[0])} \u2014 {text}"
    spots = ", ".join(_where(p) for p in places)
    return f"{text[:1].upper()}{text[1:]} ({len(places)} places: {spots})"


def own_comment_threshold(review: Review) -> tuple[float, str]:
    """(Qf/Qr, whose, with its provenance) from which a missing check gets a comment of its own: the project's,
    else the rule pack's review.own_comment_from (bearing-audit's default where the pack states none)."""
    given = review.model.project.own_comment_from
    if given is not None:
        return given, "the project's own_comment_from"
    stated = review.pack.own_comment_from
    whose = f"review.own_comment_from of rule pack {review.pack.id}: {stated.source} ({stated.status})"
    return float(stated.value), whose


def _lead(fs: list[Finding]) -> Finding:
    return min(fs, key=lambda f: severity_rank(f.severity))


def _worst(checks: list[RequiredCheck], review: Review) -> RequiredCheck:
    """The check with the highest Qf/Qr (of equals, the first by id)."""
    return max(sorted(checks, key=lambda c: c.id), key=lambda c: review.result(c.id).governing.utilisation)


def _ratio(check: RequiredCheck, review: Review) -> float:
    return review.result(check.id).governing.utilisation


def build_comments(review: Review, rec: Reconciliation | None, claims: tuple[Claim, ...] = ()) -> tuple[Comment, ...]:
    """Every comment of the review, triaged by consequence and numbered (see the module's docstring)."""
    labels = {c.id: c.label for c in claims}
    claim_of = {c.id: c for c in claims}
    units = {c.id: c.unit for c in claims if c.unit}
    findings = rec.findings if rec is not None else review.engine_findings + failing_without_claims(review)
    by_check: dict[str, list[Finding]] = defaultdict(list)
    loose: list[Finding] = []
    for f in findings:
        (by_check[f.check_id] if f.check_id else loose).append(f)
    checks = {r.check.id: r.check for r in review.results}
    typical = _typical_claims(rec)
    threshold, _ = own_comment_threshold(review)
    roles = member_roles(review.model)
    groups: dict[tuple, list[tuple[RequiredCheck, list[Finding]]]] = defaultdict(list)
    for check_id, fs in by_check.items():
        groups[_group_key(checks[check_id], fs, review, typical, threshold, roles)].append((checks[check_id], fs))
    drafts: list[tuple[tuple, Comment]] = []
    for key, members in groups.items():
        members.sort(key=lambda m: natural_key(m[0].id))  # stud2 before stud10
        drafts.append(_draft(key, members, review, units, claim_of, roles))
    by_member: dict[tuple, list[Finding]] = defaultdict(list)
    for f in loose:
        per_member = f.kind in BY_MEMBER or f.kind in BY_MEMBER_FOR_RECORD
        alike = (f.kind, f.severity, f.member) if per_member else (f.kind, f.severity, f.bearing, f.claim_id)
        by_member[alike].append(f)
    for fs in by_member.values():
        drafts.append(_loose_draft(fs, review, units, labels))
    drafts.sort(key=lambda d: d[0])
    return tuple(replace(c, number=i) for i, (_, c) in enumerate(drafts, start=1))


def _typical_claims(rec: Reconciliation | None) -> set[str]:
    """Claims that stand for more than one check (typical claims)."""
    if rec is None:
        return set()
    seen: dict[str, int] = defaultdict(int)
    for o in rec.checks:
        if o.claim_id:
            seen[o.claim_id] += 1
    return {claim for claim, n in seen.items() if n > 1}


def _group_key(check: RequiredCheck, fs: list[Finding], review, typical, threshold, roles) -> tuple:
    """Which comment a check's findings go to: ('own', id), ('claim', claim id), ('detail', ...) or ('alike', ...)."""
    lead = _lead(fs)
    kinds = {f.kind for f in fs}
    fails = not review.result(check.id).passes
    claim_id = next((f.claim_id for f in fs if f.claim_id), "")
    if fails:
        return ("own", lead.kind, lead.severity, check.id)
    if lead.kind in ("covered", "confirmed") and claim_id in typical:  # for the record: one typical claim's places
        return ("alike", "covered", lead.severity, claim_id)
    if lead.kind in QUIET:  # for the record: alike ones together, by member
        anchor = check.member if check.kind == NEAR or check.face == "top" else check.other_member
        return ("alike", lead.kind, lead.severity, tuple(sorted(kinds)), check.kind, check.face, anchor)
    if claim_id and claim_id in typical:
        return ("claim", claim_id)
    if lead.kind == "missing":
        if _ratio(check, review) >= threshold:
            return ("own", lead.kind, lead.severity, check.id)
        return ("detail", lead.severity, detail_of(check, review.model, roles))
    return ("own", lead.kind, lead.severity, check.id)


TIER = {"own": 0, "claim": 1, "loose": 1, "alike": 2, "detail": 2}


def _draft(key: tuple, members, review: Review, units, claim_of, roles) -> tuple[tuple, Comment]:
    tier = key[0]
    fs_all = [f for _, fs in members for f in fs]
    lead = _lead(fs_all)
    checks = [c for c, _ in members]
    worst = _worst(checks, review)
    places = [_place(fs, review, units) for _, fs in members]
    clause = next((f.clause for f in fs_all if f.clause), "")
    ask = ""
    if tier == "detail" and len(checks) > 1:
        where = _where(next(p for p in places if p.check_id == worst.id))
        title = (
            f"{key[2].words()}: missing from the calc at {len(checks)} places; the worst, {where}, recomputes at "
            f"Qf/Qr {_ratio(worst, review):.2f}"
        )
        ask = f"Provide one typical check of this detail at the worst place, {where}, or a check at each place."
    elif tier == "alike" and key[1] == "covered":
        claim = claim_of.get(key[3])
        said = f"'{claim.label}' ({claim.where.cite()})" if claim is not None else key[3]
        detail = detail_of(checks[0], review.model, roles).words().split(": ", 1)[1]
        agrees = [p for p, (_, fs) in zip(places, members, strict=True) if any(f.kind == "confirmed" for f in fs)]
        covered = [p for p in places if p not in agrees]
        parts = [f"agrees with the calc at its governing place, {_where(p)}" for p in agrees]
        if covered:
            n = len(covered)
            spots = ", ".join(_where(p) for p in covered)
            parts.append(f"covers {n} {'other ' if agrees else ''}place{'s' if n > 1 else ''}: {spots}")
        title = f"Typical claim {said}, {detail}: " + "; ".join(parts)
    elif tier == "claim":
        claim = claim_of.get(key[1])
        title, ask = _claim_title(key[1], claim, members, places, review, roles)
        places = [_as_claimed(p, claim) for p in places]
    else:
        what = _group_words(checks, review)
        what = what[:1].upper() + what[1:]
        if tier == "own" and not review.result(worst.id).passes and lead.kind != "failing":
            text = KINDS["failing"].title.format(what=what) + " (" + KINDS[lead.kind].title.format(what="it") + ")"
            title = f"{_where(places[0])} \u2014 {text}"
        else:
            title = _title(lead.kind, what, places)
        if lead.kind == "missing" and review.result(worst.id).passes:
            title += f" (recomputes at Qf/Qr {_ratio(worst, review):.2f})"
            ask = f"Provide the check at {_where(places[0])}."
    comment = Comment(0, lead.kind, lead.severity, title, tuple(places), clause, ask)
    order = (
        lead.kind in QUIET or lead.severity == "record",
        severity_rank(lead.severity),
        TIER[tier],
        -_ratio(worst, review),
        natural_key(checks[0].id),
    )
    return order, comment


def _as_claimed(place: Place, claim: Claim | None) -> Place:
    """A place a typical claim stands for, its numbers compared with the claim's own."""
    if claim is None:
        return place
    said = {"Qf": claim.qf, "Qr": claim.claimed_qr}
    compared = tuple(
        replace(n, claimed=Display(n.unit).value(said[n.quantity]))  # type: ignore[arg-type]
        if n.claimed is None and n.unit and said.get(n.quantity) is not None
        else n
        for n in place.compared
    )
    return replace(place, compared=compared)


def _claim_title(claim_id: str, claim: Claim | None, members, places, review: Review, roles) -> tuple[str, str]:
    """A typical claim that does not hold: one comment naming its places."""
    label = claim.label if claim is not None else claim_id
    cite = claim.where.cite() if claim is not None else claim_id
    checks = [c for c, _ in members]
    detail = detail_of(checks[0], review.model, roles).words().split(": ", 1)[1]
    parts = []
    differing = [(c, fs) for c, fs in members if any(f.kind in ("mis-loaded", "resistance-differs") for f in fs)]
    for _, fs in differing:
        kinds = sorted({f.kind for f in fs if f.kind in ("mis-loaded", "resistance-differs")})
        said = " and ".join("its load differs" if k == "mis-loaded" else "its resistance differs" for k in kinds)
        parts.append(f"at its governing place, {_where(_place(fs, review))}, {said}")
    gaps = [c for c, fs in members if any(f.kind == "not-covered" for f in fs)]
    if gaps:
        worst = _worst(gaps, review)
        parts.append(
            f"{len(gaps)} place{'s' if len(gaps) > 1 else ''} it stands for {'are' if len(gaps) > 1 else 'is'} worse "
            f"than the claim (the worst, {worst.bearing}, at Qf/Qr {_ratio(worst, review):.2f})"
        )
    title = f"Typical claim '{label}' ({cite}), {detail}: " + "; ".join(parts)
    worst_all = _worst(checks, review)
    ask = " ".join(f.message for _, fs in differing for f in fs if f.kind in ("mis-loaded", "resistance-differs"))
    ask += (" " if ask else "") + (
        f"Revise the typical check for the worst place it stands for, {worst_all.bearing}, or check the places it "
        "does not cover."
    )
    return title, ask


def _loose_draft(fs: list[Finding], review: Review, units, labels) -> tuple[tuple, Comment]:
    f = fs[0]
    places = [_place([x], review, units) for x in sorted(fs, key=lambda x: (x.bearing, x.claim_id))]
    if f.claim_id:
        place = replace(places[0], calc_label=labels.get(f.claim_id, f.claim_id))
        places = [place]
        head = KINDS[f.kind].title.format(what=f"the calc's check '{place.calc_label}' ({f.page or f.claim_id})")
    elif len(places) == 1:
        head = f"{_where(places[0])} \u2014 " + KINDS[f.kind].title.format(what=f.member or f.bearing)
    else:
        text = KINDS[f.kind].title.format(what=f.member or f.bearing)
        head = f"{text} ({len(places)} bearings: {', '.join(_where(p) for p in places)})"
    order = (
        f.kind in QUIET or f.severity == "record",
        severity_rank(f.severity),
        TIER["loose"],
        0.0,
        f.bearing or f.claim_id,
    )
    return order, Comment(0, f.kind, f.severity, head, tuple(places), f.clause)
