"""Stage 4: compute each required check's resistance from a rule pack, per load combination.

    Qr  = phi * Fcp * Ab  * KB * KZcp                 local bearing
    Qr' = (2/3) * phi * Fcp * Ab' * KB * KZcp          loads within d of a support
    Fcp = fcp * (KD * KScp * KT)
    Nr  = Pr * Qr / (Pr sin^2(theta) + Qr cos^2(theta))   bearing at an angle (Hankinson)

Every factor comes with the reason it took its value. KD changes with the combination, so
each combination gets its own Qr and the governing one is the highest Qf/Qr.
"""

from __future__ import annotations

import itertools
import math
import re
from collections.abc import Callable
from dataclasses import dataclass, field, replace
from functools import cached_property
from typing import Any, TypeVar

from audit.core.errors import ErrorCollector, InputError
from audit.core.located_yaml import Node
from audit.engine.contacts import longer, shorter
from audit.engine.model import (
    FACTORED_PREFIX,
    STORAGE_LIVE,
    WIND_PRESSURE,
    WIND_SUCTION,
    Material,
    Member,
    Model,
    base_case,
)
from audit.engine.take_down import Forces, TakeDown, force_floor, sizes_at
from audit.standards.checks import (
    LOCAL,
    NEAR,
    CheckList,
    RequiredCheck,
    list_checks,
    near_support_geometry,
    side_by_side_text,
    top_bearing,
)
from audit.standards.packs import CombinationPack, PackCore, ResistancePack, read_resistance_pack

STANDARD_TERM_CASES = ("L", "S")
LONG_TERM_CASE = "D"
PASS_LIMIT = 1.0 + 1e-9


@dataclass(frozen=True)
class LoadCombination:
    name: str
    factors: dict[str, float]  # load case (or factored key) -> load factor
    duration: str  # permanent | standard | short
    clause: str = ""
    factored: bool = False  # a group of already-factored loads

    @cached_property
    def principal_cases(self) -> tuple[str, ...]:
        """The cases of the principal load (the largest factor but dead load's; dead load for a dead-only one),
        with the cases split from it (W:suction, L:storage)."""
        live = {case: f for case, f in self.factors.items() if case != LONG_TERM_CASE}
        if not live:
            return (LONG_TERM_CASE,)
        principal = base_case(max(live, key=lambda case: live[case]))
        return tuple(case for case in live if base_case(case) == principal)


@dataclass(frozen=True)
class Factor:
    name: str
    value: float
    reason: str
    clause: str = ""


@dataclass(frozen=True)
class ResistanceInputs:
    """Everything Qr depends on except KD; diagnosis varies these one at a time."""

    phi: float
    coefficient: float  # 1 for local bearing, 2/3 for near-support
    fcp: float  # Pa, specified strength
    kscp: float
    kt: float
    kb: float
    kzcp: float
    area: float  # m^2, Ab or Ab'
    uses_kd: bool
    fc_parallel: float | None  # Pa, fc * KSc * KT for Hankinson; None when perpendicular
    angle: float | None


# How a combination places one patterned case: "worst" (its envelope in the direction of its factor), "every"
# (every span loaded) or "least" (its least downward placing, where that is still downward).
Placing = tuple[tuple[str, str], ...]
WORST, EVERY_SPAN, LEAST = "worst", "every", "least"


@dataclass(frozen=True)
class CombinationResult:
    combination: str
    duration: str
    qf: float  # N
    kd: float
    kd_reason: str
    qr: float  # N
    utilisation: float
    pattern: str = ""  # how the patterned cases were placed for this Qf ("" : every span loaded)
    qf_low: float = 0.0  # N, the least force under this combination: counteracting dead load, worst patterns
    placing: Placing = ()  # the placing of each patterned case that gave this row (() : each at its worst)


