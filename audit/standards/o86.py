"""Stage 4: compute each required check's resistance from a rule pack, per load combination.

    Qr  = phi * Fcp * Ab  * KB * KZcp                 local bearing
    Qr' = (2/3) * phi * Fcp * Ab' * KB * KZcp          loads within d of a support
    Fcp = fcp * (KD * KScp * KT)
    Nr  = Pr * Qr / (Pr sin^2(theta) + Qr cos^2(theta))   bearing at an angle (Hankinson)

Every factor comes with the reason it took its value. KD changes with the combination, so
each combination gets its own Qr and the governing one is the highest Qf/Qr.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from typing import Any

from audit.core.errors import InputError
from audit.core.located_yaml import Node
from audit.engine.contacts import longer, shorter
from audit.engine.model import STORAGE_LIVE, Material, Member, Model
from audit.engine.take_down import Forces, TakeDown
from audit.standards.checks import (
    LOCAL,
    NEAR,
    CheckList,
    RequiredCheck,
    list_checks,
    near_support_geometry,
    near_support_width,
    side_by_side_text,
    top_bearing,
)
from audit.standards.o86_pack import O86Pack, read_o86_pack
from audit.standards.packs import CombinationPack, PackCore
from audit.standards.resistance import (
    COEFFICIENT,
    DURATION,
    LENGTH,
    LONG_TERM_CASE,
    RESISTANCE,
    SERVICE,
    SIZE,
    STRENGTH,
    TREATMENT,
    CheckResult,
    DurationRule,
    Factor,
    LoadCombination,
    ResistanceInputs,
    ResistanceSlip,
    Symbol,
    factor_values,
    fcp_on_face,
    pack_as,
    resist_each,
    with_roles,
)

STANDARD_TERM_CASES = ("L", "S")
# O86's symbols: the role of each factor, and how a claim states it
SYMBOLS = {
    "phi": Symbol(RESISTANCE),
    "fcp": Symbol(STRENGTH, "stress"),
    "KScp": Symbol(SERVICE),
    "KT": Symbol(TREATMENT),
    "KB": Symbol(LENGTH),
    "KZcp": Symbol(SIZE),
    "2/3": Symbol(COEFFICIENT),
    "KD": Symbol(DURATION),
}


def load_duration_factor(forces: Forces, combo: LoadCombination, pack: O86Pack) -> tuple[float, str]:
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


def kb_factor(length: float, end_distance: float, material: Material, pack: O86Pack) -> Factor:
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


def _kzcp(member: Member, material: Material, pack: O86Pack, reading: str) -> Factor:
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


def _kscp(member: Member, material: Material, pack: O86Pack) -> Factor:
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


def _fc_parallel(member: Member, material: Material, pack: O86Pack, angle: float | None) -> float | None:
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


def resistance_inputs(
    check: RequiredCheck,
    model: Model,
    pack: O86Pack,
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
        coefficient = None  # local bearing: no coefficient
    else:
        area, area_reason = _near_area(check, pack, readings)
        kb = _near_kb(check, material, pack, readings)
        factor = pack.near_factor.value
        coefficient = Factor("2/3", factor, f"near-support factor {factor:.3f}", pack.near_factor.clause)
    factors = with_roles((phi, fcp, kscp, kt, kb, kzcp) + ((coefficient,) if coefficient else ()), SYMBOLS)
    inputs = ResistanceInputs(
        factors=factors,
        area=area,
        uses_duration="KD" in material.applies,
        fc_parallel=_fc_parallel(member, material, pack, check.angle),
        angle=check.angle,
    )
    return inputs, factors, area_reason


def _near_area(check: RequiredCheck, pack: O86Pack, readings: dict[str, str]) -> tuple[float, str]:
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


def _near_kb(check: RequiredCheck, material: Material, pack: O86Pack, readings: dict[str, str]) -> Factor:
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


def resist(checklist: CheckList, model: Model, pack: O86Pack, cpack: CombinationPack) -> tuple[CheckResult, ...]:
    readings = pack.in_force(model.project.readings)

    def duration_of(check: RequiredCheck, inputs: ResistanceInputs) -> DurationRule:
        def rule(placed: Forces, combo: LoadCombination) -> tuple[float, str]:
            if not inputs.uses_duration:
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


# ---------------------------------------------------------------- slips


def o86_slips(result: CheckResult, model: Model, pack: O86Pack, kd: float) -> list[ResistanceSlip]:
    """The slips reviewers find in an O86 resistance, each as the inputs it changes; ``kd``: the duration factor of
    the loads the calc used (the recomputed one where the calc's loads are the engine's)."""
    g = result.governing
    check, inputs = result.check, result.inputs
    readings = pack.in_force(model.project.readings)
    member = model.members[check.member]
    other = model.members.get(check.other_member, member)  # a point load's own check: no member above
    material = model.materials[member.material]
    out: list[ResistanceSlip] = []

    def variant(name: str, text: str, symbol: str = "", value: float = 0.0, **changes: Any) -> None:
        factors: tuple[Factor, ...] = ()
        if symbol:
            found = inputs.factor(symbol)
            assert found is not None  # O86 states every factor it varies
            factors = (replace(found, value=value),)
        out.append(ResistanceSlip(name, text, factors, **changes))

    if inputs.value("KB") == 1.0 and ("KB" in material.applies):
        length = (
            check.contact.length
            if check.kind == LOCAL
            else min(check.contact.length, top_bearing(check, readings["near_support.opposite_bearings"])[0])
        )
        kb_table = pack.kb_table.value.at(length)
        if kb_table > 1.0:
            variant(
                "kb-where-not-allowed",
                f"KB = {kb_table:.2f} taken at an end bearing or over {pack.kb_max_length.value * 1000:g} mm",
                "KB",
                kb_table,
            )
    kz_max = pack.kzcp_table.value.points[0][1]
    kzcp = inputs.value("KZcp")
    if kzcp < kz_max:
        variant(
            "kzcp-flat-plate", f"KZcp = {kz_max:.2f} taken for a plate or plank laid flat (or glulam)", "KZcp", kz_max
        )
    if kzcp > 1.0 + 1e-9:
        variant("kzcp-left-out", f"KZcp = 1.00 taken where the member's proportions give {kzcp:.2f}", "KZcp", 1.0)
    wider = max(member.b, other.b)
    width = check.contact.width if check.kind == LOCAL else near_support_width(check)
    if wider > width + 1e-9:
        variant(
            "wider-width-area",
            f"bearing area from the wider member's width ({wider * 1000:.0f} mm) "
            f"instead of the contact width ({width * 1000:.0f} mm)",
            implies={"width": wider},
            area=inputs.area * wider / width,
        )
    if inputs.value("KScp") < 1.0:
        variant("wet-factor-left-out", "the wet service factor KScp was left out", "KScp", 1.0)
    short = pack.kd["short"].value
    if g.duration != "short" and inputs.uses_duration:
        variant(
            "short-term-kd", f"KD = {short:.2f} (short term) used for a snow or occupancy combination", duration=short
        )
    if check.kind == NEAR:
        variant("two-thirds-left-out", "the 2/3 factor was left out of Qr'", "2/3", 1.0)
    standard_kd = pack.kd["standard"].value
    if g.duration == "standard" and inputs.uses_duration and kd < standard_kd - 1e-9:
        variant(
            "long-term-kd-ignored",
            f"KD = {standard_kd:.2f} taken although the dead load exceeds the standard-term load here "
            f"(the long-term formula gives {kd:.2f})",
            duration=standard_kd,
        )
    if inputs.angle is not None and inputs.fc_parallel is not None:
        slope = math.pi / 2 - inputs.angle
        if slope > 1e-6:
            variant(
                "hankinson-roof-slope",
                f"Hankinson's angle taken as the roof slope ({math.degrees(slope):.1f} deg) instead of the angle "
                f"between load and grain ({math.degrees(inputs.angle):.1f} deg)",
                angle=slope,
            )
    out += _species_slips(inputs, material, pack)
    return out


def _species_slips(inputs: ResistanceInputs, material: Material, pack: O86Pack) -> list[ResistanceSlip]:
    """The fcp of another species of the member's family used instead of its own."""
    own = inputs.factor("fcp")
    assert own is not None  # O86 states fcp at every check
    return [
        ResistanceSlip(
            "wrong-species-fcp",
            f"fcp of {species} ({strength.fcp.value / 1e6:.2f} MPa) used instead of {material.species} "
            f"({inputs.strength / 1e6:.2f} MPa)",
            (replace(own, value=strength.fcp.value),),
        )
        for species, strength in sorted(pack.fcp.get(material.family, {}).items())
        if species != material.species and abs(strength.fcp.value - inputs.strength) > 1.0
    ]


