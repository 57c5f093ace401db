"""Stage 1: read the reviewer's YAML model into frozen records, validating as it goes.

Every error names file:line:column and the key path; all errors of a file are reported in
one run. The rule packs are selected here because species and grades are looked up in them.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import replace
from pathlib import Path

from audit.core.errors import ErrorCollector, Location
from audit.core.located_yaml import Node, read_yaml_file
from audit.engine.model import Frame, Model
from audit.inputs.connectors import read_connectors
from audit.inputs.expand_layout import Sections, model_sections
from audit.inputs.fields import FieldReader, describe_value
from audit.inputs.model_bearings import read_bearings
from audit.inputs.model_checks import check_support_graph, id_warnings
from audit.inputs.model_keys import TOP_KEYS, US_CUSTOMARY
from audit.inputs.model_loads import check_loads_within_members, read_loads
from audit.inputs.model_materials import light_load_warnings, read_materials
from audit.inputs.model_members import KnownMembers, place_walls, read_members
from audit.inputs.model_project import check_readings, read_project
from audit.standards.catalogue import select_packs
from audit.standards.packs import CombinationPack, PackCore

PackLoader = Callable[[str, str, Location], tuple[PackCore, CombinationPack]]


def read_model(
    path: Path | str,
    rules_dirs: tuple[Path, ...] = (),
    rule_pack: str | None = None,
) -> tuple[Model, PackCore, CombinationPack]:
    """Read and validate a model file; return it with the rule packs it selects."""
    root = read_yaml_file(path)
    return build_model(root, str(path), rules_dirs, rule_pack)


def build_model(
    root: Node, name: str, rules_dirs: tuple[Path, ...] = (), rule_pack: str | None = None
) -> tuple[Model, PackCore, CombinationPack]:
    model, resistance, combos, _ = build_model_and_sections(root, name, rules_dirs, rule_pack)
    return model, resistance, combos


def build_model_and_sections(
    root: Node, name: str, rules_dirs: tuple[Path, ...] = (), rule_pack: str | None = None
) -> tuple[Model, PackCore, CombinationPack, Sections]:
    """The model and the entries it was read from, its layout expanded (which ``expand`` writes out)."""
    errors = ErrorCollector()
    top = FieldReader(root, TOP_KEYS, errors, "the model")
    if not top.ok:
        errors.raise_if_any()
    required = ("project", "materials") if "layout" in top.map else ("project", "materials", "members", "bearings")
    for key in required:
        if key not in top.map:
            errors.add(f"missing section '{key}'", root.child_loc(key))
    for key in ("members", "bearings", "loads"):
        if key in top.map and top.map[key].value is not None and not isinstance(top.map[key].value, list):
            errors.add(f"expected a list of {key}, got {describe_value(top.map[key].value)}", top.map[key].loc)
    errors.raise_if_any()

    project = read_project(top.map["project"], errors)
    errors.raise_if_any()
    pack_id = rule_pack or project.rule_pack
    where = Location("--rule-pack") if rule_pack else top.map["project"].loc
    resistance, combos = select_packs(pack_id, project.combinations, rules_dirs, where)
    if "units" not in (top.map["project"].value or {}) and resistance.standard in US_CUSTOMARY:
        project = replace(project, units="US")  # forces in the habit of the standard's users, unless stated
    check_readings(project, resistance, top.map["project"], errors)

    materials = read_materials(top.map["materials"], resistance, errors)
    # a material with an error is still known, so its members are read for their own errors (one pass)
    named = top.map["materials"].value if isinstance(top.map["materials"].value, dict) else {}
    broken_materials = frozenset(str(k) for k in named) - materials.keys()
    found = len(errors.errors)
    sections = model_sections(top.map, root, errors)
    if len(errors.errors) > found:
        errors.raise_if_any()  # the layout's own errors first: what it would have placed is not there to read
    members, broken, walls = read_members(
        _listed(sections.members, root, "members"), materials, project, errors, broken_materials
    )
    placed = place_walls(members, walls, errors)
    known = KnownMembers(members, broken)
    hangers = read_connectors(rules_dirs)
    bearings = read_bearings(_listed(sections.bearings, root, "bearings"), known, combos, errors, hangers)
    taken = {b.id for b in bearings}
    for b in placed:
        if b.id in taken:
            errors.add(f"bearing id '{b.id}' is also the bearing of a stud placed under '{b.upper.member}'", b.loc)
    bearings += placed
    loads, groups = read_loads(_listed(sections.loads, root, "loads"), known, combos, errors)
    errors.warnings.extend(id_warnings(members, bearings, loads))  # shown even if errors stop the run
    errors.warnings.extend(light_load_warnings(members, materials, loads, resistance))
    errors.raise_if_any()
    check_support_graph(members, bearings, errors)
    check_loads_within_members(members, loads, errors)
    errors.raise_if_any()
    warnings = sections.warnings + tuple(errors.warnings)
    frame = None
    if sections.layout is not None:
        frame = Frame(dict(sections.layout.levels), dict(sections.layout.grids.x), dict(sections.layout.grids.y))
    used = {h: hangers[h] for h in sorted({b.hanger for b in bearings if b.hanger})}
    model = Model(name, project, materials, members, bearings, loads, groups, warnings, frame, used)
    return model, resistance, combos, sections


def _listed(items: list[Node], root: Node, key: str) -> Node:
    """The entries of one section, typed and placed, as one list node."""
    node = root.value.get(key) if isinstance(root.value, dict) else None
    if node is not None:
        return Node(items, node.file, node.line, node.column, node.key)
    return Node(items, root.file, root.line, root.column, key)
