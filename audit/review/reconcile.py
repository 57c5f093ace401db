"""Stage 6: reconcile the calc's claims with the recomputed checks.

Every required check gets exactly one outcome and every claim exactly one outcome. Numbers
that differ are diagnosed: each common slip is recomputed in turn, and the ones that
reproduce the claimed number are named. Failing checks get the smallest bearing length that
would make them pass.
"""

from __future__ import annotations

import difflib
import fnmatch
import itertools
import math
import re
from dataclasses import dataclass, field, replace
from functools import cached_property
from typing import Any

from audit.core.units import Display
from audit.engine.beam_statics import simple_span_reactions
from audit.engine.model import normalise_label
from audit.engine.take_down import FORCE_RESOLUTION
from audit.inputs.read_claims import Claim
from audit.review import wording
from audit.review.findings import KINDS, Finding, severity_rank
from audit.review.remedies import recheck, remedy_text
from audit.review.review import Review
from audit.standards.checks import LOCAL, NEAR, RequiredCheck
from audit.standards.resistance import (
    DURATION,
    LENGTH,
    CheckResult,
    LoadCombination,
    Symbol,
    factored_force,
    placed_forces,
    resistance,
)

FACTOR_REL_TOL = 0.01


@dataclass(frozen=True, slots=True)
class Tolerance:
    """How far a claimed number may lie from the recomputed one and still agree: the larger of an absolute and a
    relative slack on the recomputed number. The reconciler's one tolerance rule: forces take the project's,
    Qf/Qr its printed two decimals or the project's share, factors a hundredth of their value."""

    absolute: float
    relative: float

    def slack(self, recomputed: float) -> float:
        return max(self.absolute, self.relative * abs(recomputed))

    def agrees(self, claimed: float, recomputed: float) -> bool:
        return abs(claimed - recomputed) <= self.slack(recomputed)


FACTOR_TOLERANCE = Tolerance(0.0, FACTOR_REL_TOL)


@dataclass(frozen=True)
class LoadSource:
    """The loads a calc may have used at a check: per case, its patterned cases (none: every span loaded) and the
    factors it applied to them (None: the combination's own)."""

    forces: dict[str, float]
    envelope: dict[str, Any] = field(default_factory=dict)
    unfactored: bool = False
    combination: str = ""  # the combination the calc took them in, where it is another check's governing one


@dataclass(frozen=True)
class Slip:
    name: str
    text: str
    value: float  # the number this slip gives (N)
    implies: dict[str, float] = field(default_factory=dict, compare=False)  # factor values the slip would print
    parts: int = 1  # how many slips together give the number
    load: LoadSource | None = field(default=None, compare=False)  # a load slip: the loads the calc then used


COUNT_WORDS = {2: "two", 3: "three", 4: "four"}
EXACT_REL_TOL = 0.002  # a reproduction to within rounding of a number printed to three or four figures


def agrees_with_factors(slip: Slip, claimed: dict[str, float], recomputed: dict[str, float]) -> bool:
    """Does the slip print the claim's own factors? Each factor the claim states must be the slip's value of it:
    the one the slip changes, else the recomputed one (a factor that differs and the slip leaves alone rules
    the slip out, as does one the slip changes that the claim states otherwise)."""
    for name, value in claimed.items():
        ours = slip.implies.get(name, recomputed.get(name))
        if ours is None:
            continue
        if not FACTOR_TOLERANCE.agrees(value, ours):
            return False
    return True


def choose_slips(
    slips: list[Slip], claimed_value: float, factors: dict[str, float], recomputed: dict[str, float]
) -> tuple[Slip, ...]:
    """Of the slips (and pairs of slips) that reproduce a number, those whose factors agree with the claim's;
    an exact reproduction is preferred to one that only falls within the tolerance, then fewer slips to more."""
    fitting = [slip for slip in slips if agrees_with_factors(slip, factors, recomputed)]
    if not fitting:
        return ()

    def tier(slip: Slip) -> tuple[bool, int]:
        exact = Tolerance(0.0, EXACT_REL_TOL).agrees(slip.value, claimed_value)
        return (not exact, slip.parts)

    best = min(tier(slip) for slip in fitting)
    chosen = [slip for slip in fitting if tier(slip) == best]
    return tuple(dict.fromkeys(chosen))


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
        out = dict.fromkeys(KINDS, 0)
        for f in self.findings:
            out[f.kind] += 1
        return out


# ---------------------------------------------------------------- matching


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


# ---------------------------------------------------------------- comparing


def force_tolerance(review: Review) -> Tolerance:
    """The project's tolerance on a force (Qf, Qr)."""
    p = review.model.project
    return Tolerance(p.tolerance_absolute, p.tolerance_relative)