def placings(forces: Forces, envelope: dict, combo: LoadCombination) -> list[Placing]:
    """Every placing of the patterned cases a combination is evaluated with, the worst-force one first.

    The largest force is not always the worst Qf/Qr: where the duration factor falls with the share of
    short-term load (O86's long-term KD, dead-heavy members), less live or snow load can govern."""
    options = []
    floor = force_floor(sizes_at(forces, envelope))
    for case, env in sorted(envelope.items()):
        factor = combo.factors.get(case, 0.0)
        if factor == 0.0:
            continue
        worst, other = (env.high, env.low) if factor > 0 else (env.low, env.high)
        every = forces.get(case, 0.0)
        choice = [(case, WORST)]
        if abs(every - worst) > floor:
            choice.append((case, EVERY_SPAN))
        if factor > 0 and other > floor and min(abs(other - worst), abs(other - every)) > floor:
            choice.append((case, LEAST))
        options.append(choice)
    return [tuple(p) for p in itertools.product(*options)]


def placed_forces(forces: Forces, envelope: dict, combo: LoadCombination, placing: Placing = ()) -> tuple[Forces, str]:
    """The forces of each case as the combination places it: patterned cases at their envelope (``placing``: each
    case's placing, default its worst), with how they were placed."""
    placed = dict(forces)
    notes = []
    chosen = dict(placing)
    floor = force_floor(sizes_at(forces, envelope))
    for case, env in sorted(envelope.items()):
        factor = combo.factors.get(case, 0.0)
        how = chosen.get(case, WORST)
        if factor == 0.0 or how == EVERY_SPAN:
            continue
        high = (factor > 0) == (how == WORST)
        value = env.high if high else env.low
        placed[case] = value
        if abs(value - forces.get(case, 0.0)) > floor:
            least = ", its least here (worse through the load-duration factor)" if how == LEAST else ""
            notes.append(f"{case} {env.placing(high)}{least}")
    return placed, "; ".join(notes)


def least_force(forces: Forces, envelope: dict, combo: LoadCombination, counteracting: float) -> float:
    """The least force through the bearing under a combination: dead load at its counteracting factor where
    that is lower, every patterned case at its least favourable placing (uplift is looked for here)."""
    total = []
    for case, factor in combo.factors.items():
        if case == LONG_TERM_CASE:
            factor = min(factor, counteracting) if forces.get(case, 0.0) > 0 else factor
        env = envelope.get(case)
        if env is None:
            total.append(factor * forces.get(case, 0.0))
        else:
            total.append(factor * (env.low if factor > 0 else env.high))
    return math.fsum(total)


@dataclass(frozen=True)
class CheckResult:
    check: RequiredCheck
    material: str
    inputs: ResistanceInputs
    factors: tuple[Factor, ...]  # phi, fcp, KScp, KT, KB, KZcp (and 2/3): value and reason
    area_reason: str
    combinations: tuple[CombinationResult, ...]
    governing: CombinationResult
    uplift: tuple[str, ...]  # combinations in which the bearing force is upward
    passes: bool


# ---------------------------------------------------------------- combinations


def load_combinations(model: Model, cpack: CombinationPack) -> tuple[LoadCombination, ...]:
    """The pack's combinations for specified loads, plus one per group of factored loads.

    Where the model gives wind as pressure and suction, a combination with wind is taken once
    each way; storage live load takes the live-load factor where live load leads and the pack's
    storage companion factor where it accompanies.
    """
    cases = {load.case for load in model.loads}
    out = []
    for c in cpack.combinations:
        factors = dict(c.factors)
        live = factors.get("L", 0.0)
        if STORAGE_LIVE in cases and live and STORAGE_LIVE not in factors:  # a combination may state its own
            leads = live >= max(f for case, f in factors.items() if case != LONG_TERM_CASE)
            factors[STORAGE_LIVE] = live if leads else cpack.storage_companion.value
        name = labelled(c.name, factors, "L" in cases)
        wind = factors.get("W", 0.0)
        directions = [d for d in (WIND_PRESSURE, WIND_SUCTION) if d in cases]
        if wind and directions:
            for direction in directions:
                way = direction.split(":")[1]
                out.append(
                    LoadCombination(f"{name} (wind {way})", {**factors, direction: wind}, c.duration, c.source.clause)
                )
            continue
        out.append(LoadCombination(name, factors, c.duration, c.source.clause))
    for group in sorted(model.factored_groups.values(), key=lambda g: g.label):
        out.append(LoadCombination(group.label, {FACTORED_PREFIX + group.label: 1.0}, group.duration, "", True))
    return tuple(out)


