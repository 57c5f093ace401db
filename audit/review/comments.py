"""Review comments: what a reviewer sends back, one per check with every point on it, alike ones grouped.

A comment is built from the findings (data: kind, weight, place, numbers); its title comes from
the finding kind's own wording in ``findings.py``, so the memo, the comment logs and the
terminal say the same thing. Comments are numbered in a fixed order (weight, then place), so the
same inputs give the same numbers on every run.
"""

from __future__ import annotations

from collections import defaultdict
from dataclasses import dataclass, replace

from audit.core.natural import natural_key
from audit.core.units import Display
from audit.inputs.read_claims import Claim
from audit.review.findings import KINDS, Finding, severity_rank
from audit.review.reconcile import Reconciliation
from audit.review.review import Review
from audit.standards.checks import NEAR, RequiredCheck

# Kinds whose comments are grouped when alike: the rest stand alone, one comment each.
GROUPED = {"missing", "covered", "confirmed", "mis-loaded", "resistance-differs", "calc-force", "force-differs"}
QUIET = {"covered", "confirmed", "calc-force"}  # listed for the record, after every comment that asks for something


@dataclass(frozen=True)
class Compared:
    quantity: str  # Qf | Qr | Qf/Qr
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

    @property
    def code(self) -> str:
        return KINDS[self.kind].code

    @property
    def weight_word(self) -> str:
        return WEIGHT_WORDS[self.weight]

    @property
    def quiet(self) -> bool:
        return self.kind in QUIET


WEIGHT_WORDS = {"critical": "safety", "major": "revise", "minor": "clarify", "info": "record"}


def what_check(check: RequiredCheck) -> str:
    """The check in the words a reviewer uses."""
    if check.kind == NEAR:
        return f"near-support check of {check.member} over {check.other_member}"
    if check.face == "bottom":
        return f"reverse-direction check of {check.member} on {check.other_member}"
    return f"check of {check.member} under {check.other_member}"


def _group_words(checks: list[RequiredCheck]) -> str:
    first = checks[0]
    if len(checks) == 1:
        return what_check(first)
    if first.kind == NEAR:
        return f"near-support checks of {first.member} over {_names(c.other_member for c in checks)}"
    if first.face == "bottom":
        return f"reverse-direction checks of {_names(c.member for c in checks)} on {first.other_member}"
    return f"checks of {first.member} under {_names(c.other_member for c in checks)}"


def _names(items) -> str:
    names = list(dict.fromkeys(items))
    return ", ".join(names[:-1]) + (" and " if len(names) > 1 else "") + names[-1]


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
    return Place(
        check_id=lead.check_id,
        bearing=lead.bearing,
        calc_label=_calc_label(review, lead.bearing),
        member=lead.member,
        claim_id=claim_id,
        page=next((f.page for f in findings if f.page), ""),
        compared=tuple(sorted(compared, key=lambda c: ("Qf", "Qr", "Qf/Qr").index(c.quantity))),
        points=tuple(f.message for f in sorted(findings, key=lambda f: severity_rank(f.severity))),
    )


def _title(kind: str, what: str, places: list[Place]) -> str:
    text = KINDS[kind].title.format(what=what)
    if len(places) == 1:
        return f"{_where(places[0])} \u2014 {text}"
    spots = ", ".join(_where(p) for p in places)
    return f"{text[:1].upper()}{text[1:]} ({len(places)} places: {spots})"


def build_comments(review: Review, rec: Reconciliation | None, claims: tuple[Claim, ...] = ()) -> tuple[Comment, ...]:
    """Every comment of the review, numbered; alike check comments grouped."""
    labels = {c.id: c.label for c in claims}
    units = {c.id: c.unit for c in claims if c.unit}
    findings = rec.findings if rec is not None else review.engine_findings
    by_check: dict[str, list[Finding]] = defaultdict(list)
    loose: list[Finding] = []
    for f in findings:
        (by_check[f.check_id] if f.check_id else loose).append(f)
    checks = {r.check.id: r.check for r in review.results}
    groups: dict[tuple, list[tuple[RequiredCheck, list[Finding]]]] = defaultdict(list)
    for check_id, fs in by_check.items():
        check = checks[check_id]
        lead = min(fs, key=lambda f: severity_rank(f.severity))
        kinds = tuple(sorted({f.kind for f in fs}))
        anchor = check.member if check.kind == NEAR or check.face == "top" else check.other_member
        key: tuple = (lead.kind, lead.severity, kinds, check.kind, check.face, anchor)
        if lead.kind not in GROUPED:
            key += (check_id,)
        groups[key].append((check, fs))
    drafts: list[tuple[tuple, Comment]] = []
    for key, members in groups.items():
        members.sort(key=lambda m: natural_key(m[0].id))  # stud2 before stud10
        lead_kind, weight = key[0], key[1]
        places = [_place(fs, review, units) for _, fs in members]
        what = _group_words([c for c, _ in members])
        what = what[:1].upper() + what[1:]
        clause = next((f.clause for _, fs in members for f in fs if f.clause), "")
        comment = Comment(0, lead_kind, weight, _title(lead_kind, what, places), tuple(places), clause)
        drafts.append(((lead_kind in QUIET, severity_rank(weight), lead_kind, natural_key(members[0][0].id)), comment))
    for f in loose:
        place = _place([f], review, units)
        if f.claim_id:
            place = replace(place, calc_label=labels.get(f.claim_id, f.claim_id))
            head = KINDS[f.kind].title.format(what=f"the calc's check '{place.calc_label}' ({f.page or f.claim_id})")
        else:
            head = f"{_where(place)} \u2014 " + KINDS[f.kind].title.format(what=f.member or f.bearing)
        drafts.append(
            (
                (f.kind in QUIET, severity_rank(f.severity), f.kind, natural_key(f.bearing or f.claim_id)),
                Comment(0, f.kind, f.severity, head, (place,), f.clause),
            )
        )
    drafts.sort(key=lambda d: d[0])
    return tuple(Comment(i, c.kind, c.weight, c.title, c.places, c.clause) for i, (_, c) in enumerate(drafts, start=1))
