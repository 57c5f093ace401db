"""EN 1995-1-1 compression perpendicular to grain (6.1.5, values as recalled), behind the standard interface.

    sigma_c,90,d = Fc,90,d / Aef  <=  kc,90 fc,90,d          fc,90,d = kmod fc,90,k / gamma_M
    Aef = b lef,  lef = l + min(30 mm, a or l1/2, l) each side (a: the distance to the member end,
                  l1: the clear distance to the next contact on the same face, l: the contact length)
    kc,90: 1.25 (solid) / 1.5 (glulam) on continuous supports, 1.5 / 1.75 on discrete supports
           (glulam: contact length up to 400 mm), where the clear distance l1 to the next contact
           is at least 2h; 1.0 otherwise

At a stated angle alpha between load and grain (6.2.2, as recalled) the resistance is
    fc,alpha,d Aef,  fc,alpha,d = fc,0,d / (fc,0,d / (kc,90 fc,90,d) sin^2 alpha + cos^2 alpha)
with Aef = b l, the contact without the 30 mm extensions of 6.1.5 (the conservative reading).

kmod is that of the shortest-duration action present in each combination (3.1.3(2)), by
service class (dry: classes 1 and 2; wet: class 3). Each contact is checked on both members;
EN 1995-1-1 has no near-support check. The spacing condition l1 >= 2h is EC5's own: it is
stated with each kc,90.
"""

from __future__ import annotations

import math
from collections import defaultdict
from dataclasses import dataclass, field, replace
from typing import Any

from audit.core.errors import ErrorCollector, InputError
from audit.core.located_yaml import Node
from audit.core.units import parse_quantity
from audit.engine.contacts import Contact, longer, shorter
from audit.engine.model import STORAGE_LIVE, Model, base_case
from audit.engine.take_down import Forces, TakeDown, force_floor
from audit.standards.checks import LOCAL, CheckList, RequiredCheck, local_only
from audit.standards.packs import (
    PACK_HEAD_KEYS,
    CombinationPack,
    PackCore,
    PackReader,
    Sourced,
    read_core_fields,
    refuse_unknown_fields,
)
from audit.standards.resistance import (
    ANGLE,
    DERIVED,
    DURATION,
    LENGTH,
    MATERIAL,
    STRENGTH,
    CheckResult,
    Factor,
    LoadCombination,
    ResistanceInputs,
    ResistanceSlip,
    Symbol,
    factor_values,
    pack_as,
    resist_each,
    with_roles,
)

EC5_KEYS = (
    *PACK_HEAD_KEYS,
    "timber_families",
    "clauses",
    "fcp",
    "fc",
    "gamma_m",
    "kmod",
    "duration_classes",
    "contact",
    "kc90",
    "uplift",
)
CLASSES = ("permanent", "long", "medium", "short", "instantaneous")  # longest to shortest
# EN 1995-1-1's symbols: the role of each factor, and how a claim states it
SYMBOLS = {
    "fc,90,k": Symbol(STRENGTH, "stress"),
    "gamma_M": Symbol(MATERIAL),
    "kc,90": Symbol(LENGTH),
    "alpha": Symbol(ANGLE),
    "kmod": Symbol(DURATION),
    "fc,90,d": Symbol(DERIVED, "stress"),  # kmod fc,90,k / gamma_M, as calcs print it
}


@dataclass(frozen=True)
class Ec5Pack(PackCore):
    gamma_m: dict[str, Sourced]
    kmod: Sourced  # service -> class -> kmod
    duration_classes: Sourced  # load case -> class
    extension: Sourced  # m, each side
    kc90: Sourced  # arrangement -> family -> kc,90
    kc90_spacing: float  # l1 >= spacing x h
    kc90_glulam_max_length: float  # m

    def all_sourced(self) -> list[tuple[str, Sourced]]:
        out = self.core_sourced() + [(f"gamma_m.{k}", v) for k, v in self.gamma_m.items()]
        out += [("kmod", self.kmod), ("duration_classes", self.duration_classes)]
        out += [
            ("contact.extension", self.extension),
            ("kc90", self.kc90),
            ("uplift.note_below", self.uplift_note_below),
        ]
        return out


def _number(node: Node, _parent: Node) -> float:
    if isinstance(node.value, bool) or not isinstance(node.value, (int, float)) or not 0 < node.value <= 10:
        raise InputError("expected a positive number", node.loc)
    return float(node.value)


