"""Matching the calc's claims to the required checks: labels, aliases, typical claims, patterns and ranges."""

from __future__ import annotations

import difflib
import fnmatch
import re

from audit.engine.model import normalise_label
from audit.inputs.read_claims import Claim
from audit.review.review import Review
from audit.standards.checks import RequiredCheck


def label_index(review: Review) -> dict[str, str]:
    """Normalised calc label -> bearing id (bearing ids and their aliases), and a point load's id -> its own place
    (the id its crushing check stands at), as a calc labels the check under an equipment leg."""
    index: dict[str, str] = {}
    for b in review.model.bearings:
        index.setdefault(normalise_label(b.id), b.id)
        for alias in b.aliases:
            index.setdefault(normalise_label(alias), b.id)
    for r in review.results:
        if r.check.load:
            index.setdefault(normalise_label(r.check.load), r.check.bearing)
    return index


TYPICAL_MARK = re.compile(r"[\s,;(\[-]*\b(typ\.?|typical)\b[)\].]*\s*$", re.IGNORECASE)


GLOB_CHARS = set("*?[")


RANGE = re.compile(r"\b([A-Za-z]+)(\d+)\s*(?:-|\u2013|\bto\b|\.\.)\s*(?:\1)?(\d+)\b")


MAX_RANGE = 200


def expand_range(label: str) -> list[str]:
    """'J1-J4 on B1' -> ['J1 on B1', ..., 'J4 on B1'] (also 'J1 to J4', 'J1..4'); [] when no range."""
    m = RANGE.search(label)
    if not m:
        return []
    first, last = int(m.group(2)), int(m.group(3))
    if not first < last or last - first > MAX_RANGE:
        return []
    return [label[: m.start()] + f"{m.group(1)}{n}" + label[m.end() :] for n in range(first, last + 1)]


def typical_index(review: Review) -> dict[str, list[str]]:
    """Normalised shared label -> the bearings that share it (bearing ``typical`` labels)."""
    out: dict[str, list[str]] = {}
    for b in review.model.bearings:
        for label in b.typical:
            out.setdefault(normalise_label(label), []).append(b.id)
    return out


def group_bearings(claim: Claim, review: Review, index: dict[str, str], shared: dict[str, list[str]]):
    """The bearings a typical claim covers, or None for a claim of one spot.

    A claim is typical when its location is a list of labels, a pattern of ids (``J*/GB1``), a
    label the model gives several bearings, or a label marked typical (``typ.``) that one of
    those maps. Returns (bearing ids, reason): an empty list with a reason when it cannot map.
    """
    if claim.labels:
        found, unknown = [], []
        for label in claim.labels:
            key = normalise_label(label)
            if key in index:
                found.append(index[key])
            elif key in shared:
                found += shared[key]
            else:
                unknown.append(label)
        if unknown:
            return [], f"no bearing is labelled {', '.join(repr(u) for u in unknown)}"
        return list(dict.fromkeys(found)), ""
    key = normalise_label(claim.label)
    if key in shared:
        return shared[key], ""
    if GLOB_CHARS & set(claim.label):
        pattern = normalise_label(claim.label)
        hits = [
            b.id
            for b in review.model.bearings
            if any(fnmatch.fnmatchcase(normalise_label(name), pattern) for name in (b.id, *b.aliases))
        ]
        hits += [  # point loads' own checks, by the load's id
            r.check.bearing
            for r in review.results
            if r.check.load and fnmatch.fnmatchcase(normalise_label(r.check.load), pattern)
        ]
        return (hits, "") if hits else ([], f"the pattern '{claim.label}' names no bearing")
    stripped = normalise_label(TYPICAL_MARK.sub("", claim.label))
    if stripped != key and stripped in shared:
        return shared[stripped], ""
    expanded = [normalise_label(x) for x in expand_range(TYPICAL_MARK.sub("", claim.label))]
    if expanded and key not in index and all(x in index for x in expanded):
        return list(dict.fromkeys(index[x] for x in expanded)), ""
    return None


def _role_checks(claim: Claim, bearings: list[str], review: Review, by_bearing) -> tuple[list[RequiredCheck], str]:
    """The checks of the claim's kind at each bearing of a group, the member taken in the same role at each."""
    role = ""
    if claim.member:
        for bid in bearings:
            b = review.model.bearings_by_id.get(bid)
            if b is not None and claim.member in (b.upper.member, b.lower.member):
                role = "upper" if claim.member == b.upper.member else "lower"
                break
        if not role and not any(c.member == claim.member for bid in bearings for c in by_bearing.get(bid, [])):
            return [], f"member '{claim.member}' is in none of the bearings it names"
    out = []
    for bid in bearings:
        b = review.model.bearings_by_id.get(bid)
        here = [c for c in by_bearing.get(bid, []) if c.kind == claim.kind]
        if claim.member and b is None:  # a point load's own check: the member under it
            here = [c for c in here if c.member == claim.member]
        elif role and b is not None:
            member = b.upper.member if role == "upper" else b.lower.member
            here = [c for c in here if c.member == member]
        if len(here) > 1:
            return [], f"bearing {bid} has checks of {', '.join(c.member for c in here)}; say which member"
        out += here
    return out, ""


