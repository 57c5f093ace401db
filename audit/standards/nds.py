"""US NDS bearing perpendicular to grain (values as recalled), behind the standard interface.

    ASD:   Fc-perp' = Fc-perp CM Ct Ci Cb          P' = Fc-perp' Ab >= the ASD combination's force
    LRFD:  Fc-perp' = Fc-perp CM Ct Ci Cb KF phi   P' = Fc-perp' Ab >= the factored force
    Cb = (lb + 0.375 in) / lb for bearings shorter than 6 in and at least 3 in from the member end
    F-theta' = Fc* Fc-perp' / (Fc* sin^2 theta + Fc-perp' cos^2 theta)   bearing at an angle (Hankinson)

No load-duration factor applies to compression perpendicular to grain. The deformation-limit
reading takes 0.73 Fc-perp for a 0.02 in limit where the project chooses it. The checks are the
local bearing of each timber member at each contact, both directions; the NDS has no
near-support check.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import Any

from audit.core.errors import ErrorCollector, InputError
from audit.core.located_yaml import Node
from audit.core.units import parse_quantity
from audit.engine.contacts import shorter
from audit.engine.model import Material, Member, Model
from audit.engine.take_down import Forces, TakeDown
from audit.standards.checks import LOCAL, CheckList, RequiredCheck, local_only
from audit.standards.packs import (
    PACK_HEAD_KEYS,
    CombinationPack,
    PackCore,
    PackReader,
    Sourced,
    check_readings,
    read_choice,
    read_core_fields,
    refuse_unknown_fields,
)
from audit.standards.resistance import (
    COEFFICIENT,
    INCISING,
    LENGTH,
    RESISTANCE,
    SERVICE,
    STRENGTH,
    TEMPERATURE,
    CheckResult,
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

NDS_KEYS = (
    *PACK_HEAD_KEYS,
    "timber_families",
    "clauses",
    "fcp",
    "fc",
    "cm",
    "cm_parallel",
    "ct",
    "ci",
    "cb",
    "lrfd",
    "angle",
    "uplift",
    "deformation",
)
NDS_READINGS = {"deformation.limit": ("reference_0.04in", "limit_0.02in")}
INCH = 0.0254
# The NDS symbols: the role of each factor, and how a claim states it (no duration factor applies to Fc-perp)
SYMBOLS = {
    "Fc-perp": Symbol(STRENGTH, "stress"),
    "CM": Symbol(SERVICE),
    "Ct": Symbol(TEMPERATURE),
    "Ci": Symbol(INCISING),
    "Cb": Symbol(LENGTH),
    "KF": Symbol(COEFFICIENT),
    "phi": Symbol(RESISTANCE),
    "0.02 in": Symbol(COEFFICIENT),
}


@dataclass(frozen=True)
class NdsPack(PackCore):
    cm: dict[str, Sourced]  # family -> {dry, wet}, for Fc-perp
    cm_parallel: dict[str, Sourced]  # family -> {dry, wet}, for Fc (bearing at an angle)
    ct: Sourced
    ci: Sourced
    cb_max_length: Sourced  # m
    cb_min_end_distance: Sourced  # m
    cb_add: Sourced  # m
    kf: Sourced  # LRFD format conversion for Fc-perp
    phi: Sourced  # LRFD resistance factor
    kf_parallel: Sourced
    parallel_duration: Sourced  # {ASD: CD, LRFD: lambda} for Fc* at an angle
    deformation_factor: float  # Fc-perp at the 0.02 in limit as a share of the reference value

    def all_sourced(self) -> list[tuple[str, Sourced]]:
        out = self.core_sourced()
        out += [(f"cm.{k}", v) for k, v in self.cm.items()] + [
            (f"cm_parallel.{k}", v) for k, v in self.cm_parallel.items()
        ]
        out += [("ct", self.ct), ("ci", self.ci), ("cb.max_length", self.cb_max_length)]
        out += [("cb.min_end_distance", self.cb_min_end_distance), ("cb.add", self.cb_add)]
        out += [("lrfd.format_conversion", self.kf), ("lrfd.resistance_factor", self.phi)]
        out += [
            ("lrfd.format_conversion_parallel", self.kf_parallel),
            ("angle.parallel_duration", self.parallel_duration),
        ]
        out += [("uplift.note_below", self.uplift_note_below)]
        out += [(name, c.default) for name, c in self.choices.items()]
        return out


def _length(node: Node, _parent: Node) -> float:
    return parse_quantity(node.value, "length", node.loc)


def _number(node: Node, _parent: Node) -> float:
    if isinstance(node.value, bool) or not isinstance(node.value, (int, float)) or not 0 < node.value <= 10:
        raise InputError("expected a positive number", node.loc)
    return float(node.value)


def _pair(node: Node, _parent: Node) -> dict[str, float]:
    if not isinstance(node.value, dict) or not node.value:
        raise InputError("expected a mapping of numbers", node.loc)
    return {str(k): _number(v, node) for k, v in node.value.items()}


def read_nds_pack(root: Node, path: str) -> NdsPack:
    errors = ErrorCollector()
    r = PackReader(errors)
    refuse_unknown_fields(root, NDS_KEYS, "nds", errors)
    core = read_core_fields(root, r, errors, (LOCAL,))  # no near-support check: the local clause alone

    def sub(parent: Node | None, key: str) -> Node | None:
        return r.mapping(parent, key) if parent is not None else None

    cb, lrfd, angle = sub(root, "cb"), sub(root, "lrfd"), sub(root, "angle")
    by_family = {
        key: {f: s for f, n in (node.value.items() if node else []) if (s := r.sourced(n, _pair))}
        for key in ("cm", "cm_parallel")
        for node in [sub(root, key)]
    }
    values: dict[str, Any] = dict(
        ct=r.sourced(sub(root, "ct") if "ct" in root.value else None, _number),
        ci=r.sourced(sub(root, "ci") if "ci" in root.value else None, _number),
        cb_max_length=r.sourced(sub(cb, "max_length"), _length),
        cb_min_end_distance=r.sourced(sub(cb, "min_end_distance"), _length),
        cb_add=r.sourced(sub(cb, "add"), _length),
        kf=r.sourced(sub(lrfd, "format_conversion"), _number),
        phi=r.sourced(sub(lrfd, "resistance_factor"), _number),
        kf_parallel=r.sourced(sub(lrfd, "format_conversion_parallel"), _number),
        parallel_duration=r.sourced(sub(angle, "parallel_duration"), _pair),
    )
    choices = {}
    deformation = sub(sub(root, "deformation"), "limit")
    factor = 0.73
    if deformation is not None:
        choice = read_choice(r, deformation, "deformation.limit")
        if choice is not None:
            check_readings(choice, deformation, NDS_READINGS, "nds", errors)
            choices[choice.name] = choice
        if "factor_0.02in" in deformation.value:
            factor = _number(deformation.value["factor_0.02in"], deformation)
    errors.raise_if_any()
    missing = [k for k, v in {**core, **values}.items() if v is None]
    if missing or "deformation.limit" not in choices:
        raise InputError(f"rule pack lacks {', '.join(missing) or 'deformation.limit'}", root.loc)
    return NdsPack(
        id=r.text(root, "id"),
        title=r.text(root, "title", ""),
        edition=r.text(root, "edition", ""),
        provenance=r.text(root, "provenance", ""),
        path=path,
        standard="nds",
        choices=choices,
        cm=by_family["cm"],
        cm_parallel=by_family["cm_parallel"],
        deformation_factor=factor,
        **core,
        **values,
    )


# ---------------------------------------------------------------- factors


def bearing_area_factor(length: float, end_distance: float, material: Material, pack: NdsPack) -> Factor:
    """Cb = (lb + 0.375 in) / lb for lb under 6 in, at least 3 in from the member end; else 1.00 (the numbers are
    the pack's)."""
    clause = pack.cb_add.clause
    if material.family == "engineered" and "KB" not in material.applies:
        return Factor("Cb", 1.0, "Cb = 1.00: the product's evaluation report does not allow Cb", clause)
    if not shorter(length, pack.cb_max_length.value):  # ties at the stated resolution
        return Factor(
            "Cb",
            1.0,
            f"Cb = 1.00: bearing length {length / INCH:.2f} in is not under {_in(pack.cb_max_length.value)}",
            clause,
        )
    if shorter(end_distance, pack.cb_min_end_distance.value):
        return Factor(
            "Cb",
            1.0,
            f"Cb = 1.00: bearing {end_distance / INCH:.2f} in from the member end, less than "
            f"{_in(pack.cb_min_end_distance.value)}",
            clause,
        )
    value = (length + pack.cb_add.value) / length
    return Factor(
        "Cb",
        value,
        f"Cb = ({length / INCH:.3f} + {pack.cb_add.value / INCH:g})/{length / INCH:.3f} = {value:.3f}",
        clause,
    )


def _in(length: float) -> str:
    """A pack's length as the NDS states it: '6 in', '3 in'."""
    return f"{length / INCH:g} in"


def _wet(member: Member, material: Material, table: dict[str, Sourced], what: str) -> Factor:
    if material.family == "engineered":
        value = material.wet_factor if member.service == "wet" and material.wet_factor is not None else 1.0
        return Factor("CM", value, f"CM = {value:.2f}: {member.service} service, product report")
    entry = table[material.family]
    value = entry.value[member.service]
    return Factor("CM", value, f"CM = {value:.2f}: {member.service} service ({what})", entry.clause)


def nds_inputs(
    check: RequiredCheck, model: Model, pack: NdsPack, lrfd: bool, readings: dict[str, str]
) -> tuple[ResistanceInputs, tuple[Factor, ...], str]:
    member = model.members[check.member]
    material = model.materials[member.material]
    fcp_value, face_text = fcp_on_face(check, material)
    fcp = Factor(
        "Fc-perp",
        fcp_value,
        f"Fc-perp = {fcp_value / 6894.757:.0f} psi: {material.family.replace('_', ' ')} {material.species} "
        f"{material.grade}{face_text}".rstrip(),
    )
    cm = _wet(member, material, pack.cm, "Fc-perp")
    ct = Factor("Ct", pack.ct.value, f"Ct = {pack.ct.value:.2f}: sustained temperature up to 100 F", pack.ct.clause)
    ci = Factor("Ci", pack.ci.value, f"Ci = {pack.ci.value:.2f}: incising factor for Fc-perp", pack.ci.clause)
    c = check.contact
    cb = bearing_area_factor(c.length, c.end_distance, material, pack)
    deformation = 1.0
    if readings["deformation.limit"] == "limit_0.02in":
        deformation = pack.deformation_factor
    fc_parallel = None
    if check.angle is not None and abs(check.angle - 1.5707963267948966) > 1e-9:
        if material.fc is None:
            raise InputError(
                f"bearing at an angle on '{member.id}' needs Fc for material '{material.id}'", material.loc
            )
        duration = pack.parallel_duration.value["LRFD" if lrfd else "ASD"]
        cm_par = _wet(member, material, pack.cm_parallel, "Fc").value
        fc_parallel = material.fc * cm_par * pack.ct.value * (pack.kf_parallel.value if lrfd else 1.0) * duration
    area = c.length * c.width
    factors = [fcp, cm, ct, ci, cb]
    if lrfd:
        factors += lrfd_factors(pack)
    if deformation != 1.0:
        factors.append(deformation_factor(deformation))
    placed = with_roles(tuple(factors), SYMBOLS)
    inputs = ResistanceInputs(
        factors=placed, area=area, uses_duration=False, fc_parallel=fc_parallel, angle=check.angle
    )
    area_reason = (
        f"Ab = {c.width / INCH:.2f} x {c.length / INCH:.2f} = {area / INCH**2:.2f} in²: width: {c.width_note}; "
        f"length: {c.length_note}"
    )
    return inputs, placed, area_reason


def lrfd_factors(pack: NdsPack) -> list[Factor]:
    """KF and phi, the LRFD format conversion and resistance factor for Fc-perp."""
    kf, phi = pack.kf.value, pack.phi.value
    return [
        Factor("KF", kf, f"KF = {kf:.2f}: LRFD format conversion", pack.kf.clause, COEFFICIENT),
        Factor("phi", phi, f"phi = {phi:.2f}: LRFD resistance factor", pack.phi.clause, RESISTANCE),
    ]


def deformation_factor(value: float) -> Factor:
    return Factor("0.02 in", value, f"{value:.2f} Fc-perp: 0.02 in deformation limit", "", COEFFICIENT)


def _no_duration(_forces: Forces, _combo: LoadCombination) -> tuple[float, str]:
    return 1.0, "no load-duration factor on Fc-perp (NDS 2.3.2)"


# ---------------------------------------------------------------- the standard


@dataclass(frozen=True)
class _Nds:
    id: str = "nds"
    title: str = "US NDS"
    check_kinds: dict[str, str] = field(default_factory=lambda: {LOCAL: "bearing perpendicular to grain"})
    length_factor: str = "Cb"
    symbols: dict[str, Symbol] = field(default_factory=lambda: SYMBOLS)  # its factors: role, how claims state them
    column_symbols: tuple[str, str] = (
        "no duration factor",
        "Fc-perp CM Ct",
    )  # the JSON columns of the duration factor and the strength it modifies
    force_symbols: tuple[str, str] = ("P", "P'")  # NDS: the force on the bearing, its adjusted capacity
    combination_formats: tuple[str, ...] = ("ASD", "LRFD")
    claim_headers: dict[str, str] = field(
        default_factory=lambda: {
            "Qf": r"^(p|applied(\s+load)?|reaction)\b(?!\s*')",
            "Qr": r"^(p\s*'|p\s*allow|allowable(\s+(load|bearing))?|capacity)",
            "KB": r"^c\s*b$",
            "fcp": r"^f\s*c\s*-?\s*(perp|⊥)",
        }
    )

    def read_pack(self, root: Node, path: str) -> NdsPack:
        return read_nds_pack(root, path)

    def list_checks(self, model: Model, flow: TakeDown, pack: PackCore, readings: dict[str, str]) -> CheckList:
        return local_only(model, flow, pack)

    def resist(
        self, checklist: CheckList, model: Model, pack: PackCore, cpack: CombinationPack
    ) -> tuple[CheckResult, ...]:
        p = nds_pack(pack)
        readings = p.in_force(model.project.readings)
        lrfd = cpack.format == "LRFD"
        return resist_each(
            checklist,
            model,
            cpack,
            lambda check: nds_inputs(check, model, p, lrfd, readings),
            lambda check, inputs: _no_duration,
            lambda check: 1.0,
        )

    def formula(self, kind: str) -> str:
        return "P' = Fc-perp' Ab, Fc-perp' = Fc-perp CM Ct Ci Cb (LRFD: x KF phi)"

    def assumption_lines(self, review: Any) -> dict[str, str]:
        fmt = review.cpack.format
        return {
            "duration": f"NDS, {fmt}: no load-duration factor applies to compression perpendicular to grain; "
            + (
                "the LRFD resistance is Fc-perp' Ab with KF and phi from the rule pack."
                if fmt == "LRFD"
                else "the allowable bearing force Fc-perp' Ab is compared with each ASD combination's force."
            )
            + " The NDS has no near-support check: each contact is checked on both members.",
        }

    def claim_values(self, inputs: ResistanceInputs, duration: float) -> dict[str, float]:
        return factor_values(inputs, duration, SYMBOLS)

    def resistance_variants(self, result: CheckResult, model: Model, pack: PackCore, kd: float) -> list[ResistanceSlip]:
        p, inputs, c = nds_pack(pack), result.inputs, result.check.contact
        out: list[ResistanceSlip] = []

        def set_to(symbol: str, value: float) -> tuple[Factor, ...]:
            found = inputs.factor(symbol)
            return () if found is None else (replace(found, value=value),)

        if inputs.value("Cb") == 1.0 and shorter(c.length, p.cb_max_length.value):
            cb = (c.length + p.cb_add.value) / c.length
            text = f"Cb = {cb:.2f} taken within {_in(p.cb_min_end_distance.value)} of the member end"
            out.append(ResistanceSlip("cb-where-not-allowed", text, set_to("Cb", cb)))
        if inputs.value("CM") < 1.0:
            text = "the wet service factor CM was left out"
            out.append(ResistanceSlip("wet-factor-left-out", text, set_to("CM", 1.0)))
        if inputs.factor("phi") is not None:
            asd = set_to("phi", 1.0) + set_to("KF", 1.0)
            out.append(ResistanceSlip("lrfd-factors-left-out", "the ASD value used in LRFD (KF and phi left out)", asd))
        else:
            lrfd = tuple(lrfd_factors(p))
            out.append(ResistanceSlip("lrfd-value-in-asd", "the LRFD value (x KF phi) used in ASD", lrfd))
        if inputs.factor("0.02 in") is None:
            factor = p.deformation_factor
            text = f"Fc-perp at the 0.02 in limit ({factor:.2f} Fc-perp) used"
            out.append(ResistanceSlip("deformation-limit", text, (deformation_factor(factor),)))
        return out

    def duration_reason(
        self, check: RequiredCheck, forces: Forces, combination: Any, model: Model, pack: PackCore
    ) -> str:
        return _no_duration(forces, combination)[1]


def nds_pack(pack: PackCore) -> NdsPack:
    return pack_as(pack, NdsPack)


NDS = _Nds()