def _classes(node: Node, _parent: Node) -> dict[str, str]:
    if not isinstance(node.value, dict):
        raise InputError("expected load case -> load-duration class", node.loc)
    for item in node.value.values():
        if item.value not in CLASSES:
            raise InputError(f"'{item.value}' is not a load-duration class ({', '.join(CLASSES)})", item.loc)
    return {str(k): str(v.value) for k, v in node.value.items()}


def _kmod(node: Node, _parent: Node) -> dict[str, dict[str, float]]:
    if not isinstance(node.value, dict) or set(node.value) != {"dry", "wet"}:
        raise InputError("expected {dry: {...}, wet: {...}}", node.loc)
    out = {}
    for service, row in node.value.items():
        if not isinstance(row.value, dict) or set(row.value) != set(CLASSES):
            raise InputError(f"expected kmod for each class: {', '.join(CLASSES)}", row.loc)
        out[service] = {k: _number(v, row) for k, v in row.value.items()}
    return out


def _kc90(node: Node, _parent: Node) -> dict[str, dict[str, float]]:
    if not isinstance(node.value, dict) or set(node.value) != {"continuous", "discrete"}:
        raise InputError("expected {continuous: {family: kc90}, discrete: {family: kc90}}", node.loc)
    return {k: {f: _number(v, row) for f, v in row.value.items()} for k, row in node.value.items()}


def read_ec5_pack(root: Node, path: str) -> Ec5Pack:
    errors = ErrorCollector()
    r = PackReader(errors)
    refuse_unknown_fields(root, EC5_KEYS, "ec5", errors)
    core = read_core_fields(root, r, errors, (LOCAL,))  # no near-support check: the local clause alone
    gamma = r.mapping(root, "gamma_m")
    contact = r.mapping(root, "contact")
    kc90 = r.mapping(root, "kc90")
    values: dict[str, Any] = dict(
        gamma_m={f: s for f, n in (gamma.value.items() if gamma else []) if (s := r.sourced(n, _number))},
        kmod=r.sourced(r.mapping(root, "kmod"), _kmod),
        duration_classes=r.sourced(r.mapping(root, "duration_classes"), _classes),
        extension=r.sourced(r.mapping(contact, "extension") if contact else None, lambda n, p: _length(n)),
        kc90=r.sourced(kc90, _kc90),
    )
    spacing, glulam_max = 2.0, 0.4
    try:
        if kc90 is not None and "spacing" in kc90.value:
            spacing = _number(kc90.value["spacing"], kc90)
        if kc90 is not None and "glulam_max_length" in kc90.value:
            glulam_max = _length(kc90.value["glulam_max_length"])
    except InputError as exc:
        errors.extend(exc)
    errors.raise_if_any()
    missing = [k for k, v in {**core, **values}.items() if v is None]
    if missing:
        raise InputError(f"rule pack lacks {', '.join(missing)}", root.loc)
    return Ec5Pack(
        id=r.text(root, "id"),
        title=r.text(root, "title", ""),
        edition=r.text(root, "edition", ""),
        provenance=r.text(root, "provenance", ""),
        path=path,
        standard="ec5",
        choices={},
        kc90_spacing=spacing,
        kc90_glulam_max_length=glulam_max,
        **core,
        **values,
    )


def _length(node: Node) -> float:
    value = parse_quantity(node.value, "length", node.loc)
    if value < 0:
        raise InputError("a length must not be negative", node.loc)
    return value


# ---------------------------------------------------------------- geometry of 6.1.5


@dataclass(frozen=True)
class Reach:
    """How far a contact may spread along the member, and the clear distance to its neighbours."""

    left: float  # m added before the contact
    right: float  # m added after it
    clear: float  # m, l1: the clear distance to the nearest other contact on the same face (inf: none)
    why: str