def _within(claimed: float, recomputed: float, review: Review) -> bool:
    return force_tolerance(review).agrees(claimed, recomputed)


UTILISATION_ABS_TOL = 0.01  # Qf/Qr as calcs print it, to two decimals
PRINTED_RATIO = Tolerance(UTILISATION_ABS_TOL, 0.0)


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


def _qf_under(source: LoadSource, combo: LoadCombination) -> tuple[float, str]:
    """Qf in a combination from the loads a calc used: its patterned cases placed worst, each case at the
    combination's factor (or at 1.0, unfactored); with how the patterned cases were placed."""
    placed, pattern = placed_forces(source.forces, source.envelope, combo)
    if source.unfactored:
        return math.fsum(placed.get(case, 0.0) for case in combo.factors), pattern
    return factored_force(placed, combo), pattern


def _load_sources(result: CheckResult, review: Review) -> list[tuple[str, str, LoadSource, dict[str, float], str]]:
    """The loads a calc may have put in this check: (slip name or "", what it did, the loads, the part of them that
    is distributed load within d, its words). The first is the engine's own."""
    check = result.check
    spread_words = ", ".join(f"{within * 1000:.0f} mm of {load}" for load, within in check.spread)
    out = [("", "", LoadSource(dict(check.forces), dict(check.envelope)), dict(check.spread_forces), spread_words)]
    partner_kind = LOCAL if check.kind == NEAR else NEAR
    partner = _partner(review, check, partner_kind)
    if partner is not None and check.kind == NEAR:
        out.append(
            (
                "whole-reaction-near-support",
                "the near-support check was loaded with the whole support reaction instead of only the loads within d",
                LoadSource(
                    dict(partner.check.forces), dict(partner.check.envelope), combination=partner.governing.combination
                ),
                {},
                "",
            )
        )
    if partner is not None and check.kind == LOCAL:
        near = partner.check
        out.append(
            (
                "nearby-load-only-local",
                "the local support check was loaded with only the load within d instead of the whole reaction",
                LoadSource(dict(near.forces), combination=partner.governing.combination),
                {},
                "",
            )
        )
        if near.spread_forces:
            points = {case: value - near.spread_forces.get(case, 0.0) for case, value in near.forces.items()}
            out.append(
                (
                    "nearby-load-only-local",
                    "the local support check was loaded with only the point loads within d instead of the whole "
                    "reaction",
                    LoadSource(points, combination=partner.governing.combination),
                    {},
                    "",
                )
            )
    simple = simple_span_forces(check, review)
    if simple is not None:
        out.append(
            (
                "simple-span-reactions",
                f"simple-span reactions used for {review.model.bearings_by_id[check.bearing].upper.member}, which is "
                "continuous over its supports (continuity ignored)",
                LoadSource(simple),
                {},
                "",
            )
        )
    return out


def qf_slips(result: CheckResult, review: Review) -> list[Slip]:
    """Each load slip, alone and together with the calc's usual readings: every span loaded (pattern loading
    ignored), only the bearings within d in Qf' (distributed load left out), and unfactored loads."""
    g = result.governing
    governing = review.combination(g.combination)
    if governing is None:  # no load reaches the check
        return []
    engine_qf = _qf_under(LoadSource(dict(result.check.forces), dict(result.check.envelope)), governing)[0]
    out: list[Slip] = []
    for name, text, source, spread, spread_words in _load_sources(result, review):
        combo = review.combination(source.combination) or governing
        patterned, pattern = _qf_under(source, combo)
        every_span = [False]
        if source.envelope and abs(_qf_under(replace(source, envelope={}), combo)[0] - patterned) > FORCE_RESOLUTION:
            every_span.append(True)
        bearings_only = [False, True] if any(abs(v) > FORCE_RESOLUTION for v in spread.values()) else [False]
        for loaded, points, unfactored in itertools.product(every_span, bearings_only, (False, True)):
            names, texts = ([name], [text]) if name else ([], [])
            forces, envelope = source.forces, {} if loaded else source.envelope
            if loaded:
                names.append("pattern-loading-ignored")
                texts.append(
                    f"every span loaded only: pattern loading ignored (the worst here is {pattern or g.pattern})"
                )
            if points:
                forces = {case: value - spread.get(case, 0.0) for case, value in forces.items()}
                envelope = {  # a patterned case is placed from its envelope: leave the spread part out there too
                    case: replace(env, high=env.high - spread.get(case, 0.0), low=env.low - spread.get(case, 0.0))
                    for case, env in envelope.items()
                }
                names.append("distributed-load-left-out")
                texts.append(f"the part of the distributed load within d was left out of Qf' ({spread_words})")
            if unfactored:
                names.append("unfactored-loads")
                texts.append("specified (unfactored) loads were used as Qf")
            if not names:
                continue  # the engine's own reading
            load = LoadSource(forces, envelope, unfactored, source.combination)
            value = _qf_under(load, combo)[0]
            if len(names) > 1 and abs(value - engine_qf) <= FORCE_RESOLUTION:
                continue  # slips that cancel out are no cause
            together = f"{COUNT_WORDS[len(names)]} slips together: " if len(names) > 1 else ""
            out.append(Slip("+".join(names), together + "; and ".join(texts), value, parts=len(names), load=load))
    return out