LOAD_TERM = re.compile(r"(?:(?<=^)|(?<=\+))(\d+(?:\.\d+)?)([A-Z])(?=\+|$|\s)")


def factor_text(value: float) -> str:
    """A load factor as combination names print it: 1.0, 0.5, 1.05."""
    text = f"{value:.2f}".rstrip("0")
    return text + "0" if text.endswith(".") else text


def labelled(name: str, factors: dict[str, float], plain_live: bool) -> str:
    """The pack's name of a combination, stating storage live load at the factor it takes where that is not the
    live-load factor the name prints: '1.25D+1.5S+1.0L' where all live load is storage, else '+1.0L (storage)'."""
    storage, live = factors.get(STORAGE_LIVE), factors.get("L", 0.0)
    if storage is None or abs(storage - live) < 1e-9:
        return name
    terms = [m for m in LOAD_TERM.finditer(name) if abs(float(m.group(1)) - live) < 1e-9 and m.group(2) != "D"]
    live_term = next((m for m in terms if m.group(2) in ("L", "Q")), None)
    letter = live_term.group(2) if live_term else "L"
    if live_term is not None and not plain_live:
        return name[: live_term.start(1)] + factor_text(storage) + name[live_term.end(1) :]
    return f"{name}+{factor_text(storage)}{letter} (storage)"


def counteracted(name: str, dead: float, counteracting: float) -> str:
    """The name of a combination as uplift is looked for: its dead-load factor lowered to the counteracting one
    ('1.25D+1.4W' -> '0.9D+1.4W'); the name unchanged where the dead load is already at or below it."""
    if dead <= counteracting + 1e-9:
        return name
    match = LOAD_TERM.match(name)
    if match is None or match.group(2) not in ("D", "G") or abs(float(match.group(1)) - dead) > 1e-9:
        return f"{name} with {factor_text(counteracting)}D"
    return factor_text(counteracting) + name[match.end(1) :]


def factored_force(forces: Forces, combo: LoadCombination) -> float:
    return math.fsum(factor * forces.get(case, 0.0) for case, factor in combo.factors.items())


def load_duration_factor(forces: Forces, combo: LoadCombination, pack: ResistancePack) -> tuple[float, str]:
    """KD for one combination at one check, with the reason."""
    if combo.duration != "standard":
        value = pack.kd[combo.duration].value
        return value, f"KD = {value:.2f}: {combo.duration}-term combination {combo.name}"
    standard_value = pack.kd["standard"].value
    if combo.factored:
        return standard_value, f"KD = {standard_value:.2f}: factored loads stated as standard term"
    long_term = math.fsum(
        max(forces.get(c, 0.0), 0.0) for c in (LONG_TERM_CASE, *pack.long_term_live) if c in combo.factors
    )
    standard = math.fsum(
        max(forces.get(c, 0.0), 0.0)
        for c in (*STANDARD_TERM_CASES, STORAGE_LIVE)
        if combo.factors.get(c, 0.0) != 0.0 and c not in pack.long_term_live
    )
    if long_term <= standard or long_term == 0.0:
        return standard_value, f"KD = {standard_value:.2f}: standard-term combination {combo.name}"
    rule = pack.kd_long_term.value
    floor = rule["floor"]
    if standard <= 0.0:
        return floor, (
            f"KD = {floor:.2f}: {combo.name} has no standard-term L or S at this bearing, long-term load alone"
        )
    value = max(floor, rule["intercept"] - rule["slope"] * math.log10(long_term / standard))
    return value, (
        f"KD = {value:.3f}: dead load PL = {long_term / 1000:.2f} kN exceeds PS = {standard / 1000:.2f} kN, "
        f"KD = {rule['intercept']:g} - {rule['slope']:g} log10(PL/PS), not less than {floor:g}"
    )


# ---------------------------------------------------------------- factors