def effective_reach(contact: Contact, others: list[Contact], length: float, extension: float) -> Reach:
    """Each side's extension is min(``extension``, a or l1/2, l) (EN 1995-1-1 6.1.5(1), from memory: verify): no
    more than the distance a to the member end, half the clear distance l1 to the next contact on the same face,
    nor the contact's own length l."""
    start, end = contact.start, contact.start + contact.length
    before = [o.start + o.length for o in others if o.start + o.length <= start + 1e-9]
    after = [o.start for o in others if o.start >= end - 1e-9]
    gap_left = start - max(before) if before else math.inf
    gap_right = min(after) - end if after else math.inf
    own = contact.length
    left = min(extension, start, gap_left / 2, own)
    right = min(extension, length - end, gap_right / 2, own)
    limits = []
    for side, added, to_end, gap in (("left", left, start, gap_left), ("right", right, length - end, gap_right)):
        if added < extension - 1e-9:
            bound = min(
                [(to_end, "member end"), (gap / 2, "half way to the next contact"), (own, "the contact length l")],
                key=lambda b: b[0],
            )[1]
            limits.append(f"{side} {added * 1000:.0f} mm ({bound})")
    why = "; ".join(limits) or f"{extension * 1000:.0f} mm each side"
    return Reach(max(left, 0.0), max(right, 0.0), min(gap_left, gap_right), why)


ANGLE_CLAUSE = "EN 1995-1-1 6.2.2"


def at_an_angle(check: RequiredCheck) -> float | None:
    """The stated angle between load and grain, or None for a load perpendicular to the grain."""
    if check.angle is None or abs(check.angle - math.pi / 2) < 1e-9:
        return None
    return check.angle


def kc90_factor(check: RequiredCheck, model: Model, pack: Ec5Pack, reach: Reach) -> Factor:
    member = model.members[check.member]
    family = model.materials[member.material].family
    clause = pack.kc90.clause
    if check.face == "bottom" and not member.continuous:
        arrangement = "discrete"
    elif member.continuous:
        arrangement = "continuous"
    else:
        return Factor("kc,90", 1.0, "kc,90 = 1.00: a load on a member on discrete supports", clause)
    need = pack.kc90_spacing * member.d
    if shorter(reach.clear, need):  # ties at the stated resolution, alike in SI and US input
        return Factor(
            "kc,90",
            1.0,
            f"kc,90 = 1.00: the next contact is {reach.clear * 1000:.0f} mm away, less than {pack.kc90_spacing:g}h = "
            f"{need * 1000:.0f} mm "
            "(the spacing condition)",
            clause,
        )
    if arrangement == "discrete" and family == "glulam" and longer(check.contact.length, pack.kc90_glulam_max_length):
        return Factor(
            "kc,90",
            1.0,
            f"kc,90 = 1.00: glulam contact {check.contact.length * 1000:.0f} mm over "
            f"{pack.kc90_glulam_max_length * 1000:g} mm",
            clause,
        )
    value = pack.kc90.value[arrangement].get(family, 1.0)
    spaced = (
        "no other contact on the face"
        if math.isinf(reach.clear)
        else f"l1 = {reach.clear * 1000:.0f} mm >= {pack.kc90_spacing:g}h"
    )
    return Factor("kc,90", value, f"kc,90 = {value:.2f}: {arrangement} support, {family}, {spaced}", clause)


def ec5_inputs(
    check: RequiredCheck, model: Model, pack: Ec5Pack, reach: Reach
) -> tuple[ResistanceInputs, tuple[Factor, ...], str]:
    member = model.members[check.member]
    material = model.materials[member.material]
    if material.family not in pack.gamma_m:
        raise InputError(f"rule pack {pack.id} gives no gamma_M for {material.family}", material.loc)
    gamma = pack.gamma_m[material.family]
    fc90k = material.fcp or 0.0
    c = check.contact
    angle = at_an_angle(check)
    if angle is not None:
        reach = replace(reach, left=0.0, right=0.0, why="none at an angle to the grain")
    lef = c.length + reach.left + reach.right
    area = c.width * lef
    kc90 = kc90_factor(check, model, pack, reach)
    family_words = material.family.replace("_", " ")
    factors: tuple[Factor, ...] = (
        Factor("fc,90,k", fc90k, f"fc,90,k = {fc90k / 1e6:.2f} MPa: {material.species}", ""),
        Factor("gamma_M", gamma.value, f"gamma_M = {gamma.value:.2f}: {family_words}", gamma.clause),
        kc90,
    )
    if angle is not None:
        if material.fc is None:
            raise InputError(
                f"bearing at an angle on '{member.id}' needs fc,0,k (EN 1995-1-1 6.2.2) for material "
                f"'{material.id}'; the rule pack has none for {material.family.replace('_', ' ')} {material.species}",
                material.loc,
            )
        factors += (
            Factor(
                "alpha",
                math.degrees(angle),
                f"alpha = {math.degrees(angle):.1f} deg between load and grain: fc,alpha,d = fc,0,d / "
                f"(fc,0,d / (kc,90 fc,90,d) sin² alpha + cos² alpha), fc,0,k = {material.fc / 1e6:.1f} MPa",
                ANGLE_CLAUSE,
            ),
        )
    factors = with_roles(factors, SYMBOLS)
    inputs = ResistanceInputs(
        factors=factors,
        area=area,
        uses_duration=True,
        fc_parallel=material.fc if angle is not None else None,  # x kmod / gamma_M in ``resistance``: fc,0,d
        angle=angle,
    )
    area_reason = (
        f"Aef = b lef = {c.width * 1000:.0f} x ({c.length * 1000:.0f} + {reach.left * 1000:.0f} + "
        f"{reach.right * 1000:.0f}) = {area * 1e6:,.0f} mm²: extension {reach.why}; width: {c.width_note}"
    )
    if angle is not None:
        area_reason = (
            f"A = b l = {c.width * 1000:.0f} x {c.length * 1000:.0f} = {area * 1e6:,.0f} mm²: at an angle to the "
            f"grain, the contact without the {pack.extension.value * 1000:g} mm extensions of 6.1.5 (6.2.2; "
            f"conservative reading); width: {c.width_note}"
        )
    return inputs, factors, area_reason


