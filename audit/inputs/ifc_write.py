"""The framing read from an IFC file written as a model with a layout section (YAML the model reader reads).

Storeys become levels; a level piece becomes a layout member (``from``/``to`` on its centreline, its
top at the nearest level less ``drop``), a plumb piece a layout post (its foot at the nearest level
less ``drop``, its top the lowest level above it). Each keeps its GlobalId and name in its label.
Coordinates are written in metres rounded to a micrometre, as the layout expander writes them.
"""

from __future__ import annotations

import json
import re
from dataclasses import dataclass
from pathlib import Path

from audit.core.errors import InputError, Location
from audit.inputs.ifc_layout import IfcFraming, Piece, Storey, read_framing
from audit.inputs.ifc_map import MaterialMap, read_map

# A post's top within this of a level is at it (a tenth of the layout's 1 mm contact tolerance).
LEVEL_SLACK = 0.0001
ID_LIMIT = 120
_ID_OK = re.compile(r"[^\s/\\,\[\]{}:#&*!|>'\"%@`]+")


@dataclass(frozen=True)
class WrittenLayout:
    """The model text, and every warning line (elements left out, materials unmapped)."""

    text: str
    warnings: tuple[str, ...]


def metres(value: float) -> str:
    text = f"{round(value, 6):.6f}".rstrip("0").rstrip(".")
    return f"{'0' if text in ('', '-0') else text} m"


def millimetres(value: float) -> str:
    text = f"{round(value * 1000, 3):.3f}".rstrip("0").rstrip(".")
    return f"{text} mm"


def member_ids(pieces: tuple[Piece, ...]) -> list[str]:
    """Each piece's id: its IFC name where that is unique and fit for an id, else the name numbered."""
    counts: dict[str, int] = {}
    for piece in pieces:
        counts[piece.name] = counts.get(piece.name, 0) + 1
    taken: set[str] = {p.name for p in pieces if counts[p.name] == 1 and _fit(p.name)}
    ids = []
    numbers: dict[str, int] = {}
    for piece in pieces:
        if piece.name in taken and counts[piece.name] == 1:
            ids.append(piece.name)
            continue
        stem = _stem(piece)
        while True:
            numbers[stem] = numbers.get(stem, 0) + 1
            candidate = f"{stem}-{numbers[stem]}"
            if candidate not in taken:
                break
        taken.add(candidate)
        ids.append(candidate)
    return ids


def _fit(name: str) -> bool:
    return bool(name) and len(name) <= ID_LIMIT and _ID_OK.fullmatch(name) is not None


def _stem(piece: Piece) -> str:
    cleaned = re.sub(r"[^A-Za-z0-9._-]+", "-", piece.name).strip("-")[:60]
    return cleaned or piece.ifc_class.removeprefix("Ifc")


def nearest_level(storeys: tuple[Storey, ...], z: float) -> Storey:
    """The storey nearest to ``z``; of two as near, the upper."""
    return min(storeys, key=lambda s: (round(abs(s.elevation - z), 6), -s.elevation))


def level_above(storeys: tuple[Storey, ...], z: float, over: float) -> Storey | None:
    """The lowest storey at or above ``z`` and above ``over`` (a post's top level)."""
    above = [s for s in storeys if s.elevation >= z - LEVEL_SLACK and s.elevation > over]
    return min(above, key=lambda s: s.elevation) if above else None


def _q(text: str) -> str:
    return json.dumps(text, ensure_ascii=False)  # a JSON string is a YAML double-quoted scalar