def kb_factor(length: float, end_distance: float, material: Material, pack: ResistancePack) -> Factor:
    clause = pack.kb_table.clause
    if "KB" not in material.applies:
        return Factor("KB", 1.0, "KB = 1.00: the product's evaluation report does not allow KB", clause)
    max_len = pack.kb_max_length.value
    min_end = pack.kb_min_end_distance.value
    if longer(length, max_len):  # ties at the stated resolution, alike in SI and US input
        return Factor(
            "KB", 1.0, f"KB = 1.00: bearing length {length * 1000:.0f} mm exceeds {max_len * 1000:.0f} mm", clause
        )
    if shorter(end_distance, min_end):
        return Factor(
            "KB",
            1.0,
            f"KB = 1.00: bearing {end_distance * 1000:.0f} mm from the member end, less than {min_end * 1000:.0f} mm",
            clause,
        )
    value = pack.kb_table.value.at(length)
    return Factor(
        "KB",
        value,
        f"KB = {value:.3f}: bearing length {length * 1000:.0f} mm, {end_distance * 1000:.0f} mm from the member end",
        clause,
    )


def _kzcp(member: Member, material: Material, pack: ResistancePack, reading: str) -> Factor:
    clause = pack.kzcp_table.clause
    applies = (
        "KZcp" in material.applies if material.family == "engineered" else material.family in pack.kzcp_families.value
    )
    if not applies:
        return Factor("KZcp", 1.0, f"KZcp = 1.00: not applied to {material.family.replace('_', ' ')}", clause)
    table = pack.kzcp_table.value
    whole = table.at(member.b / member.d)
    whole_text = f"width/depth = {member.b * 1000:.0f}/{member.d * 1000:.0f} = {member.b / member.d:.2f}"
    ply = member.ply_section
    if ply is None:
        return Factor("KZcp", whole, f"KZcp = {whole:.3f}: {whole_text}", clause)
    one = table.at(ply[0] / ply[1])
    one_text = f"one ply {ply[0] * 1000:.0f}/{ply[1] * 1000:.0f} = {ply[0] / ply[1]:.2f} gives {one:.3f}"
    if reading == "combined":
        return Factor(
            "KZcp",
            whole,
            f"KZcp = {whole:.3f}: {member.plies}-ply member, {whole_text} ({one_text}; reading: combined)",
            clause,
        )
    value = min(one, whole)
    return Factor(
        "KZcp",
        value,
        f"KZcp = {value:.3f}: {member.plies}-ply member, {one_text}; the whole member {whole_text} gives "
        f"{whole:.3f} (reading: {reading})",
        clause,
    )


def _kscp(member: Member, material: Material, pack: ResistancePack) -> Factor:
    if material.family == "engineered":
        if "KScp" not in material.applies or member.service == "dry":
            return Factor("KScp", 1.0, f"KScp = 1.00: {member.service} service, product report")
        if material.wet_factor is None:
            raise InputError(
                f"member '{member.id}' is in wet service: give 'wet_factor' for material '{material.id}'",
                material.loc,
            )
        return Factor("KScp", material.wet_factor, f"KScp = {material.wet_factor:.2f}: wet service, product report")
    entry = pack.kscp[material.family]
    value = entry.value[member.service]
    return Factor("KScp", value, f"KScp = {value:.2f}: {member.service} service", entry.clause)


def _fc_parallel(member: Member, material: Material, pack: ResistancePack, angle: float | None) -> float | None:
    if angle is None or abs(angle - math.pi / 2) < 1e-9:
        return None
    if material.fc is None:
        raise InputError(
            f"bearing at an angle on '{member.id}' needs fc (compression parallel) for material "
            f"'{material.id}'; the rule pack has none for {material.species} {material.grade}".rstrip(),
            material.loc,
        )
    ksc = 1.0
    if material.family in pack.ksc:
        ksc = pack.ksc[material.family].value[member.service]
    elif member.service == "wet" and material.wet_factor is not None:
        ksc = material.wet_factor
    return material.fc * ksc * (member.kt if "KT" in material.applies else 1.0)


