"""Stage 2: take the loads down the framing.

Members are visited from the top of the support graph down. A horizontal member's support
reactions, per load case, come from its own loads and the loads of the members bearing on
it; a post passes what lands on its top to the bearing at its foot. Each reaction becomes
the force through that bearing, which loads the member below.
"""

from __future__ import annotations

import itertools
import math
from collections import defaultdict
from collections.abc import Iterable
from dataclasses import dataclass, field

from audit.engine.beam_statics import reactions
from audit.engine.model import Model, base_case

Forces = dict[str, float]  # load case (or factored group key) -> force, N, downward positive

# Float noise never decides: a reaction smaller than this share of the load case's own total
# on the member is rounding in the statics (a few 1e-13 of it), not a force, and is taken as
# zero, so the same building in SI or US units, or with every load doubled, gives the same
# cases at every bearing.
NOISE_SHARE = 1e-9
# Forces below a share of the load at the bearing are zero wherever a force is judged (a case being
# present, an uplift, a pattern differing from every span loaded): relative, so the same building with
# every load scaled, or in US units, lists the same cases, combinations and uplift (a case under a
# ten-thousandth of the bearing's load never governs: 1.4D outweighs any combination it leads).
FORCE_SHARE = 1e-4
# Absolute, for comparing a claim's numbers only (the diagnosis): a newton.
FORCE_RESOLUTION = 1.0  # N


def force_floor(sizes: Iterable[float]) -> float:
    """N: the force below which nothing is judged at a bearing, ``FORCE_SHARE`` of the load there (``sizes``:
    every case's force through it, and each patterned case's high and low)."""
    return FORCE_SHARE * math.fsum(abs(v) for v in sizes)


def sizes_at(forces: Forces, envelope: dict[str, Envelope] | None = None) -> list[float]:
    """The forces that make up the load at a bearing: each case's, and each patterned case's high and low."""
    return [*forces.values(), *(v for env in (envelope or {}).values() for v in (env.high, env.low))]


@dataclass(frozen=True)
class Envelope:
    """One load case at one bearing, as the worst pattern places it: the most and the least force through it.

    At a support of a member on three or more supports each span (and overhang) takes the case
    at its high or its low factor, whichever is worse at this support; reactions are linear in
    the loads, so the worst of every pattern is the sum of each span's worse share. A member
    below such a support carries the envelope on: each force from above enters at its high or
    its low value, whichever is worse at each of the lower member's supports (two supports of
    one beam on one lower member take both maxima, which do not occur together: conservative).
    """

    high: float  # N, the most downward force through the bearing
    low: float  # N, the least (most upward)
    high_spans: str  # the member's own spans giving ``high``, e.g. "spans 1 and 3" ("" when every span, or not own)
    low_spans: str
    high_from: tuple[str, ...] = ()  # patterns carried from above that give ``high``: "B1 at B1/P2" (member at support)
    low_from: tuple[str, ...] = ()
    own: bool = True  # the member's own spans are patterned at this support

    def placing(self, high: bool = True) -> str:
        """The pattern giving ``high`` (or ``low``): "on spans 1 and 3", "at the worst pattern of B at B/C1"."""
        parts = []
        if self.own:
            spans = self.high_spans if high else self.low_spans
            parts.append(f"on {spans or ('every span' if high else 'no span')}")
        carried = self.high_from if high else self.low_from
        if carried:
            more = [f"{len(carried) - MAX_NAMED} more"] if len(carried) > MAX_NAMED else []
            shown = [*carried[:MAX_NAMED], *more]
            parts.append(f"at the {'worst' if high else 'lowest'} pattern of " + " and of ".join(shown))
        return ", ".join(parts) or "on every span"

    def carried(self, member: str, bearing: str) -> Envelope:
        """The envelope as the member below receives it through ``bearing`` (of ``member``): named by where it arose."""
        here = (f"{member} at {bearing}",) if self.own else ()
        high_from = _union(self.high_from, here if self.high_spans else ())
        return Envelope(self.high, self.low, "", "", high_from, _union(self.low_from, here), own=False)


MAX_NAMED = 3  # patterns named in one placing, then "and N more"


def _union(*groups: tuple[str, ...]) -> tuple[str, ...]:
    return tuple(dict.fromkeys(name for group in groups for name in group))


@dataclass(frozen=True)
class AppliedForce:
    """Something pressing on a member's top face: a bearing from above or a load of its own."""

    source: str  # bearing id or load id
    from_bearing: bool
    kind: str  # point | uniform
    at: float | None  # m; None for posts
    start: float | None = None
    end: float | None = None
    forces: Forces = field(default_factory=dict)  # N (point) or N/m (uniform), per case
    envelope: dict[str, Envelope] = field(default_factory=dict)  # a bearing from above: its patterned cases, carried


