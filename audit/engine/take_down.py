"""Stage 2: take the loads down the framing.

Members are visited from the top of the support graph down. A horizontal member's support
reactions, per load case, come from its own loads and the loads of the members bearing on
it; a post passes what lands on its top to the bearing at its foot. Each reaction becomes
the force through that bearing, which loads the member below.
"""

from __future__ import annotations

from collections import defaultdict
from dataclasses import dataclass, field

from audit.engine.beam_statics import reactions
from audit.engine.model import Model

Forces = dict[str, float]  # load case (or factored group key) -> force, N, downward positive

# Float noise never decides: a reaction smaller than this share of the load case's own total
# on the member is rounding in the statics (a few 1e-13 of it), not a force, and is taken as
# zero, so the same building in SI or US units, or with every load doubled, gives the same
# cases at every bearing.
NOISE_SHARE = 1e-9
# Forces below this are zero wherever a force is judged (uplift, a case being present): no
# bearing check turns on a newton.
FORCE_RESOLUTION = 1.0  # N


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


@dataclass(frozen=True)
class TakeDown:
    order: tuple[str, ...]  # members from the top down
    bearing_forces: dict[str, Forces]  # bearing id -> force through it, per case
    on_top: dict[str, tuple[AppliedForce, ...]]  # member id -> what presses on its top face


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


def take_down(model: Model) -> TakeDown:
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
    for member_id in order:
        member = model.members[member_id]
        applied = _applied_forces(member_id, carried_by[member_id], own_loads[member_id], bearing_forces)
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
            continue
        below = sorted(below, key=lambda b: b.upper.at)
        positions = [b.upper.at for b in below]
        per_support = _reactions_by_case(positions, applied)
        for bearing, forces in zip(below, per_support, strict=True):
            bearing_forces[bearing.id] = forces
    return TakeDown(order, bearing_forces, on_top)


def _applied_forces(member_id, carried, own, bearing_forces) -> tuple[AppliedForce, ...]:
    out: list[AppliedForce] = []
    for b in carried:
        out.append(AppliedForce(b.id, True, "point", b.lower.at, forces=dict(bearing_forces.get(b.id, {}))))
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