def simple_span_forces(check: RequiredCheck, review: Review) -> dict[str, float] | None:
    """The force per case at a support of a member on three or more supports, as if each span were simple."""
    bearing = review.model.bearings_by_id.get(check.bearing)
    if check.kind != LOCAL or bearing is None:  # a point load's own check has no supports of its own
        return None
    upper = review.model.members[bearing.upper.member]
    supports = review.supports_of.get(upper.id, [])
    if upper.vertical or len(supports) < 3:
        return None
    positions = sorted(b.upper.at or 0.0 for b in supports)
    index = positions.index(bearing.upper.at or 0.0)
    out: dict[str, float] = {}
    for item in review.flow.on_top.get(upper.id, ()):
        for case, value in item.forces.items():
            points = [(item.at, value)] if item.kind == "point" and item.at is not None else []
            uniforms = (
                [(item.start, item.end, value)]
                if item.kind == "uniform" and item.start is not None and item.end is not None
                else []
            )
            share = simple_span_reactions(positions, points, uniforms)[index]
            out[case] = out.get(case, 0.0) + share
    return out


def _partner(review: Review, check: RequiredCheck, kind: str) -> CheckResult | None:
    return review.result_at(check.bearing, check.member, kind)


def _standard_slips(result: CheckResult, review: Review, kd: float) -> list[Slip]:
    """A standard's own resistance slips, each recomputed with the inputs it changes, at the duration factor ``kd``."""
    inputs = result.inputs
    out = []
    for slip in review.standard.resistance_variants(result, review.model, review.pack, kd):
        used = kd if slip.duration is None else slip.duration
        changed = slip.inputs(inputs)
        implied = {**review.standard.claim_values(changed, used), "Ab": changed.area, **slip.implies}
        out.append(Slip(slip.name, slip.text, resistance(changed, used), implied))
    return out


def qr_slips(result: CheckResult, review: Review, kd: float | None = None) -> list[Slip]:
    """Each resistance slip the standard knows, recomputed; ``kd``: the duration factor of the loads the calc used (a
    load slip found in its Qf carries into KD), else the recomputed one."""
    return _standard_slips(result, review, result.governing.kd if kd is None else kd)


def recomputed_factors(result: CheckResult, review: Review) -> dict[str, float]:
    """The recomputed value of each factor a claim may state, in the standard's own symbols (KB, Cb, kc,90; KD,
    kmod; fcp, Fc-perp, fc,90,d), and of the contact (Ab, length, width)."""
    out = review.standard.claim_values(result.inputs, result.governing.kd)
    out["Ab"] = result.inputs.area
    out["length"] = result.check.contact.length
    out["width"] = result.check.contact.width
    return out


# The extractor names a calc sheet's factor columns by role, in O86's words (``pdf/columns.FACTOR_FIELDS``): its
# length and duration factor columns are the standard's own symbol of that role.
EXTRACTED_ROLES = {"KB": LENGTH, "KD": DURATION}


def claimed_factors(claim: Claim, review: Review) -> dict[str, float]:
    """The claim's factors by the standard's symbols: a factor column read from a PDF under another standard's
    word for its role (KB for NDS's Cb) is taken as that standard's symbol of the role."""
    symbols = review.standard.symbols
    out: dict[str, float] = {}
    for name, value in claim.factors.items():
        if name not in symbols and name in EXTRACTED_ROLES:
            name = next((s for s, sym in symbols.items() if sym.role == EXTRACTED_ROLES[name]), name)
        out[name] = value
    return out