def fcp_on_face(check: RequiredCheck, material: Material) -> tuple[float, str]:
    """fcp on the face the check bears on, and how it was chosen (glulam has a compression and a tension face).

    For a layup installed as designed a beam's top face, where loads land, is its compression
    face and its underside, on its supports, its tension face; a near-support check loads both
    and takes the lesser.
    """
    compression = material.fcp if material.fcp is not None else 0.0
    if material.family != "glulam":
        return compression, ""
    tension = material.fcp_tension_face
    if tension is None:
        return compression, ", one value for both faces"
    if check.kind == NEAR:
        value = min(compression, tension)
        return value, (
            f", lesser of the compression face ({compression / 1e6:.2f} MPa) and tension face "
            f"({tension / 1e6:.2f} MPa): the load passes through both"
        )
    if check.face == "top":
        return compression, ", compression-face laminations (loads on the beam's top face)"
    return tension, ", tension-face laminations (the beam's underside on its support)"


def resistance_inputs(
    check: RequiredCheck,
    model: Model,
    pack: ResistancePack,
    readings: dict[str, str],
) -> tuple[ResistanceInputs, tuple[Factor, ...], str]:
    """Every input of Qr but KD, each with its reason; ``readings`` are the pack's choices in force."""
    member = model.members[check.member]
    material = model.materials[member.material]
    if material.fcp is None:  # the reader fills fcp from the pack or the product; never left empty
        raise InputError(f"material '{material.id}' has no fcp", material.loc)
    fcp_value, face_text = fcp_on_face(check, material)
    fcp_reason = (
        f"fcp = {fcp_value / 1e6:.2f} MPa: {material.family.replace('_', ' ')} {material.species} {material.grade}"
        f"{face_text}"
        if material.family != "engineered"
        else f"fcp = {fcp_value / 1e6:.2f} MPa: {material.source}"
    )
    fcp_clause = pack.fcp[material.family][material.species].fcp.clause if material.family != "engineered" else ""
    kscp = _kscp(member, material, pack)
    kt_value = member.kt if "KT" in material.applies else 1.0
    kt = Factor("KT", kt_value, "KT = 1.00: untreated" if kt_value == 1.0 else f"KT = {kt_value:.2f}: as stated")
    kzcp = _kzcp(member, material, pack, readings["kzcp.built_up"])
    phi = Factor("phi", pack.phi.value, f"phi = {pack.phi.value:.2f}", pack.phi.clause)
    fcp = Factor("fcp", fcp_value, fcp_reason, fcp_clause)
    if check.kind == LOCAL:
        c = check.contact
        kb = kb_factor(c.length, c.end_distance, material, pack)
        area = c.length * c.width
        area_reason = (
            f"Ab = {c.width * 1000:.0f} x {c.length * 1000:.0f} = {area * 1e6:,.0f} mm²: "
            f"width: {c.width_note}; length: {c.length_note}"
        )
        coefficient = Factor("coefficient", 1.0, "local bearing")
    else:
        area, area_reason = _near_area(check, pack, readings)
        kb = _near_kb(check, material, pack, readings)
        factor = pack.near_factor.value
        coefficient = Factor("2/3", factor, f"near-support factor {factor:.3f}", pack.near_factor.clause)
    inputs = ResistanceInputs(
        phi=phi.value,
        coefficient=coefficient.value,
        fcp=fcp_value,
        kscp=kscp.value,
        kt=kt.value,
        kb=kb.value,
        kzcp=kzcp.value,
        area=area,
        uses_kd="KD" in material.applies,
        fc_parallel=_fc_parallel(member, material, pack, check.angle),
        angle=check.angle,
    )
    factors = (phi, fcp, kscp, kt, kb, kzcp) + ((coefficient,) if check.kind == NEAR else ())
    return inputs, factors, area_reason