def kmod_rule(pack: Ec5Pack, service: str):
    classes, table = pack.duration_classes.value, pack.kmod.value[service]

    def rule(forces: Forces, combo: LoadCombination) -> tuple[float, str]:
        floor = force_floor(forces.values())  # relative to the load here: alike for scaled loads
        present = [
            classes.get(case, classes.get(base_case(case), "permanent"))  # L:storage has a class of its own
            for case, factor in combo.factors.items()
            if factor and abs(forces.get(case, 0.0)) > floor
        ] or ["permanent"]
        shortest = max(present, key=CLASSES.index)
        value = table[shortest]
        return value, f"kmod = {value:.2f}: {shortest}-term action the shortest in {combo.name} ({service})"

    return rule


def reaches(checks: tuple[RequiredCheck, ...], model: Model, pack: Ec5Pack) -> dict[str, Reach]:
    """Each check's reach, from the other contacts on the same face of the same member."""
    by_face: dict[tuple[str, str], list[RequiredCheck]] = defaultdict(list)
    for c in checks:
        by_face[(c.member, c.face)].append(c)
    out = {}
    for (member_id, _), group in by_face.items():
        length = model.members[member_id].length
        for c in group:
            others = [o.contact for o in group if o.id != c.id]
            out[c.id] = effective_reach(c.contact, others, length, pack.extension.value)
    return out


# ---------------------------------------------------------------- the standard