def qr_slips_with_load(result: CheckResult, review: Review, load: Slip | None) -> list[Slip]:
    """The resistance slips, diagnosed with the calc's own loads where a load slip reproduces its Qf: those loads
    set the duration factor (O86's long-term KD, EC5's kmod of the actions present), so the calc's Qr is sought at
    that factor, alone and with each resistance slip."""
    if load is None or load.load is None:
        return qr_slips(result, review)
    g = result.governing
    source = load.load
    rerun = recheck(review, replace(result.check, forces=source.forces, envelope=source.envelope))
    taken = source.combination or g.combination
    kd = next((c.kd for c in rerun.combinations if c.combination == taken), g.kd)
    if abs(kd - g.kd) <= 1e-9:
        return qr_slips(result, review)
    own = Slip(
        "duration-of-calc-loads",
        f"the calc's loads ({load.text}) give a duration factor of {kd:.2f} where the recomputed loads give {g.kd:.2f}",
        resistance(result.inputs, kd),
        review.standard.claim_values(result.inputs, kd),
    )
    carried = [
        replace(s, text=f"{s.text} (at the duration factor {kd:.2f} of the calc's loads)")
        for s in qr_slips(result, review, kd)
    ]
    return [own, *carried]


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
    check, g = result.check, result.governing
    clause = review.pack.clause_for(review.model.material_of(check.member).family, check.kind)
    where = _location(result, review)
    page = claim.where.cite() if claim else ""
    common: dict[str, Any] = {
        "check_id": check.id,
        "bearing": check.bearing,
        "member": check.member,
        "clause": clause,
        "page": page,
        "claim_id": claim.id if claim else "",
    }
    findings: list[Finding] = []
    remedy = ""
    d = display_for(review, claim)
    if not result.passes:
        remedy = remedy_text(result, review)
        said_ok = claim is None or claim.adequate is not False
        severity = "safety" if said_ok else "revise"
        stance = (
            "no claims of the calc were given to compare"
            if not claims_given
            else "the calc does not check it"
            if claim is None
            else "the calc calls it adequate"
            if claim.adequate is not False
            else "the calc also finds it inadequate"
        )
        findings.append(
            Finding(
                "failing",
                severity,
                wording.failing(
                    _name(check, review), where, g.qf, g.qr, g.utilisation, g.combination, stance, remedy, d
                ),
                hint=remedy,
                numbers={"qf": g.qf, "qr": g.qr},
                **common,
            )
        )
    if claim is None:
        findings.append(
            Finding(
                "missing",
                KINDS["missing"].severity,
                wording.missing(_name(check, review), where, check.why, g.qf, g.qr, g.combination, d),
                numbers={"qf": g.qf, "qr": g.qr},
                **common,
            )
        )
        status = "failing" if not result.passes else "missing"
        return CheckOutcome(check.id, "", status, tuple(findings), remedy=remedy)

    qf_cmp = None
    if claim.qf is not None:
        qf_cmp = _compare("Qf", claim.qf, g.qf, lambda: qf_slips(result, review), review)
    claimed_qr = claim.claimed_qr
    qr_cmp = None
    if claimed_qr is not None:
        ours = recomputed_factors(result, review)
        load = next((s for s in qf_cmp.slips if s.load is not None), None) if qf_cmp is not None else None
        qr_cmp = _compare(
            "Qr",
            claimed_qr,
            g.qr,
            lambda: qr_slips_with_load(result, review, load),
            review,
            claimed_factors(claim, review),
            ours,
        )
    if qf_cmp is None and qr_cmp is None and claim.utilisation is not None:
        # a claim that states only Qf/Qr confirms nothing unless that ratio agrees
        util_cmp = _compare_utilisation(claim.utilisation, g.utilisation, review)
        if not util_cmp.within:
            findings.append(
                Finding(
                    "resistance-differs",
                    "revise" if util_cmp.direction == "unconservative" else "clarify",
                    wording.ratio_only(
                        _name(check, review),
                        where,
                        claim.utilisation,
                        g.utilisation,
                        util_cmp.direction,
                        g.qf,
                        g.qr,
                        g.combination,
                        d,
                    ),
                    numbers={"claimed": claim.utilisation, "recomputed": g.utilisation},
                    quantity="Qf/Qr",
                    **common,
                )
            )
    diffs = factor_differences(claim, result, review)
    for cmp, kind in ((qf_cmp, "mis-loaded"), (qr_cmp, "resistance-differs")):
        if cmp is None or cmp.within:
            continue
        severity = "revise" if cmp.direction == "unconservative" else "clarify"
        findings.append(
            Finding(
                kind,
                severity,
                _difference_message(
                    cmp,
                    _name(check, review),
                    where,
                    diffs if kind == "resistance-differs" else (),
                    d,
                    review.standard.symbols,
                ),
                numbers={"claimed": cmp.claimed, "recomputed": cmp.recomputed},
                quantity=cmp.quantity,
                **common,
            )
        )
    status = (
        "failing"
        if not result.passes
        else next((f.kind for f in findings if f.kind in ("mis-loaded", "resistance-differs")), "confirmed")
    )
    if status == "confirmed":
        findings.append(
            Finding(
                "confirmed",
                "record",
                wording.confirmed(_name(check, review), where, g.qf, g.qr, d),
                **common,
            )
        )
    return CheckOutcome(check.id, claim.id, status, tuple(findings), qf_cmp, qr_cmp, diffs, remedy)


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