def _near_area(check: RequiredCheck, pack: ResistancePack, readings: dict[str, str]) -> tuple[float, str]:
    reading = readings["near_support.area_limit"]
    l1, l2, b = near_support_geometry(check, readings["near_support.opposite_bearings"])
    ratio = pack.near_area_ratio
    if reading == "length_cap":
        l2_used = min(l2, ratio * l1)
        area = b * (l1 + l2_used) / 2.0
        cap = f", L2 limited to {ratio:g} L1" if l2_used < l2 else ""
        text = (
            f"Ab' = b (L1 + L2)/2 = {b * 1000:.0f} x ({l1 * 1000:.0f} + {l2_used * 1000:.0f})/2 = "
            f"{area * 1e6:,.0f} mm²{cap} (reading: {reading})"
        )
    else:
        raw = b * (l1 + l2) / 2.0
        area = min(raw, ratio * b * l1)
        cap = f", capped at {ratio:g} b L1" if area < raw else ""
        text = (
            f"Ab' = b (L1 + L2)/2 = {b * 1000:.0f} x ({l1 * 1000:.0f} + {l2 * 1000:.0f})/2{cap} = "
            f"{area * 1e6:,.0f} mm² (reading: {reading})"
        )
    if len(check.opposite) > 1:
        spread = readings["near_support.opposite_bearings"]
        how = "the longest single bearing" if spread == "longest_single" else "the sum of their lengths"
        text += f"; {len(check.opposite)} bearings within d, L2 from {how} (reading: {spread})"
        if beside := side_by_side_text(check):
            text += f"; {beside}"
    return area, text


def _near_kb(check: RequiredCheck, material: Material, pack: ResistancePack, readings: dict[str, str]) -> Factor:
    reading = readings["near_support.kb_reading"]
    support = check.contact
    top_length, top_end = top_bearing(check, readings["near_support.opposite_bearings"])
    kb_support = kb_factor(support.length, support.end_distance, material, pack)
    kb_top = kb_factor(top_length, top_end, material, pack)
    shorter = kb_support if support.length <= top_length else kb_top
    if reading == "both_qualify":
        if kb_support.value > 1.0 and kb_top.value > 1.0:
            return replace(shorter, reason=f"{shorter.reason}; both faces qualify, KB of the shorter bearing")
        return Factor("KB", 1.0, "KB = 1.00: both bearings must qualify for KB (conservative reading)", shorter.clause)
    return replace(shorter, reason=f"{shorter.reason}; KB of the shorter bearing (reading: {reading})")


# ---------------------------------------------------------------- results


def resistance(inputs: ResistanceInputs, kd: float) -> float:
    """coefficient phi f (KD ...) A KB KZcp, the product every standard here states its bearing resistance as,
    with Hankinson's formula for a load at an angle to the grain."""
    kd_used = kd if inputs.uses_kd else 1.0
    fcp_modified = inputs.fcp * kd_used * inputs.kscp * inputs.kt
    qr = inputs.coefficient * inputs.phi * fcp_modified * inputs.area * inputs.kb * inputs.kzcp
    if inputs.fc_parallel is None or inputs.angle is None:
        return qr
    pr = inputs.phi * inputs.fc_parallel * kd_used * inputs.area
    s, c = math.sin(inputs.angle), math.cos(inputs.angle)
    return pr * qr / (pr * s * s + qr * c * c)


def _principal_present(combo: LoadCombination, forces: Forces, floor: float = 0.0) -> bool:
    """A combination whose principal load is absent here only repeats another; skip it.

    The principal is the case with the largest load factor other than dead load (dead load
    itself for a dead-only combination).
    """
    return any(abs(forces.get(case, 0.0)) > floor for case in combo.principal_cases)


def _wind_absent(combo: LoadCombination, forces: Forces, envelope: dict, floor: float = 0.0) -> bool:
    """A combination with wind at a check no wind reaches only repeats the one without it: skip it."""
    wind = [case for case, factor in combo.factors.items() if factor and base_case(case) == "W"]
    return bool(wind) and all(abs(forces.get(case, 0.0)) <= floor and case not in envelope for case in wind)


DurationRule = Callable[[Forces, LoadCombination], tuple[float, str]]