@dataclass(frozen=True)
class TakeDown:
    order: tuple[str, ...]  # members from the top down
    bearing_forces: dict[str, Forces]  # bearing id -> force through it, per case, every span loaded
    on_top: dict[str, tuple[AppliedForce, ...]]  # member id -> what presses on its top face
    # bearing id -> case -> envelope: a continuous member's supports, and every bearing below them down the load path
    envelopes: dict[str, dict[str, Envelope]] = field(default_factory=dict)
    # bearings whose force the calc states: what the model's own loads give there, to compare
    modelled: dict[str, Forces] = field(default_factory=dict)


def support_order(model: Model) -> tuple[str, ...]:
    """Members ordered so that every member comes before the members it bears on."""
    below: dict[str, list[str]] = defaultdict(list)
    waiting: dict[str, int] = dict.fromkeys(model.members, 0)
    for b in model.bearings:
        below[b.upper.member].append(b.lower.member)
        waiting[b.lower.member] += 1
    ready = sorted(m for m, n in waiting.items() if n == 0)
    order: list[str] = []
    while ready:
        member = ready.pop()
        order.append(member)
        for lower in below[member]:
            waiting[lower] -= 1
            if waiting[lower] == 0:
                ready.append(lower)
    if len(order) != len(model.members):
        raise ValueError("support graph has a cycle")  # read_model refuses cycles first
    return tuple(order)


def take_down(model: Model, patterns: dict[str, tuple[float, float]] | None = None) -> TakeDown:
    """Forces through every bearing per load case; ``patterns``: case -> (low, high) span factors.

    Loads pass down with every span loaded (``bearing_forces``); the patterns give each support
    of a member on three or more supports its envelope, which that bearing's checks use, and the
    envelope passes down the load path: each member below takes the force from above at its
    worst placing, into its own reactions, its local checks and its near-support loads.
    A member marked not patterned (a plate on studs) takes its loads on every span.
    """
    patterns = patterns or {}
    order = support_order(model)
    supports_of: dict[str, list] = defaultdict(list)
    carried_by: dict[str, list] = defaultdict(list)
    for b in model.bearings:
        supports_of[b.upper.member].append(b)
        carried_by[b.lower.member].append(b)
    own_loads: dict[str, list] = defaultdict(list)
    for load in model.loads:
        own_loads[load.member].append(load)

    bearing_forces: dict[str, Forces] = {}
    on_top: dict[str, tuple[AppliedForce, ...]] = {}
    envelopes: dict[str, dict[str, Envelope]] = {}
    modelled: dict[str, Forces] = {}
    for member_id in order:
        member = model.members[member_id]
        applied = _applied_forces(member_id, carried_by[member_id], own_loads[member_id], bearing_forces, envelopes)
        on_top[member_id] = applied
        below = supports_of[member_id]
        if not below:
            continue  # continuously supported, or a post on a foundation outside the model
        if member.vertical:
            total: Forces = defaultdict(float)
            for item in applied:
                for case, value in item.forces.items():
                    total[case] += value
            bearing_forces[below[0].id] = dict(total)
            post_envelope = passed_through(applied)
            if post_envelope and not below[0].calc_force:
                envelopes[below[0].id] = post_envelope
            _take_calc_force(below[0], bearing_forces, modelled)
            continue
        below = sorted(below, key=lambda b: b.upper.at)
        positions = [b.upper.at for b in below]
        per_support = _reactions_by_case(positions, applied)
        for bearing, forces in zip(below, per_support, strict=True):
            bearing_forces[bearing.id] = forces
        own = patterns if len(below) >= 3 and member.patterned else {}
        if own or any(item.envelope for item in applied):
            for bearing, by_case in zip(below, _pattern_envelopes(positions, member.length, applied, own), strict=True):
                if by_case and not bearing.calc_force:
                    envelopes[bearing.id] = by_case
        for bearing in below:
            _take_calc_force(bearing, bearing_forces, modelled)
    return TakeDown(order, bearing_forces, on_top, envelopes, modelled)


def _take_calc_force(bearing, bearing_forces: dict[str, Forces], modelled: dict[str, Forces]) -> None:
    """A bearing whose force the calc states carries that force, not the model's; the model's is kept to compare."""
    if bearing.calc_force:
        modelled[bearing.id] = bearing_forces.get(bearing.id, {})
        bearing_forces[bearing.id] = dict(bearing.calc_force)