# ---------------------------------------------------------------- the standard, as the review sees it


@dataclass(frozen=True)
class _O86:
    """CSA O86 behind the standard interface (``standards/base.py``)."""

    id: str = "o86"
    title: str = "CSA O86"
    check_kinds: dict[str, str] = field(
        default_factory=lambda: {LOCAL: "local bearing", NEAR: "near-support bearing (loads within d of a support)"}
    )
    length_factor: str = "KB"
    symbols: dict[str, Symbol] = field(default_factory=lambda: SYMBOLS)  # its factors: role, how claims state them
    column_symbols: tuple[str, str] = (
        "KD",
        "Fcp",
    )  # the JSON columns of the duration factor and the strength it modifies
    force_symbols: tuple[str, str] = ("Qf", "Qr")  # CSA O86: factored force, factored resistance
    combination_formats: tuple[str, ...] = ("limit-states",)
    claim_headers: dict[str, str] = field(default_factory=dict)  # the default headers are O86's (Qf, Qr, KB)

    def read_pack(self, root: Node, path: str) -> O86Pack:
        return read_o86_pack(root, path)

    def list_checks(self, model: Model, flow: TakeDown, pack: PackCore, readings: dict[str, str]) -> CheckList:
        p = o86_pack(pack)
        return list_checks(model, flow, p, readings, p.near_reach.value)

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

    def claim_values(self, inputs: ResistanceInputs, duration: float) -> dict[str, float]:
        return factor_values(inputs, duration, SYMBOLS)

    def resistance_variants(self, result: CheckResult, model: Model, pack: PackCore, kd: float) -> list[ResistanceSlip]:
        return o86_slips(result, model, o86_pack(pack), kd)

    def duration_reason(
        self, check: RequiredCheck, forces: Forces, combination: Any, model: Model, pack: PackCore
    ) -> str:
        return load_duration_factor(forces, combination, o86_pack(pack))[1]


def o86_pack(pack: PackCore) -> O86Pack:
    return pack_as(pack, O86Pack)


O86 = _O86()