def evaluate(
    check: RequiredCheck,
    inputs: ResistanceInputs,
    combos: tuple[LoadCombination, ...],
    pack: ResistancePack,
    forces: Forces | None = None,
    counteracting: float = 1.0,
    patterned: bool = True,
) -> tuple[tuple[CombinationResult, ...], CombinationResult, tuple[str, ...]]:
    """Every combination's Qf, KD and Qr at the check; the governing one; the combinations with uplift.

    ``forces`` replaces the check's own (diagnosis); ``patterned`` False ignores pattern loading.
    """

    def kd_rule(placed: Forces, combo: LoadCombination) -> tuple[float, str]:
        if not inputs.uses_kd:
            return 1.0, "KD = 1.00: the product's evaluation report does not apply KD"
        return load_duration_factor(placed, combo, pack)

    return evaluate_with(check, inputs, combos, kd_rule, pack.kd["standard"].value, forces, counteracting, patterned)


def evaluate_with(
    check: RequiredCheck,
    inputs: ResistanceInputs,
    combos: tuple[LoadCombination, ...],
    duration: DurationRule,
    unloaded_factor: float,
    forces: Forces | None = None,
    counteracting: float = 1.0,
    patterned: bool = True,
) -> tuple[tuple[CombinationResult, ...], CombinationResult, tuple[str, ...]]:
    """``evaluate`` for any standard: ``duration`` gives the duration (or modification) factor of a combination."""
    forces = check.forces if forces is None else forces
    envelope = check.envelope if patterned else {}
    results = []
    reasons = []  # kept aside: only the governing combination's reason is stored (memory on large buildings)
    uplift = []
    floor = force_floor(sizes_at(forces, envelope))  # relative to the load here: alike for scaled loads
    for combo in combos:
        if not _principal_present(combo, forces, floor) or _wind_absent(combo, forces, envelope, floor):
            continue
        low = least_force(forces, envelope, combo, counteracting)
        if low < -floor:
            uplift.append(combo.name)
        best: CombinationResult | None = None
        best_reason = ""
        for placing in placings(forces, envelope, combo) if envelope else [()]:
            placed, pattern = placed_forces(forces, envelope, combo, placing)
            qf = factored_force(placed, combo)
            kd, kd_reason = duration(placed, combo)
            qr = resistance(inputs, kd)
            utilisation = max(qf, 0.0) / qr
            row = CombinationResult(combo.name, combo.duration, qf, kd, "", qr, utilisation, pattern, low, placing)
            if best is None or row.utilisation > best.utilisation + 1e-12:
                best, best_reason = row, kd_reason
        assert best is not None
        results.append(best)
        reasons.append(best_reason)
    if not results:
        qr = resistance(inputs, unloaded_factor)
        results.append(CombinationResult("no load", "standard", 0.0, 1.0, "", qr, 0.0))
        reasons.append("no load reaches this bearing")
    index = max(range(len(results)), key=lambda i: results[i].utilisation)
    results[index] = replace(results[index], kd_reason=reasons[index])
    return tuple(results), results[index], tuple(uplift)


InputsOf = Callable[[RequiredCheck], tuple[ResistanceInputs, tuple[Factor, ...], str]]


def resist_each(
    checklist: CheckList,
    model: Model,
    cpack: CombinationPack,
    inputs_of: InputsOf,
    duration_of: Callable[[RequiredCheck, ResistanceInputs], DurationRule],
    unloaded_of: Callable[[RequiredCheck], float],
) -> tuple[CheckResult, ...]:
    """Every check's result under any standard: its inputs and reasons, each combination, the governing one.

    Errors in the inputs of several checks (a missing fc, a wet factor) are reported together."""
    combos = load_combinations(model, cpack)
    out = []
    errors = ErrorCollector()
    for check in checklist.checks:
        try:
            inputs, factors, area_reason = inputs_of(check)
        except InputError as exc:
            errors.extend(exc)
            continue
        results, governing, uplift = evaluate_with(
            check,
            inputs,
            combos,
            duration_of(check, inputs),
            unloaded_of(check),
            counteracting=cpack.counteracting_dead.value,
        )
        out.append(
            CheckResult(
                check=check,
                material=model.members[check.member].material,
                inputs=inputs,
                factors=factors,
                area_reason=area_reason,
                combinations=results,
                governing=governing,
                uplift=uplift,
                passes=governing.utilisation <= PASS_LIMIT,
            )
        )
    errors.raise_if_any()
    return tuple(out)