def span_pieces(positions: list[float], length: float) -> list[tuple[float, float, str]]:
    """The member cut at its supports: (start, end, name); overhangs only where they exist."""
    cuts = [0.0, *positions, length]
    out = []
    for i, (a, b) in enumerate(itertools.pairwise(cuts)):
        if b - a <= 1e-9:
            continue
        if i == 0:
            name = "the left overhang"
        elif i == len(cuts) - 2:
            name = "the right overhang"
        else:
            name = f"span {i}"
        out.append((a, b, name))
    return out


def _pattern_envelopes(
    positions: list[float], length: float, applied: tuple[AppliedForce, ...], patterns: dict[str, tuple[float, float]]
) -> list[dict[str, Envelope]]:
    """Each support's envelope per case: the member's own spans patterned (``patterns``, empty for none), and every
    force from above that carries an envelope taken at its high or low value, whichever is worse at that support.

    Within a piece the pattern factor f >= 0 is common to every load on it, so the worst of f times the worse
    placing of each load is max(f_high H, f_low H), H the sum of each load's worse share."""
    n = len(positions)
    out: list[dict[str, Envelope]] = [{} for _ in positions]
    own_cases = {c for item in applied for c in item.forces if base_case(c) in patterns}
    carried_cases = {c for item in applied for c in item.envelope}
    if not own_cases and not carried_cases:
        return out
    span_by_span = span_pieces(positions, length)
    whole = [(0.0, length, "")]  # a member not patterned itself: one piece, at factor 1
    owner_of = {True: piece_owners(applied, span_by_span), False: piece_owners(applied, whole)}
    unit: dict[float, list[float]] = {}  # point position -> reactions of a unit load there
    for case in sorted(own_cases | carried_cases):
        own = case in own_cases
        pieces = span_by_span if own else whole
        owner = owner_of[own]
        low_factor, high_factor = patterns[base_case(case)] if own else (1.0, 1.0)
        fixed = tuple(item for item in applied if case not in item.envelope)
        shares = case_shares(positions, fixed, case, pieces, owner)
        high_share = [list(share) for share in shares]
        low_share = [list(share) for share in shares]
        high_from: list[set[str]] = [set() for _ in positions]
        low_from: list[set[str]] = [set() for _ in positions]
        for item in applied:
            env = item.envelope.get(case)
            if env is None or item.at is None:
                continue
            if item.at not in unit:
                unit[item.at] = reactions(positions, [(item.at, 1.0)])
            k = owner[id(item)]
            every = item.forces.get(case, 0.0)
            for i, u in enumerate(unit[item.at]):
                least, most = sorted((u * env.low, u * env.high))
                high_share[k][i] += most
                low_share[k][i] += least
                high_used, low_used = (env.high, env.low) if u >= 0 else (env.low, env.high)
                floor = force_floor((u * env.high, u * env.low, u * every))
                if abs(u * (high_used - every)) > floor:
                    high_from[i].update(env.high_from if u >= 0 else env.low_from)
                if abs(u * (low_used - every)) > floor:
                    low_from[i].update(env.low_from if u >= 0 else env.high_from)
        total = sum(abs(r) for share in high_share + low_share for r in share) or 1.0
        loaded = {name for *_, name in pieces}
        for i in range(n):
            high = low = 0.0
            high_names: list[str] = []
            low_names: list[str] = []
            for (_, _, name), hi_share, lo_share in zip(pieces, high_share, low_share, strict=True):
                h, lo = hi_share[i], lo_share[i]
                if abs(h) > NOISE_SHARE * total:
                    high += max(high_factor * h, low_factor * h)
                    if h > 0:
                        high_names.append(name)
                if abs(lo) > NOISE_SHARE * total:
                    low += min(high_factor * lo, low_factor * lo)
                    if lo < 0:
                        low_names.append(name)
            out[i][case] = Envelope(
                high,
                low,
                "" if not own or set(high_names) == loaded else spans_text(high_names),
                spans_text(low_names) if own else "",
                tuple(sorted(high_from[i])),
                tuple(sorted(low_from[i])),
                own=own,
            )
    return out


