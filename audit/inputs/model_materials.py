"""The model's ``materials``: each a family with a species and grade of the rule pack, or stated strengths."""

from __future__ import annotations

from audit.core.errors import ErrorCollector
from audit.core.located_yaml import Node
from audit.core.suggest import did_you_mean
from audit.engine.model import Load, Material, Member
from audit.inputs.fields import FieldReader, describe_value
from audit.inputs.model_keys import ENGINEERED_FACTORS, MATERIAL_KEYS
from audit.standards.packs import ALL_FAMILIES, PackCore


def read_materials(node: Node, pack: PackCore, errors: ErrorCollector) -> dict[str, Material]:
    if not isinstance(node.value, dict):
        errors.add(f"expected a mapping of material id to material, got {describe_value(node.value)}", node.loc)
        return {}
    out: dict[str, Material] = {}
    for mat_id, mat_node in node.value.items():
        f = FieldReader(mat_node, MATERIAL_KEYS, errors, f"material '{mat_id}'")
        family = f.choice("family", ALL_FAMILIES)
        if not f.ok:
            continue
        material = _material_of_family(mat_id, family, f, pack, errors)
        if material is not None and f.ok:
            out[mat_id] = material
    return out


def _material_of_family(
    mat_id: str, family: str, f: FieldReader, pack: PackCore, errors: ErrorCollector
) -> Material | None:
    loc = f.node.loc
    if family == "engineered":
        from audit.standards import plausible

        fcp = f.quantity("fcp", "stress", positive=True)
        fc = f.quantity("fc", "stress", required=False, positive=True)
        bounds = plausible.ranges()
        for key, value, within in (("fcp", fcp, bounds.fcp), ("fc", fc, bounds.fc)):
            if value is not None and not plausible.check(value, within.get(family), key, f.loc(key), errors):
                return None
        source = f.text("source")
        applies: set[str] = set()
        if f.has("factors"):
            fnode = f.map["factors"]
            if not isinstance(fnode.value, list):
                errors.add("factors must be a list such as [KD, KScp, KB]", fnode.loc)
                return None
            for item in fnode.value:
                if item.value not in ENGINEERED_FACTORS:
                    errors.add(f"unknown factor '{item.value}' (known: {', '.join(ENGINEERED_FACTORS)})", item.loc)
                    return None
                applies.add(item.value)
        else:
            errors.add(
                "missing field 'factors': say which O86 factors apply to this product", f.node.child_loc("factors")
            )
            return None
        wet = f.number("wet_factor", 0.01, 1.0, -1.0)
        return Material(
            mat_id,
            family,
            fcp=fcp,
            fc=fc,
            applies=frozenset(applies),
            wet_factor=None if wet < 0 else wet,
            source=source,
            loc=loc,
        )
    if family not in pack.timber_families.value:
        return Material(mat_id, family, source=f.text("source", required=False), loc=loc)
    species = f.text("species")
    grade = f.text("grade")
    if not f.ok:
        return None
    table = pack.fcp.get(family, {})
    species = next((name for name in table if name.casefold() == species.casefold()), species)
    if species not in table:
        errors.add(
            f"species '{species}' is not in rule pack {pack.id} for {family}{did_you_mean(species, table)} "
            f"(known: {', '.join(table) or 'none'})",
            f.loc("species"),
        )
        return None
    strength = table[species]
    grade = next((name for name in strength.grades if name.casefold() == grade.casefold()), grade)
    if strength.grades and grade not in strength.grades:
        errors.add(
            f"grade '{grade}' is not listed for {family} {species} in rule pack {pack.id}"
            f"{did_you_mean(grade, strength.grades)} (known: {', '.join(strength.grades)})",
            f.loc("grade"),
        )
        return None
    for key in ("fcp", "factors", "wet_factor"):
        if f.has(key):
            errors.add(f"'{key}' is only for engineered products; {family} takes it from the rule pack", f.loc(key))
            return None
    return Material(
        mat_id,
        family,
        species,
        grade,
        fcp=strength.fcp.value,
        fcp_tension_face=strength.tension_face.value if strength.tension_face else None,
        fc=pack.fc_for(family, species, grade),
        source=f.text("source", required=False),
        loc=loc,
    )


def light_load_warnings(
    members: dict[str, Member], materials: dict[str, Material], loads: tuple[Load, ...], pack: PackCore
) -> list[str]:
    from audit.standards import plausible

    def timber(m: Member) -> bool:
        return m.material in materials and pack.is_timber(materials[m.material].family)

    return plausible.light_load_warnings(members, loads, timber)