@dataclass(frozen=True)
class _Ec5:
    id: str = "ec5"
    title: str = "EN 1995-1-1"
    check_kinds: dict[str, str] = field(default_factory=lambda: {LOCAL: "compression perpendicular to the grain"})
    length_factor: str = "kc,90"
    symbols: dict[str, Symbol] = field(default_factory=lambda: SYMBOLS)  # its factors: role, how claims state them
    column_symbols: tuple[str, str] = (
        "kmod",
        "kmod fc,90,k",
    )  # the JSON columns of the duration factor and the strength it modifies
    force_symbols: tuple[str, str] = ("Fc,90,d", "Fc,90,Rd")  # EN 1995: design force, design resistance
    combination_formats: tuple[str, ...] = ("EN 1990",)
    # how its calc sheets mark decimals, for the PDF reader: a comma in most countries that use it (common
    # practice; British and Irish sheets print points: extract --decimal-mark point)
    decimal_mark: str = "comma"
    claim_headers: dict[str, str] = field(
        default_factory=lambda: {
            "Qf": r"^(?-i:F)\s*_?\s*c\s*,?\s*90\s*,?\s*d\b",
            "Qr": r"^(?-i:F)\s*_?\s*c\s*,?\s*90\s*,?\s*R\s*d\b",
            "KB": r"^k\s*_?\s*c\s*,?\s*90$",
            # the characteristic strength only: a design value fc,90,d column is not fc,90,k
            "fcp": r"^(?-i:f)\s*_?\s*c\s*,?\s*90\s*,?\s*k\b",
            "utilisation": r"^(sigma|σ)",
        }
    )

    def read_pack(self, root: Node, path: str) -> Ec5Pack:
        return read_ec5_pack(root, path)

    def list_checks(self, model: Model, flow: TakeDown, pack: PackCore, readings: dict[str, str]) -> CheckList:
        return local_only(model, flow, pack)

    def resist(
        self, checklist: CheckList, model: Model, pack: PackCore, cpack: CombinationPack
    ) -> tuple[CheckResult, ...]:
        p = ec5_pack(pack)
        reach = reaches(checklist.checks, model, p)

        def service(check: RequiredCheck) -> str:
            return model.members[check.member].service

        return resist_each(
            checklist,
            model,
            cpack,
            lambda check: ec5_inputs(check, model, p, reach[check.id]),
            lambda check, inputs: kmod_rule(p, service(check)),
            lambda check: p.kmod.value[service(check)]["medium"],
        )

    def formula(self, kind: str) -> str:
        return "Fc,90,Rd = kc,90 fc,90,d Aef, fc,90,d = kmod fc,90,k / gamma_M"

    def assumption_lines(self, review: Any) -> dict[str, str]:
        p = ec5_pack(review.pack)
        storage_class = p.duration_classes.value.get(STORAGE_LIVE, p.duration_classes.value.get("L", "medium"))
        return {
            "storage": f" ({review.cpack.storage_companion.value:g} as a companion) and is a {storage_class}-term "
            "action for kmod",
            "duration": "EN 1995-1-1: each combination takes the kmod of its shortest-duration action present at "
            "the check (service classes 1 and 2 as dry, 3 as wet); the contact length spreads up to "
            f"{p.extension.value * 1000:g} mm each side "
            "(Aef), each side no more than the end distance a, half the clear distance l1/2 to the next contact, or "
            f"the contact length l; kc,90 follows the support arrangement where the next contact is at least "
            f"{p.kc90_spacing:g}h away. A "
            "contact with a stated angle between load and grain is checked for compression at an angle (6.2.2, "
            "fc,0,k from the rule pack) on its contact area b l without the extensions (the conservative reading). "
            "EN 1995-1-1 has no near-support check: each contact is checked on both members.",
        }

    def claim_values(self, inputs: ResistanceInputs, duration: float) -> dict[str, float]:
        out = factor_values(inputs, duration, SYMBOLS)
        out["fc,90,d"] = inputs.strength * duration / inputs.value("gamma_M")  # fc,90,d = kmod fc,90,k / gamma_M
        return out

    def resistance_variants(self, result: CheckResult, model: Model, pack: PackCore, kd: float) -> list[ResistanceSlip]:
        p, inputs, c = ec5_pack(pack), result.inputs, result.check.contact
        member = model.members[result.check.member]
        family = model.materials[member.material].family
        out: list[ResistanceSlip] = []
        bare = c.width * c.length
        if inputs.area > bare + 1e-12:
            text = f"the contact length used without the {p.extension.value * 1000:g} mm each side"
            out.append(ResistanceSlip("no-effective-length", text, area=bare))
        kc90 = inputs.factor("kc,90")
        if kc90 is not None and kc90.value == 1.0:
            for arrangement in ("continuous", "discrete"):
                value = p.kc90.value[arrangement].get(family, 1.0)
                text = f"kc,90 = {value:.2f} ({arrangement} support) taken where it does not apply"
                out.append(
                    ResistanceSlip(
                        f"kc90-{arrangement}-not-allowed",
                        text + " (spacing, length or arrangement)",
                        (replace(kc90, value=value),),
                    )
                )
        gamma = inputs.factor("gamma_M")
        if gamma is not None and gamma.value > 1.0:
            text = "gamma_M left out (characteristic, not design, strength)"
            out.append(ResistanceSlip("gamma-m-left-out", text, (replace(gamma, value=1.0),)))
        service = "wet" if member.service == "wet" else "dry"
        for name in ("medium", "short", "instantaneous"):
            value = p.kmod.value[service][name]
            if value > result.governing.kd + 1e-9:
                out.append(
                    ResistanceSlip(
                        f"kmod-{name}", f"kmod = {value:.2f} ({name}-term) used for a longer action", duration=value
                    )
                )
        return out

    def duration_reason(
        self, check: RequiredCheck, forces: Forces, combination: Any, model: Model, pack: PackCore
    ) -> str:
        return kmod_rule(ec5_pack(pack), model.members[check.member].service)(forces, combination)[1]


def ec5_pack(pack: PackCore) -> Ec5Pack:
    return pack_as(pack, Ec5Pack)


EC5 = _Ec5()
