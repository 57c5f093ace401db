"""The reviewer's map for an IFC import: the file's material names to the model's material ids.

A map file::

    names:                      # IFC material name -> the model's material id
      Lumber SPF No.2: SPF-2
    materials:                  # optional: copied as the written model's materials section
      SPF-2: {family: sawn_lumber, species: S-P-F, grade: No.2}
    project: {title: ...}       # optional: copied as the written model's project section
"""

from __future__ import annotations

from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from audit.core.errors import ErrorCollector, Location
from audit.core.located_yaml import Node, node_text, read_yaml_file
from audit.inputs.fields import FieldReader, describe_value

MAP_KEYS = {"names", "materials", "project"}


@dataclass(frozen=True)
class MaterialMap:
    """IFC material name -> model material id, where each name was mapped, and the sections to copy."""

    names: dict[str, str] = field(default_factory=dict)
    where: dict[str, Location] = field(default_factory=dict)
    materials: dict[str, Any] | None = None
    project: dict[str, Any] | None = None
    file: str = ""
    names_loc: Location | None = None


def plain(node: Node) -> Any:
    """A located node as plain Python values (scalars as written where they are text)."""
    if isinstance(node.value, dict):
        return {key: plain(child) for key, child in node.value.items()}
    if isinstance(node.value, list):
        return [plain(child) for child in node.value]
    if node.value is None or isinstance(node.value, (str, bool, int, float)):
        return node.value
    return node_text(node)  # a date and the like, as written


def read_map(path: Path) -> MaterialMap:
    """The map file; every error located, all raised together."""
    root = read_yaml_file(path)
    errors = ErrorCollector()
    f = FieldReader(root, MAP_KEYS, errors, "IFC map")
    names: dict[str, str] = {}
    where: dict[str, Location] = {}
    if f.has("names"):
        node = f.map["names"]
        if not isinstance(node.value, dict):
            errors.add(
                f"'names' maps each IFC material name to a material id, got {describe_value(node.value)}", node.loc
            )
        else:
            for name, target in node.value.items():
                if target.value is None or isinstance(target.value, (dict, list)):
                    errors.add(
                        f"expected a material id for IFC material '{name}', got {describe_value(target.value)}",
                        target.loc,
                    )
                    continue
                names[str(name)] = node_text(target)
                where[str(name)] = target.loc
    else:
        errors.add("missing field 'names' (IFC material name -> the model's material id)", root.child_loc("names"))
    sections = {}
    for key in ("materials", "project"):
        if f.has(key):
            node = f.map[key]
            if not isinstance(node.value, dict):
                errors.add(f"'{key}' is copied as the model's {key} section: expected a mapping", node.loc)
            else:
                sections[key] = plain(node)
    errors.raise_if_any()
    materials = sections.get("materials")
    for name, target in names.items():
        if materials is not None and target not in materials:
            errors.add(f"IFC material '{name}' maps to '{target}', which 'materials' does not define", where[name])
    errors.raise_if_any()
    names_loc = f.map["names"].loc if f.has("names") else None
    return MaterialMap(names, where, materials, sections.get("project"), str(path), names_loc)