def passed_through(applied: tuple[AppliedForce, ...]) -> dict[str, Envelope]:
    """The envelope of forces acting together (a post's foot, the loads within d of a support): each case summed at
    its high and at its low, a force without an envelope at its every-span value."""
    out: dict[str, Envelope] = {}
    for case in sorted({c for item in applied for c in item.envelope}):
        high = low = 0.0
        high_from: tuple[str, ...] = ()
        low_from: tuple[str, ...] = ()
        for item in applied:
            env = item.envelope.get(case)
            if env is None:
                high += item.forces.get(case, 0.0)
                low += item.forces.get(case, 0.0)
                continue
            high, low = high + env.high, low + env.low
            high_from, low_from = _union(high_from, env.high_from), _union(low_from, env.low_from)
        out[case] = Envelope(high, low, "", "", high_from, low_from, own=False)
    return out


def spans_text(names: list[str]) -> str:
    """'spans 1 and 3', 'span 2 and the left overhang': how a pattern reads in the memo."""
    spans = [n.split()[1] for n in names if n.startswith("span ")]
    others = [n for n in names if not n.startswith("span ")]
    parts = []
    if spans:
        parts.append(
            ("span " if len(spans) == 1 else "spans ")
            + ", ".join(spans[:-1])
            + (" and " if len(spans) > 1 else "")
            + spans[-1]
        )
    parts += others
    return " and ".join(parts)


def _piece_of(x: float, pieces: list[tuple[float, float, str]]) -> int:
    """The piece a point load belongs to: the last one starting at or before it (a load on a support goes left)."""
    index = 0
    for i, (a, _, _) in enumerate(pieces):
        if a < x - 1e-12:
            index = i
    return index


def piece_owners(applied: tuple[AppliedForce, ...], pieces: list[tuple[float, float, str]]) -> dict[int, int]:
    """The piece each point load stands on (by the load's identity), found once for every case."""
    return {id(item): _piece_of(item.at, pieces) for item in applied if item.kind == "point" and item.at is not None}


def case_shares(
    positions: list[float],
    applied: tuple[AppliedForce, ...],
    case: str,
    pieces: list[tuple[float, float, str]],
    owner: dict[int, int],
) -> list[list[float]]:
    """Each piece's reactions from the part of one load case on it, the loads sorted to pieces once."""
    points: list[list[tuple[float, float]]] = [[] for _ in pieces]
    uniforms: list[list[tuple[float, float, float]]] = [[] for _ in pieces]
    for item in applied:
        value = item.forces.get(case)
        if value is None:
            continue
        if item.kind == "point" and item.at is not None:
            points[owner[id(item)]].append((item.at, value))
        elif item.start is not None and item.end is not None:
            for k, (a, b, _) in enumerate(pieces):
                lo, hi = max(a, item.start), min(b, item.end)
                if hi > lo:
                    uniforms[k].append((lo, hi, value))
    return [
        reactions(positions, points[k], uniforms[k]) if points[k] or uniforms[k] else [0.0] * len(positions)
        for k in range(len(pieces))
    ]


def _applied_forces(member_id, carried, own, bearing_forces, envelopes) -> tuple[AppliedForce, ...]:
    out: list[AppliedForce] = []
    for b in carried:
        envelope = {case: env.carried(b.upper.member, b.id) for case, env in envelopes.get(b.id, {}).items()}
        forces = dict(bearing_forces.get(b.id, {}))
        out.append(AppliedForce(b.id, True, "point", b.lower.at, forces=forces, envelope=envelope))
    grouped: dict[str, dict] = {}
    for load in own:
        # a load given with several cases is one applied force with a force per case
        item = grouped.setdefault(load.id, {"load": load, "forces": {}})
        item["forces"][load.case] = item["forces"].get(load.case, 0.0) + load.magnitude
    for load_id, item in grouped.items():
        load = item["load"]
        out.append(AppliedForce(load_id, False, load.kind, load.at, load.start, load.end, item["forces"]))
    return tuple(out)


def _reactions_by_case(positions: list[float], applied: tuple[AppliedForce, ...]) -> list[Forces]:
    points: dict[str, list[tuple[float, float]]] = defaultdict(list)
    uniforms: dict[str, list[tuple[float, float, float]]] = defaultdict(list)
    for item in applied:
        for case, value in item.forces.items():
            if item.kind == "point" and item.at is not None:
                points[case].append((item.at, value))
            elif item.start is not None and item.end is not None:
                uniforms[case].append((item.start, item.end, value))
    out: list[Forces] = [{} for _ in positions]
    for case in sorted(set(points) | set(uniforms)):
        total = sum(abs(p) for _, p in points[case]) + sum(abs(w) * abs(b - a) for a, b, w in uniforms[case])
        for i, r in enumerate(reactions(positions, points[case], uniforms[case])):
            out[i][case] = 0.0 if abs(r) <= NOISE_SHARE * total else r
    return out