def match_claims(
    review: Review, claims: tuple[Claim, ...]
) -> tuple[dict[str, Claim], list[tuple[Claim, str, tuple[str, ...]]], dict[str, Claim]]:
    """(check id -> claim, [(unmatched claim, reason, candidate check ids)], check id -> typical claim covering it).

    A typical claim is matched to the governing check of its group (the highest Qf/Qr) and
    covers the others; a check another claim names is left to that claim.
    """
    index = label_index(review)
    shared = typical_index(review)
    by_bearing: dict[str, list[RequiredCheck]] = {}
    check_ids = {r.check.id for r in review.results}
    for r in review.results:
        by_bearing.setdefault(r.check.bearing, []).append(r.check)
    matched: dict[str, Claim] = {}
    covered: dict[str, Claim] = {}
    unmatched: list[tuple[Claim, str, tuple[str, ...]]] = []
    groups: list[tuple[Claim, list[RequiredCheck]]] = []
    for claim in claims:
        group = None if claim.label in check_ids else group_bearings(claim, review, index, shared)
        if group is not None:
            bearings, reason = group
            checks, why = _role_checks(claim, bearings, review, by_bearing) if bearings else ([], reason)
            if not checks:
                near = tuple(c.id for bid in bearings for c in by_bearing.get(bid, []))[:6]
                unmatched.append((claim, why or f"its bearings have no {claim.kind} check", near))
                continue
            groups.append((claim, checks))
            continue
        key = normalise_label(claim.label)
        if claim.label in check_ids:
            named = review.result(claim.label).check
            contradiction = _contradiction(claim, named)
            if contradiction:
                unmatched.append(
                    (claim, f"the label names check {named.id}, but the claim {contradiction}", (named.id,))
                )
                continue
            candidates = [named]
        elif key in index:
            at_bearing = by_bearing.get(index[key], [])
            candidates = [c for c in at_bearing if c.kind == claim.kind]
            if claim.member:
                candidates = [c for c in candidates if c.member == claim.member]
            if not candidates:
                near = tuple(c.id for c in at_bearing)
                what = f"{claim.kind} check of {claim.member or 'any member'}"
                unmatched.append((claim, f"bearing {index[key]} has no {what}", near))
                continue
        else:
            nearest = _nearest(review, claim.label, claim.member)
            unmatched.append((claim, f"no bearing is labelled '{claim.label}'", nearest))
            continue
        if len(candidates) > 1:
            unmatched.append(
                (claim, "the label fits several checks; say which member", tuple(c.id for c in candidates))
            )
            continue
        check = candidates[0]
        if check.id in matched:
            unmatched.append((claim, f"claim {matched[check.id].id} already covers check {check.id}", (check.id,)))
            continue
        matched[check.id] = claim
    for claim, checks in groups:  # after the single claims: a check named on its own is its own claim's
        free = [c for c in checks if c.id not in matched and c.id not in covered]
        if not free:
            unmatched.append((claim, "every check it covers is claimed on its own", tuple(c.id for c in checks)))
            continue
        governing = max(free, key=lambda c: review.result(c.id).governing.utilisation)
        matched[governing.id] = claim
        for c in free:
            if c.id != governing.id:
                covered[c.id] = claim
    return matched, unmatched, covered


def _contradiction(claim: Claim, check: RequiredCheck) -> str:
    """What a claim says that the check its label names is not, or nothing."""
    said = []
    if claim.member and claim.member != check.member:
        said.append(f"says member {claim.member} (the check is of {check.member})")
    if claim.kind_stated and claim.kind != check.kind:
        said.append(f"says a {claim.kind} check (the check is {check.kind})")
    return " and ".join(said)


def _nearest(review: Review, label: str, member: str) -> tuple[str, ...]:
    """Checks at the bearings whose labels read most like the claim's, then checks of its member."""
    names: dict[str, str] = {}
    for b in review.model.bearings:
        for name in (b.id, *b.aliases):
            names.setdefault(normalise_label(name), b.id)
    close = difflib.get_close_matches(normalise_label(label), list(names), n=5, cutoff=0.4)
    bearings = list(dict.fromkeys(names[c] for c in close))[:3]
    out = [r.check.id for r in review.results if r.check.bearing in bearings]
    out += [r.check.id for r in review.results if member and r.check.member == member and r.check.id not in out]
    return tuple(out[:6])
