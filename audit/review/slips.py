"""The slips a calc may have made, each recomputed: in the loads (the engine's own placing of every case, the
whole reaction or the nearby load only, simple spans, pattern loading ignored, unfactored loads) and, through the
standard's interface, in the resistance; the ones whose factors agree with the claim's are chosen."""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass, field, replace
from typing import Any

from audit.engine.beam_statics import simple_span_reactions
from audit.engine.take_down import FORCE_RESOLUTION
from audit.inputs.pdf.columns import standard_symbol
from audit.inputs.read_claims import Claim
from audit.review.remedies import recheck
from audit.review.review import Review
from audit.review.tolerance import FACTOR_TOLERANCE, Tolerance
from audit.standards.checks import LOCAL, NEAR, RequiredCheck
from audit.standards.resistance import (
    CheckResult,
    LoadCombination,
    factored_force,
    placed_forces,
    resistance,
)


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


def claimed_factors(claim: Claim, review: Review) -> dict[str, float]:
    """The claim's factors by the standard's symbols: a factor column read from a PDF under another standard's
    word for its role (KB for NDS's Cb) is taken as that standard's symbol of the role."""
    symbols = review.standard.symbols
    return {standard_symbol(name, symbols): value for name, value in claim.factors.items()}


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