def resist(checklist: CheckList, model: Model, pack: ResistancePack, cpack: CombinationPack) -> tuple[CheckResult, ...]:
    readings = pack.in_force(model.project.readings)

    def duration_of(check: RequiredCheck, inputs: ResistanceInputs) -> DurationRule:
        def rule(placed: Forces, combo: LoadCombination) -> tuple[float, str]:
            if not inputs.uses_kd:
                return 1.0, "KD = 1.00: the product's evaluation report does not apply KD"
            return load_duration_factor(placed, combo, pack)

        return rule

    return resist_each(
        checklist,
        model,
        cpack,
        lambda check: resistance_inputs(check, model, pack, readings),
        duration_of,
        lambda check: pack.kd["standard"].value,
    )


# ---------------------------------------------------------------- the standard, as the review sees it


@dataclass(frozen=True)
class _O86:
    """CSA O86 behind the standard interface (``standards/base.py``)."""

    id: str = "o86"
    title: str = "CSA O86"
    check_kinds: dict[str, str] = field(
        default_factory=lambda: {LOCAL: "local bearing", NEAR: "near-support bearing (loads within d of a support)"}
    )
    slip_recipes: tuple[str, ...] = ("o86-factors",)
    length_factor: str = "KB"
    combination_formats: tuple[str, ...] = ("limit-states",)
    claim_headers: dict[str, str] = field(default_factory=dict)  # the default headers are O86's (Qf, Qr, KB)

    def read_pack(self, root: Node, path: str) -> ResistancePack:
        return read_resistance_pack(root, path)

    def list_checks(self, model: Model, flow: TakeDown, pack: PackCore, readings: dict[str, str]) -> CheckList:
        return list_checks(model, flow, o86_pack(pack), readings)

    def resist(
        self, checklist: CheckList, model: Model, pack: PackCore, cpack: CombinationPack
    ) -> tuple[CheckResult, ...]:
        return resist(checklist, model, o86_pack(pack), cpack)

    def formula(self, kind: str) -> str:
        qr = "Qr' = (2/3) phi Fcp Ab' KB KZcp" if kind == NEAR else "Qr = phi Fcp Ab KB KZcp"
        return f"{qr}, Fcp = fcp (KD KScp KT)"

    def assumption_lines(self, review: Any) -> dict[str, str]:
        kd = o86_pack(review.pack).kd
        return {
            "near_support": "Near-support checks are made where point loads or bearings on the top face have their "
            "centres within the member depth d of the support centre.",
            "faces": "Glulam bears on its compression-face laminations where loads land on its top face and on its "
            "tension-face laminations at its supports, for a layup installed as designed (an inverted layup is not "
            "modelled); a near-support check loads both faces and takes the lesser fcp. Each family's findings cite "
            "its own clause from the rule pack.",
            "storage": " and counts as long-term load in the KD formula where the rule pack says so",
            "duration": f"KD per combination: permanent {kd['permanent'].value:.2f}, short term "
            f"{kd['short'].value:.2f}, standard term {kd['standard'].value:.2f} or the long-term formula where "
            "the specified dead load at the check exceeds its L + S load. The governing combination is the one with "
            "the highest Qf/Qr.",
        }

    def resistance_variants(self, result: Any, model: Model, pack: PackCore) -> list[tuple[str, str, dict[str, float]]]:
        return []  # O86's slips are the reconciler's own factor family ("o86-factors")

    def duration_reason(
        self, check: RequiredCheck, forces: Forces, combination: Any, model: Model, pack: PackCore
    ) -> str:
        return load_duration_factor(forces, combination, o86_pack(pack))[1]


def o86_pack(pack: PackCore) -> ResistancePack:
    return pack_as(pack, ResistancePack)


PackType = TypeVar("PackType", bound=PackCore)


def pack_as(pack: PackCore, kind: type[PackType]) -> PackType:
    """The pack as its standard's own type (a standard only ever receives its own packs)."""
    if not isinstance(pack, kind):
        raise TypeError(f"rule pack {pack.id} is a {pack.standard} pack, not a {kind.__name__}")
    return pack


O86 = _O86()
