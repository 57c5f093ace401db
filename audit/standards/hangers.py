"""Hangers: the reaction against the hanger's listed capacity, and whether a top flange fits its carrier.

A check kind of its own, the same under every standard: the listed capacity is the firm's entry from its
verified listing (``Hanger.source``), compared with the factored force through the bearing under each load
combination of the combinations pack, at the capacity listed for that combination's load duration. The
carried member's bearing on the seat and the carrier's under a top flange are bearing checks of the standard
(``checks.py`` lists them with the hanger's contact).
"""

from __future__ import annotations

from dataclasses import dataclass

from audit.engine.contacts import shorter
from audit.engine.model import Bearing, Hanger, Model
from audit.engine.take_down import TakeDown, force_floor, sizes_at
from audit.standards.combinations import factored_force, load_combinations
from audit.standards.packs import CombinationPack
from audit.standards.resistance import PASS_LIMIT, _principal_present, _wind_absent, placed_forces, placings

CAPACITY = "hanger-capacity"


@dataclass(frozen=True, slots=True)
class HangerCheck:
    """The governing factored force through a hanger against its listed capacity."""

    bearing: str
    hanger: str
    carried: str
    carrier: str
    combination: str  # the governing one
    duration: str
    qf: float  # N
    capacity: float  # N, listed for the governing combination's duration
    capacity_reason: str
    source: str  # the listing's source: the clause field of this check
    pattern: str = ""

    @property
    def utilisation(self) -> float:
        return max(self.qf, 0.0) / self.capacity

    @property
    def passes(self) -> bool:
        return self.utilisation <= PASS_LIMIT


@dataclass(frozen=True, slots=True)
class FlangeFit:
    """A top-flange hanger on a carrier: is the carrier as wide as the flange reaches across it?"""

    bearing: str
    hanger: str
    carrier: str
    flange_length: float  # m
    carrier_width: float  # m

    @property
    def fits(self) -> bool:
        return not shorter(self.carrier_width, self.flange_length)


def hanger_checks(model: Model, flow: TakeDown, cpack: CombinationPack) -> tuple[HangerCheck, ...]:
    """The capacity check of every bearing in a hanger, each combination at its worst placing, the highest
    Qf / capacity governing (the capacity changes with the load duration, so the largest force need not govern)."""
    combos = load_combinations(model, cpack)
    out = []
    for bearing in model.bearings:
        hanger = model.hangers.get(bearing.hanger)
        if hanger is None:
            continue
        forces = flow.bearing_forces.get(bearing.id, {})
        envelope = flow.envelopes.get(bearing.id, {})
        best: HangerCheck | None = None
        floor = force_floor(sizes_at(forces, envelope))
        for combo in combos:
            if not _principal_present(combo, forces, floor) or _wind_absent(combo, forces, envelope, floor):
                continue  # it only repeats another combination, as in every bearing check
            for placing in placings(forces, envelope, combo) if envelope else [()]:
                placed, pattern = placed_forces(forces, envelope, combo, placing)
                qf = factored_force(placed, combo)
                capacity, reason = hanger.capacity_for(combo.duration)
                row = _row(bearing, hanger, combo.name, combo.duration, qf, capacity, reason, pattern)
                if best is None or row.utilisation > best.utilisation + 1e-12:
                    best = row
        if best is not None:
            out.append(best)
    return tuple(out)


def _row(
    bearing: Bearing, hanger: Hanger, combo: str, duration: str, qf: float, capacity: float, reason: str, pattern: str
) -> HangerCheck:
    return HangerCheck(
        bearing.id,
        hanger.id,
        bearing.upper.member,
        bearing.lower.member,
        combo,
        duration,
        qf,
        capacity,
        reason,
        hanger.source,
        pattern,
    )


def flange_fits(model: Model) -> tuple[FlangeFit, ...]:
    """Every top-flange hanger's flange against the width of its carrier."""
    out = []
    for bearing in model.bearings:
        hanger = model.hangers.get(bearing.hanger)
        if hanger is None or hanger.kind != "top-flange" or hanger.flange_length is None:
            continue
        carrier = model.members[bearing.lower.member]
        out.append(FlangeFit(bearing.id, hanger.id, carrier.id, hanger.flange_length, carrier.b))
    return tuple(out)