def write_layout(framing: IfcFraming, mapping: MaterialMap | None) -> WrittenLayout:
    """The model text for ``framing``, materials named through ``mapping``."""
    source = Location(framing.path)
    if not framing.storeys:
        raise InputError("no IfcBuildingStorey in the file: there are no levels to place the framing on", source)
    warnings = list(framing.left_out) + list(framing.several_materials)
    ids = member_ids(framing.pieces)
    material_of, material_warnings = _materials(framing, ids, mapping)
    warnings.extend(material_warnings)
    members, posts = [], []
    for piece, piece_id in zip(framing.pieces, ids, strict=True):
        fields = {"id": _q(piece_id)}
        if piece.material is not None:
            fields["material"] = _q(material_of[piece.material])
        fields["b"], fields["d"] = millimetres(piece.b), millimetres(piece.d)
        label = _q(f"IFC {piece.global_id} {piece.name}".strip())
        if piece.kind == "member":
            level = nearest_level(framing.storeys, piece.top)
            fields |= {
                "level": _q(level.name),
                "drop": metres(level.elevation - piece.top),
                "from": f"[{metres(piece.start[0])}, {metres(piece.start[1])}]",
                "to": f"[{metres(piece.end[0])}, {metres(piece.end[1])}]",
            }
            members.append((fields, label))
            continue
        base = nearest_level(framing.storeys, piece.foot)
        top = level_above(framing.storeys, piece.top, base.elevation)
        if top is None:
            warnings.append(f"{piece.ifc_class} {piece.global_id} '{piece.name}': reaches above every storey: not read")
            continue
        fields |= {
            "at": f"[{metres(piece.start[0])}, {metres(piece.start[1])}]",
            "base": _q(base.name),
            "drop": metres(base.elevation - piece.foot),
            "top": _q(top.name),
        }
        if piece.d_along == "y":
            fields["d_along"] = "y"
        posts.append((fields, label))
    text = _text(framing, mapping, members, posts)
    return WrittenLayout(text, tuple(warnings))


def _materials(framing: IfcFraming, ids: list[str], mapping: MaterialMap | None) -> tuple[dict[str, str], list[str]]:
    """Each IFC material name's model id, and one warning per unmapped material naming every member of it."""
    users: dict[str, list[str]] = {}
    bare: list[str] = []
    for piece, piece_id in zip(framing.pieces, ids, strict=True):
        who = f"{piece_id} ({piece.global_id})"
        if piece.material is None:
            bare.append(who)
        else:
            users.setdefault(piece.material, []).append(who)
    names = mapping.names if mapping is not None else {}
    where = (mapping.names_loc or Location(mapping.file)) if mapping is not None else Location(framing.path)
    material_of: dict[str, str] = {}
    warnings: list[str] = []
    for material, members in users.items():
        if material in names:
            material_of[material] = names[material]
            continue
        material_of[material] = material  # the name kept as the id: the review names it until it is mapped
        hint = "add it to the map's names" if mapping is not None else "give --map with its model material"
        warnings.append(
            f"{where}: IFC material '{material}' is not mapped ({hint}); used by {len(members)}: {', '.join(members)}"
        )
    if bare:
        warnings.append(f"{Location(framing.path)}: no material associated; {len(bare)} members: {', '.join(bare)}")
    return material_of, warnings


def _flow(fields: dict[str, str]) -> str:
    return "{" + ", ".join(f"{key}: {value}" for key, value in fields.items()) + "}"


def _text(
    framing: IfcFraming,
    mapping: MaterialMap | None,
    members: list[tuple[dict[str, str], str]],
    posts: list[tuple[dict[str, str], str]],
) -> str:
    lines = [
        f"# Framing read from {framing.path} by bearing-audit ifc ({framing.schema}, lengths in {framing.unit}).",
        f"# {len(members)} members and {len(posts)} posts placed; {len(framing.left_out)} elements left out.",
        "# Loads are not read: add the floor and roof areas (layout.areas) and any point loads.",
    ]
    lines += [f"# left out: {line}" for line in framing.left_out]
    project = mapping.project if mapping is not None and mapping.project is not None else None
    if project is None:
        title = f"{framing.project} (read from IFC)" if framing.project else "Read from IFC"
        project = {"title": title}
    lines.append(f"project: {json.dumps(project, ensure_ascii=False)}")
    if mapping is not None and mapping.materials is not None:
        lines.append("materials:")
        lines += [f"  {_q(key)}: {json.dumps(value, ensure_ascii=False)}" for key, value in mapping.materials.items()]
    lines.append("layout:")
    levels = ", ".join(f"{_q(s.name)}: {metres(s.elevation)}" for s in framing.storeys)
    lines.append(f"  levels: {{{levels}}}")
    if members:
        lines.append("  members:")
        lines += [f"    - {_flow({**fields, 'label': label})}" for fields, label in members]
    if posts:
        lines.append("  posts:")
        lines += [f"    - {_flow({**fields, 'label': label})}" for fields, label in posts]
    return "\n".join(lines) + "\n"


def ifc_to_layout(model: Path, material_map: Path | None) -> WrittenLayout:
    """`bearing-audit ifc`: the map read first (its errors before the slow open), then the file."""
    mapping = read_map(material_map) if material_map is not None else None
    return write_layout(read_framing(model), mapping)
