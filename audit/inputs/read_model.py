"""Stage 1: read the reviewer's YAML model into frozen records, validating as it goes.

Every error names file:line:column and the key path; all errors of a file are reported in
one run. The rule packs are selected here because species and grades are looked up in them.
"""

from __future__ import annotations

import datetime as dt
import itertools
import math
import unicodedata
from collections.abc import Callable
from dataclasses import dataclass, replace
from pathlib import Path

from audit.core.errors import ErrorCollector, InputError, Location
from audit.core.located_yaml import Node, node_text, read_yaml_file
from audit.core.suggest import did_you_mean
from audit.core.units import parse_quantity
from audit.engine.model import (
    FACTORED_PREFIX,
    PLY_FIT,
    STORAGE_LIVE,
    WIND_PRESSURE,
    WIND_SUCTION,
    Bearing,
    FactoredGroup,
    Frame,
    Load,
    Material,
    Member,
    Model,
    Place,
    Project,
    Side,
    normalise_label,
)
from audit.inputs.expand_layout import Sections, model_sections
from audit.inputs.fields import FieldReader, describe_value, list_items
from audit.inputs.stud_walls import StudWall, place_studs, read_stud_wall
from audit.standards.packs import (
    ALL_FAMILIES,
    DURATIONS,
    SERVICES,
    CombinationPack,
    PackCore,
    select_packs,
)

TOP_KEYS = {"project", "materials", "layout", "members", "bearings", "loads"}
PROJECT_KEYS = {
    "title",
    "calc",
    "reviewer",
    "rule_pack",
    "combinations",
    "service",
    "tolerance",
    "date",
    "near_support_area",
    "near_support_kb",
    "uplift_note_below",
    "own_comment_from",
    "readings",
    "units",
}
# The older project keys for two readings, kept: each names a choice of the rule pack.
READING_KEYS = {"near_support_area": "near_support.area_limit", "near_support_kb": "near_support.kb_reading"}
MATERIAL_KEYS = {"family", "species", "grade", "fcp", "fc", "factors", "wet_factor", "source"}
MEMBER_KEYS = {
    "id",
    "material",
    "b",
    "d",
    "length",
    "orientation",
    "service",
    "KT",
    "support",
    "level",
    "label",
    "plies",
    "ply_thickness",
    "studs",
    "bears_on",
    "place",
    "note",
    "aliases",
}
BEARING_KEYS = {"id", "upper", "lower", "width", "aliases", "typical", "note", "calc_force"}
SIDE_KEYS = {"member", "at", "length", "width", "angle"}
LOAD_KEYS = {
    "id",
    "member",
    "type",
    "at",
    "from",
    "to",
    "length",
    "width",
    "specified",
    "factored",
    "duration",
    "label",
    "live",
    "note",
}
LIVE_KINDS = ("occupancy", "storage")  # storage: storage, equipment and service-room live load
ENGINEERED_FACTORS = ("KD", "KScp", "KB", "KZcp", "KT")
SUPPORTS = ("bearings", "continuous", "studs")
US_CUSTOMARY = ("nds",)  # standards whose memos show forces in kip unless the project says otherwise


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

    project = _read_project(top.map["project"], errors)
    errors.raise_if_any()
    pack_id = rule_pack or project.rule_pack
    where = Location("--rule-pack") if rule_pack else top.map["project"].loc
    resistance, combos = select_packs(pack_id, project.combinations, rules_dirs, where)
    if "units" not in (top.map["project"].value or {}) and resistance.standard in US_CUSTOMARY:
        project = replace(project, units="US")  # forces in the habit of the standard's users, unless stated
    _check_readings(project, resistance, top.map["project"], errors)

    materials = _read_materials(top.map["materials"], resistance, errors)
    # a material with an error is still known, so its members are read for their own errors (one pass)
    named = top.map["materials"].value if isinstance(top.map["materials"].value, dict) else {}
    broken_materials = frozenset(str(k) for k in named) - materials.keys()
    found = len(errors.errors)
    sections = model_sections(top.map, root, errors)
    if len(errors.errors) > found:
        errors.raise_if_any()  # the layout's own errors first: what it would have placed is not there to read
    members, broken, walls = _read_members(
        _listed(sections.members, root, "members"), materials, project, errors, broken_materials
    )
    placed = _place_walls(members, walls, errors)
    known = KnownMembers(members, broken)
    bearings = _read_bearings(_listed(sections.bearings, root, "bearings"), known, combos, errors)
    taken = {b.id for b in bearings}
    for b in placed:
        if b.id in taken:
            errors.add(f"bearing id '{b.id}' is also the bearing of a stud placed under '{b.upper.member}'", b.loc)
    bearings += placed
    loads, groups = _read_loads(_listed(sections.loads, root, "loads"), known, combos, errors)
    errors.warnings.extend(_id_warnings(members, bearings, loads))  # shown even if errors stop the run
    errors.warnings.extend(_light_load_warnings(members, materials, loads, resistance))
    errors.raise_if_any()
    _check_support_graph(members, bearings, errors)
    _check_loads_within_members(members, loads, errors)
    errors.raise_if_any()
    warnings = sections.warnings + tuple(errors.warnings)
    frame = None
    if sections.layout is not None:
        frame = Frame(dict(sections.layout.levels), dict(sections.layout.grids.x), dict(sections.layout.grids.y))
    model = Model(name, project, materials, members, bearings, loads, groups, warnings, frame)
    return model, resistance, combos, sections


def _listed(items: list[Node], root: Node, key: str) -> Node:
    """The entries of one section, typed and placed, as one list node."""
    node = root.value.get(key) if isinstance(root.value, dict) else None
    if node is not None:
        return Node(items, node.file, node.line, node.column, node.key)
    return Node(items, root.file, root.line, root.column, key)


# ---------------------------------------------------------------- sections


def _read_project(node: Node, errors: ErrorCollector) -> Project:
    f = FieldReader(node, PROJECT_KEYS, errors, "project")
    tol_rel, tol_abs = 0.03, 500.0
    if f.has("tolerance"):
        t = FieldReader(f.map["tolerance"], {"relative", "absolute"}, errors, "project.tolerance")
        tol_rel = t.number("relative", 0.0, 1.0, tol_rel)
        abs_value = t.quantity("absolute", "force", required=False)
        if abs_value is not None:
            if abs_value < 0:
                errors.add("tolerance must not be negative", t.loc("absolute"))
            tol_abs = abs_value
    date = None
    if f.has("date"):
        raw = f.map["date"].value
        if isinstance(raw, dt.datetime):
            date = raw.date()
        elif isinstance(raw, dt.date):
            date = raw
        else:
            try:
                date = dt.date.fromisoformat(str(raw))
            except ValueError:
                errors.add(f"date must be YYYY-MM-DD, got {raw!r}", f.loc("date"))
    uplift_note = f.quantity("uplift_note_below", "force", required=False)
    if uplift_note is not None and uplift_note < 0:
        errors.add("uplift_note_below must not be negative", f.loc("uplift_note_below"))
        uplift_note = None
    own_from = _own_comment_from(f, errors)
    return Project(
        title=f.text("title"),
        calc=f.text("calc", required=False),
        reviewer=f.text("reviewer", required=False),
        rule_pack=f.text("rule_pack", required=False, default="o86-2019-recalled"),
        combinations=f.text("combinations", required=False, default="nbcc-2015-recalled"),
        service=f.choice("service", SERVICES, required=False, default="dry"),
        tolerance_relative=tol_rel,
        tolerance_absolute=tol_abs,
        date=date,
        readings=_read_reading_choices(f, errors),
        units=f.choice("units", ("SI", "US"), required=False, default="SI"),
        uplift_note_below=uplift_note,
        own_comment_from=own_from,
    )


def _own_comment_from(f: FieldReader, errors: ErrorCollector) -> float | None:
    """project.own_comment_from: the Qf/Qr from which a missing check is a comment of its own (None: the default)."""
    if not f.has("own_comment_from"):
        return None
    value = f.number("own_comment_from", 0.0, 1.0, -1.0)
    return value if value >= 0 else None


def _read_reading_choices(f: FieldReader, errors: ErrorCollector) -> dict[str, str]:
    out = {name: f.text(key, required=False) for key, name in READING_KEYS.items() if f.has(key)}
    if f.has("readings"):
        node = f.map["readings"]
        if not isinstance(node.value, dict):
            errors.add(
                "readings must map a choice of the rule pack to a reading, e.g. {kzcp.built_up: combined}", node.loc
            )
            return out
        for name, item in node.value.items():
            if isinstance(item.value, (dict, list)) or item.value is None:
                errors.add(f"expected a reading id, got {describe_value(item.value)}", item.loc)
                continue
            out[name] = node_text(item)
    return out


def _check_readings(project: Project, pack: PackCore, node: Node, errors: ErrorCollector) -> None:
    """Every reading the project chooses names a choice of the pack and one of its readings."""
    keys = {name: key for key, name in READING_KEYS.items()}
    for name, reading in project.readings.items():
        where = node.value[keys[name]].loc if name in keys and keys[name] in node.value else None
        if where is None:
            readings_node = node.value["readings"]
            where = readings_node.value[name].loc
        choice = pack.choices.get(name)
        if choice is None:
            errors.add(
                f"rule pack {pack.id} has no choice '{name}'{did_you_mean(name, pack.choices)} "
                f"(choices: {', '.join(pack.choices)})",
                where,
            )
        elif reading not in choice.readings:
            errors.add(
                f"reading '{reading}' is not in rule pack {pack.id} for {name} "
                f"(readings: {', '.join(choice.readings)})",
                where,
            )


def _read_materials(node: Node, pack: PackCore, errors: ErrorCollector) -> dict[str, Material]:
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


@dataclass(frozen=True)
class KnownMembers:
    """The members read, and the ids of those with an error of their own.

    A reference to a member whose own entry has an error is not an error again: one bad value
    gives one error, not one more for every bearing and load that names the member.
    """

    members: dict[str, Member]
    broken: frozenset[str]

    def resolve(self, member_id: str, loc: Location, errors: ErrorCollector) -> Member | None:
        if member_id in self.members:
            return self.members[member_id]
        if member_id not in self.broken:
            errors.add(f"unknown member '{member_id}'{did_you_mean(member_id, self.members)}", loc)
        return None


def _read_members(
    node: Node,
    materials: dict[str, Material],
    project: Project,
    errors: ErrorCollector,
    broken_materials: frozenset[str] = frozenset(),
) -> tuple[dict[str, Member], frozenset[str], tuple[StudWall, ...]]:
    out: dict[str, Member] = {}
    broken: set[str] = set()
    twins: dict[str, str] = {}
    walls: list[StudWall] = []
    for item in list_items(node, "members", errors):
        f = FieldReader(item, MEMBER_KEYS, errors, "member")
        member_id = f.text("id", limit=120)
        material = f.text("material")
        if f.ok and material in broken_materials:
            f.ok = False  # its material's error is reported where the material is; its other fields still are
        elif f.ok and material not in materials:
            errors.add(f"unknown material '{material}'{did_you_mean(material, materials)}", f.loc("material"))
            f.ok = False
        b = f.quantity("b", "length", positive=True)
        d = f.quantity("d", "length", positive=True)
        length = f.quantity("length", "length", positive=True)
        if not _plausible_section(f, b, d, length, errors):
            f.ok = False
        orientation = f.choice("orientation", ("horizontal", "vertical"), required=False, default="horizontal")
        service = f.choice("service", SERVICES, required=False, default=project.service)
        kt = f.number("KT", 0.01, 1.5, 1.0)
        support = f.choice("support", SUPPORTS, required=False, default="bearings")
        if support != "bearings" and orientation == "vertical":
            errors.add(f"only a horizontal member can be supported by '{support}'", f.loc("support"))
            f.ok = False
        wall = _read_wall_fields(f, support, member_id, material, materials, errors)
        plies, ply_thickness = _read_plies(f, b, d)
        place = _read_place(f, orientation == "vertical", length) if f.has("place") else None
        if member_id in out:
            errors.add(f"duplicate member id '{member_id}'", f.loc("id"))
            continue
        if _case_twin(member_id, "member", twins, f.loc("id"), errors):
            broken.add(member_id)  # named elsewhere, it is known: one error, not one per reference
            continue
        if not f.ok or b is None or d is None or length is None:
            if member_id:
                broken.add(member_id)
            continue
        out[member_id] = Member(
            id=member_id,
            material=material,
            b=b,
            d=d,
            length=length,
            vertical=orientation == "vertical",
            service=service,
            kt=kt,
            continuous=support == "continuous",
            level=f.text("level", required=False),
            label=f.text("label", required=False),
            plies=plies,
            ply_thickness=ply_thickness,
            bears_on=f.text("bears_on", required=False),
            place=place,
            note=f.text("note", required=False),
            aliases=_label_list(f, "aliases", "aliases must be a list of earlier ids", errors) or (),
            loc=item.loc,
        )
        if wall is not None:
            walls.append(wall)
    return out, frozenset(broken - out.keys()), tuple(walls)


PLACE_FIT = 1e-3  # m: a stated place must agree with the stated length to this


def _read_place(f: FieldReader, vertical: bool, length: float | None) -> Place | None:
    """Where the member stands: {from: [x, y], to: [x, y], top} or, for a post, {at: [x, y], base, top, d_along}."""
    keys = {"at", "base", "top", "d_along"} if vertical else {"from", "to", "top"}
    p = FieldReader(f.map["place"], keys, f.errors, "place")
    if not p.ok:
        f.ok = False
        return None
    points = {}
    for key in ("at",) if vertical else ("from", "to"):
        node = p.map.get(key)
        if node is None:
            f.errors.add(f"missing field '{key}'", p.node.child_loc(key))
            f.ok = False
            return None
        if not isinstance(node.value, list) or len(node.value) != 2:
            f.errors.add(f"{key} must be [x, y], two lengths", node.loc)
            f.ok = False
            return None
        xy = []
        for item in node.value:
            try:
                xy.append(parse_quantity(item.value, "length", item.loc))
            except InputError as exc:
                f.errors.extend(exc)
                f.ok = False
                return None
        points[key] = (xy[0], xy[1])
    top = p.quantity("top", "length")
    base = p.quantity("base", "length") if vertical else None
    d_along = p.choice("d_along", ("x", "y"), required=False, default="x")
    if top is None or not p.ok or length is None or f.map.get("d") is None:
        f.ok = False
        return None
    if vertical:
        assert base is not None
        start = end = points["at"]
        stated = top - base
    else:
        start, end = points["from"], points["to"]
        stated = math.hypot(end[0] - start[0], end[1] - start[1])
        d = parse_quantity(f.map["d"].value, "length", f.map["d"].loc)
        base = top - d
    if abs(stated - length) > PLACE_FIT:
        f.errors.add(
            f"the place gives a length of {stated * 1000:.0f} mm, the member's length is {length * 1000:.0f} mm",
            p.node.loc,
        )
        f.ok = False
        return None
    return Place(start, end, top, base, d_along)


def _place_walls(
    members: dict[str, Member], walls: tuple[StudWall, ...], errors: ErrorCollector
) -> tuple[Bearing, ...]:
    """Place each wall's studs and packs as members under its plate (added to ``members``); their bearings."""
    placed: list[Bearing] = []
    for wall in walls:
        sole = members.get(wall.sole) if wall.sole else None
        if wall.sole and (sole is None or sole.vertical or sole.length < members[wall.plate].length - PLY_FIT):
            errors.add(
                f"sole '{wall.sole}' of the studs under '{wall.plate}' must be a horizontal member the wall's length",
                wall.loc,
            )
            continue
        # the plate, and the sole its studs stand on, take live and snow load on every bay unless the wall says
        members[wall.plate] = replace(members[wall.plate], patterned=wall.patterned)
        if sole is not None:
            members[wall.sole] = replace(sole, patterned=wall.patterned)
        studs, bearings = place_studs(members[wall.plate], wall, errors)
        for stud in studs:
            if stud.id in members:
                errors.add(
                    f"member id '{stud.id}' is also the id of a stud or pack placed under '{wall.plate}'", wall.loc
                )
                return tuple(placed)
            members[stud.id] = stud
        placed += bearings
    return tuple(placed)


def _read_wall_fields(
    f: FieldReader, support: str, member_id: str, material: str, materials: dict[str, Material], errors: ErrorCollector
) -> StudWall | None:
    """The stud wall under a plate (support: studs), or the material under a continuous member (bears_on)."""
    if f.has("studs") and support != "studs":
        errors.add("'studs' describes the wall under a plate: give 'support: studs' too", f.loc("studs"))
        f.ok = False
    if f.has("bears_on"):
        under = f.text("bears_on")
        if support != "continuous":
            errors.add(
                "'bears_on' names what is under a continuous member: give 'support: continuous'", f.loc("bears_on")
            )
            f.ok = False
        elif under not in materials:
            errors.add(f"unknown material '{under}'{did_you_mean(under, materials)}", f.loc("bears_on"))
            f.ok = False
    if support != "studs":
        return None
    if not f.has("studs"):
        errors.add("support: studs needs 'studs' (thickness, spacing, packs)", f.node.child_loc("studs"))
        f.ok = False
        return None
    wall = read_stud_wall(f.map["studs"], member_id, material, errors)
    if wall is not None and wall.material not in materials:
        errors.add(f"unknown material '{wall.material}'{did_you_mean(wall.material, materials)}", wall.loc)
        return None
    return wall


def _read_plies(f: FieldReader, b: float | None, d: float | None) -> tuple[int, float | None]:
    """A built-up member's ply count and thickness; the plies must make up its depth d or its width b."""
    count = f.number("plies", 1, 20, 1.0)
    if count != int(count):
        f.errors.add(f"plies must be a whole number, got {count:g}", f.loc("plies"))
        f.ok = False
        return 1, None
    thickness = f.quantity("ply_thickness", "length", required=False, positive=True)
    if count >= 2 and thickness is None and f.ok:
        f.errors.add(
            "a built-up member needs 'ply_thickness' (which way the plies run)", f.node.child_loc("ply_thickness")
        )
        f.ok = False
    if count < 2 and thickness is not None:
        f.errors.add("'ply_thickness' is for built-up members: give 'plies' too", f.loc("ply_thickness"))
        f.ok = False
    if count >= 2 and thickness is not None and b is not None and d is not None:
        made = count * thickness
        if abs(made - d) > PLY_FIT and abs(made - b) > PLY_FIT:
            f.errors.add(
                f"{count:g} plies of {thickness * 1000:.0f} mm make {made * 1000:.0f} mm, neither d "
                f"({d * 1000:.0f} mm, plies laid flat) nor b ({b * 1000:.0f} mm, plies side by side)",
                f.loc("ply_thickness"),
            )
            f.ok = False
    return int(count), thickness


def _read_side(node: Node, role: str, known: KnownMembers, errors: ErrorCollector) -> Side | None:
    if isinstance(node.value, str) or (node.raw and not isinstance(node.value, (dict, list))):
        node = Node({"member": node}, node.file, node.line, node.column, node.key)
    f = FieldReader(node, SIDE_KEYS, errors, f"bearing {role}")
    member_id = f.text("member")
    if not f.ok:
        return None
    member = known.resolve(member_id, f.loc("member"), errors)
    if member is None:
        return None
    at = None
    if not member.vertical:
        at = f.quantity("at", "length")
        if at is not None and not 0.0 <= at <= member.length:
            errors.add(
                f"bearing centre at {at * 1000:.0f} mm is outside member '{member_id}' "
                f"(length {member.length * 1000:.0f} mm)",
                f.loc("at"),
            )
            return None
    elif f.has("at"):
        errors.add(f"'{member_id}' is vertical: its bearings are at its ends, give no 'at'", f.loc("at"))
        return None
    length = f.quantity("length", "length", required=False, positive=True)
    if length is not None and length > member.length:
        errors.add(
            f"bearing length {length * 1000:.0f} mm is longer than member '{member_id}' "
            f"({member.length * 1000:.0f} mm)",
            f.loc("length"),
        )
        return None
    width = f.quantity("width", "length", required=False, positive=True)
    if width is not None and width > member.b + 1e-9:
        errors.add(
            f"seat width {width * 1000:.0f} mm is wider than member '{member_id}' (b = {member.b * 1000:.0f} mm)",
            f.loc("width"),
        )
        return None
    angle = f.quantity("angle", "angle", required=False)
    if angle is not None and not 0.0 < angle <= math.pi / 2 + 1e-12:
        errors.add("angle between load and grain must be more than 0 and at most 90 deg", f.loc("angle"))
        return None
    if not f.ok:
        return None
    return Side(member_id, at, length, angle, width, node.loc)


def _light_load_warnings(
    members: dict[str, Member], materials: dict[str, Material], loads: tuple[Load, ...], pack: PackCore
) -> list[str]:
    from audit.standards import plausible

    def timber(m: Member) -> bool:
        return m.material in materials and pack.is_timber(materials[m.material].family)

    return plausible.light_load_warnings(members, loads, timber)


def _plausible_section(
    f: FieldReader, b: float | None, d: float | None, length: float | None, errors: ErrorCollector
) -> bool:
    """b and d within the plausible section range (refused outside: 38 m for 38 mm); one longer than the
    member itself is a warning (a short block is possible, a slip likelier)."""
    from audit.standards import plausible

    ok = True
    for key, value in (("b", b), ("d", d)):
        if value is None:
            continue
        if not plausible.check(value, plausible.ranges().section, key, f.loc(key), errors):
            ok = False
        elif length is not None and value > length:
            errors.warnings.append(
                f"{f.loc(key)}: {key} = {value * 1000:g} mm is more than the member's length "
                f"({length * 1000:g} mm): a unit slip?"
            )
    return ok


def _case_twin(item_id: str, what: str, twins: dict[str, str], where: Location, errors: ErrorCollector) -> bool:
    """Refuse an id that differs from an earlier one only in case or spacing: labels and claims are matched
    without either, so a claim meant for one would land on the other (as an alias that is another's id would)."""
    if not item_id:
        return False
    first = twins.setdefault(normalise_label(item_id), item_id)
    if first == item_id:
        return False
    errors.add(
        f"{what} id '{item_id}' differs from {what} '{first}' only in case or spacing; calc labels are matched "
        "without either, so give it an id of its own",
        where,
    )
    return True


def _read_bearings(
    node: Node, known: KnownMembers, combos: CombinationPack, errors: ErrorCollector
) -> tuple[Bearing, ...]:
    out: list[Bearing] = []
    seen: dict[str, Location] = {}
    twins: dict[str, str] = {}
    aliases_seen: dict[str, str] = {}
    for item in list_items(node, "bearings", errors):
        f = FieldReader(item, BEARING_KEYS, errors, "bearing")
        if not f.ok:
            continue
        for role in ("upper", "lower"):
            if role not in f.map:
                errors.add(f"missing field '{role}'", item.child_loc(role))
        if "upper" not in f.map or "lower" not in f.map:
            continue
        upper = _read_side(f.map["upper"], "upper", known, errors)
        lower = _read_side(f.map["lower"], "lower", known, errors)
        width = f.quantity("width", "length", required=False, positive=True)
        aliases = _label_list(f, "aliases", "aliases must be a list of labels", errors)
        typical = _label_list(f, "typical", "typical must be a list of labels that several bearings share", errors)
        if aliases is None or typical is None:
            continue
        if upper is None or lower is None or not f.ok:
            continue
        if upper.member == lower.member:
            errors.add(f"member '{upper.member}' cannot bear on itself", item.loc)
            continue
        if not _crossing_fits(upper, lower, f, known, errors):
            continue
        bearing_id = f.text("id", required=False, limit=120) or f"{upper.member}/{lower.member}"
        if bearing_id in seen:
            hint = "" if f.has("id") else " (two bearings join the same members: give each an 'id')"
            errors.add(f"duplicate bearing id '{bearing_id}'{hint}", f.loc("id") if f.has("id") else item.loc)
            continue
        if _case_twin(bearing_id, "bearing", twins, f.loc("id") if f.has("id") else item.loc, errors):
            continue
        seen[bearing_id] = item.loc
        for alias in aliases:
            other = aliases_seen.get(normalise_label(alias))
            if other is not None and other != bearing_id:
                errors.add(f"alias '{alias}' is already used by bearing '{other}'", f.loc("aliases"))
            aliases_seen[normalise_label(alias)] = bearing_id
        note = f.text("note", required=False)
        calc_force = read_calc_force(f.map["calc_force"], combos, errors) if f.has("calc_force") else ()
        if calc_force is None:
            continue
        out.append(Bearing(bearing_id, upper, lower, width, aliases, typical, note, calc_force, item.loc))
    ids = {normalise_label(b.id): b.id for b in out}
    own = {normalise_label(a): b.id for b in out for a in b.aliases} | ids
    for b in out:
        for label in b.typical:
            owner = own.get(normalise_label(label))
            if owner is not None:
                errors.add(
                    f"typical label '{label}' of bearing '{b.id}' is the id or alias of bearing '{owner}': a shared "
                    "label must differ from every single bearing's",
                    b.loc,
                )
    for b in out:
        for alias in b.aliases:
            owner = ids.get(normalise_label(alias))
            if owner is not None and owner != b.id:
                errors.add(f"alias '{alias}' of bearing '{b.id}' is the id of bearing '{owner}'", b.loc)
    return tuple(out)


def read_calc_force(
    node: Node, combos: CombinationPack, errors: ErrorCollector
) -> tuple[tuple[str, float], ...] | None:
    """The calc's force through a bearing per specified load case, e.g. {D: 12 kN, L: 20 kN}; None on an error."""
    if not isinstance(node.value, dict) or not node.value:
        errors.add("calc_force gives the calc's force per load case, e.g. {D: 12 kN, L: 20 kN}", node.loc)
        return None
    f = FieldReader(node, set(combos.cases), errors, "calc_force")
    out = []
    for case in f.map:
        value = f.quantity(case, "force")
        if value is not None:
            out.append((case, value))
    return tuple(out) if f.ok else None


def _crossing_fits(upper: Side, lower: Side, f: FieldReader, known: KnownMembers, errors: ErrorCollector) -> bool:
    """Where two horizontal members cross, the contact along one cannot be longer than the other is wide."""
    members = known.members
    if members[upper.member].vertical or members[lower.member].vertical:
        return True  # a post may stand on (or carry) a plate longer than itself
    ok = True
    for side, other, role in ((upper, lower, "upper"), (lower, upper, "lower")):
        width = members[other.member].b
        if side.length is not None and side.length > width + 1e-9:
            errors.add(
                f"bearing length {side.length * 1000:.0f} mm along '{side.member}' is more than the "
                f"{width * 1000:.0f} mm width of '{other.member}' crossing it; a longer contact needs a plate "
                "or seat, modelled as its own member",
                f.map[role].value["length"].loc,
            )
            ok = False
    return ok


def _label_list(f: FieldReader, key: str, wrong: str, errors: ErrorCollector) -> tuple[str, ...] | None:
    """A bearing's list of labels (aliases, typical labels); None, with the error, when it is not a list."""
    if not f.has(key):
        return ()
    node = f.map[key]
    if not isinstance(node.value, list):
        errors.add(wrong, node.loc)
        return None
    return _read_aliases(node, errors)


def _read_aliases(node: Node, errors: ErrorCollector) -> tuple[str, ...]:
    out = []
    for i, item in enumerate(node.value):
        if isinstance(item.value, (dict, list)) or item.value is None:
            errors.add(f"an alias must be a label, got {describe_value(item.value)}", node.child_loc(i))
            continue
        text = node_text(item).strip()
        if not text or len(text) > 120:
            errors.add(f"an alias must be 1 to 120 characters, got {len(text)}", item.loc)
            continue
        out.append(text)
    return tuple(out)


def _read_loads(
    node: Node, known: KnownMembers, combos: CombinationPack, errors: ErrorCollector
) -> tuple[tuple[Load, ...], dict[str, FactoredGroup]]:
    out: list[Load] = []
    groups: dict[str, FactoredGroup] = {}
    ids: set[str] = set()
    for index, item in enumerate(list_items(node, "loads", errors)):
        f = FieldReader(item, LOAD_KEYS, errors, "load")
        member_id = f.text("member")
        kind = f.choice("type", ("point", "uniform"))
        if not f.ok:
            continue
        found = known.resolve(member_id, f.loc("member"), errors)
        if found is None:
            if member_id in known.broken:
                _check_load_values(f, kind, combos, errors)  # its own errors too, in the same pass
            continue
        member = found
        load_id = f.text("id", required=False) or f"load{index + 1}"
        if load_id in ids:
            errors.add(f"duplicate load id '{load_id}'", f.loc("id"))
            continue
        ids.add(load_id)
        dimension = "force" if kind == "point" else "line_load"
        if member.vertical and kind != "point":
            errors.add(f"'{member_id}' is vertical: give its loads as type: point (axial)", f.loc("type"))
            continue
        geometry = _load_geometry(f, kind, member)
        if geometry is None:
            continue
        at, start, end, length, width = geometry
        note = f.text("note", required=False)
        has_specified, has_factored = f.has("specified"), f.has("factored")
        if has_specified == has_factored:
            errors.add("give either 'specified' (loads by case) or 'factored' (with 'duration')", item.loc)
            continue
        entries: list[tuple[str, float]] = []
        live_kind = f.choice("live", LIVE_KINDS, required=False, default="occupancy")
        if has_specified:
            s = FieldReader(f.map["specified"], set(combos.cases), errors, "specified loads")
            for case in s.map:
                if case == "W" and isinstance(s.map[case].value, dict):
                    entries += _wind_both_ways(s.map[case], dimension, errors)
                elif case in combos.cases:
                    value = s.quantity(case, dimension)
                    if value is not None:
                        entries.append((STORAGE_LIVE if case == "L" and live_kind == "storage" else case, value))
            if f.has("live") and "L" not in s.map:
                errors.add("'live' says what kind of live load this is: give an L load too", f.loc("live"))
            if not s.map and s.ok:
                errors.add("no load cases given", f.loc("specified"))
            if not s.ok:
                continue
            for key in ("duration", "label"):
                if f.has(key):
                    errors.add(f"'{key}' is only for factored loads", f.loc(key))
        else:
            value = f.quantity("factored", dimension)
            duration = f.choice("duration", DURATIONS)
            if value is None or not f.ok:
                continue
            label = f.text("label", required=False) or f"factored, {duration} term"
            prior = groups.get(label)
            if prior is not None and prior.duration != duration:
                errors.add(
                    f"factored loads labelled '{label}' must share one duration (another says {prior.duration})",
                    f.loc("duration"),
                )
                continue
            groups[label] = FactoredGroup(label, duration)
            entries.append((FACTORED_PREFIX + label, value))
        for case, value in entries:
            out.append(Load(load_id, member_id, kind, case, value, at, start, end, length, width, note, item.loc))
    return tuple(out), groups


def _check_load_values(f: FieldReader, kind: str, combos: CombinationPack, errors: ErrorCollector) -> None:
    """The values of a load on a member with an error of its own: read for their own errors only."""
    dimension = "force" if kind == "point" else "line_load"
    if f.has("specified"):
        s = FieldReader(f.map["specified"], set(combos.cases), errors, "specified loads")
        for case in s.map:
            if case == "W" and isinstance(s.map[case].value, dict):
                _wind_both_ways(s.map[case], dimension, errors)
            elif case in combos.cases:
                s.quantity(case, dimension)
    elif f.has("factored"):
        f.quantity("factored", dimension)


def _wind_both_ways(node: Node, dimension: str, errors: ErrorCollector) -> list[tuple[str, float]]:
    """W given as {pressure, suction}: each a size; pressure acts down, suction up."""
    w = FieldReader(node, {"pressure", "suction"}, errors, "wind both ways")
    out = []
    for key, case, sign in (("pressure", WIND_PRESSURE, 1.0), ("suction", WIND_SUCTION, -1.0)):
        if w.has(key):
            value = w.quantity(key, dimension)
            if value is not None:
                out.append((case, sign * abs(value)))
    if not w.map and w.ok:
        errors.add("give W as pressure, suction or both, e.g. {pressure: 0.4 kN/m, suction: 0.9 kN/m}", node.loc)
    return out


def _load_geometry(
    f: FieldReader, kind: str, member: Member
) -> tuple[float | None, float | None, float | None, float | None, float | None] | None:
    length = f.quantity("length", "length", required=False, positive=True)
    width = f.quantity("width", "length", required=False, positive=True)
    if member.vertical:
        for key in ("at", "from", "to"):
            if f.has(key):
                f.errors.add(f"'{member.id}' is vertical: its loads act at its top, give no '{key}'", f.loc(key))
                return None
        return None, None, None, length, width
    if kind == "point":
        at = f.quantity("at", "length")
        if at is None:
            return None
        return at, None, None, length, width
    start = f.quantity("from", "length", required=False)
    end = f.quantity("to", "length", required=False)
    start = 0.0 if start is None else start
    end = member.length if end is None else end
    if end <= start:
        f.errors.add("'to' must be beyond 'from'", f.loc("to"))
        return None
    return None, start, end, None, None


def _check_loads_within_members(members: dict[str, Member], loads: tuple[Load, ...], errors: ErrorCollector) -> None:
    for load in loads:
        member = members[load.member]
        positions = [p for p in (load.at, load.start, load.end) if p is not None]
        if any(not -1e-9 <= p <= member.length + 1e-9 for p in positions):
            errors.add(
                f"load lies outside member '{member.id}' (length {member.length * 1000:.0f} mm)",
                load.loc,
            )


# ---------------------------------------------------------------- support graph


def suspicious_characters(text: str) -> str:
    """Why an id may not be what it looks like: invisible characters, or letters of two scripts."""
    for ch in text:
        if unicodedata.category(ch) in ("Cf", "Zl", "Zp") or (unicodedata.category(ch) == "Zs" and ch != " "):
            return f"holds the invisible character U+{ord(ch):04X} {unicodedata.name(ch, '')}".rstrip()
    scripts = {unicodedata.name(ch, "").split(" ")[0] for ch in text if ch.isalpha()}
    if len(scripts) > 1 and "LATIN" in scripts:
        odd = next(ch for ch in text if ch.isalpha() and not unicodedata.name(ch, "").startswith("LATIN"))
        return f"mixes scripts: U+{ord(odd):04X} {unicodedata.name(odd, '')} beside Latin letters (a look-alike?)"
    return ""


def _id_warnings(members: dict[str, Member], bearings: tuple[Bearing, ...], loads: tuple[Load, ...]):
    named = [(m.id, m.loc, "member id") for m in members.values()]
    for b in bearings:
        named.append((b.id, b.loc, "bearing id"))
        named += [(a, b.loc, "alias") for a in b.aliases]
    named += [(ld.id, ld.loc, "load id") for ld in loads]
    for text, loc, what in named:
        why = suspicious_characters(text)
        if why:
            yield f"{loc}: {what} {text!r} {why}"


def _support_extent(b: Bearing, members: dict[str, Member]) -> tuple[float, float]:
    """Where a support's contact lies along the member above: its stated length, else a post's depth or the width of
    the member below."""
    at = b.upper.at if b.upper.at is not None else 0.0
    lower = members[b.lower.member]
    length = b.upper.length or (lower.d if lower.vertical else lower.b)
    return at - length / 2, at + length / 2


def _check_supports_apart(
    member: Member, below: list[Bearing], members: dict[str, Member], errors: ErrorCollector
) -> None:
    """Two supports of one member whose contacts overlap are one support typed twice, not two."""
    placed = sorted((b for b in below if b.upper.at is not None), key=lambda b: b.upper.at or 0.0)
    for first, second in itertools.pairwise(placed):
        end_first = _support_extent(first, members)[1]
        start_second = _support_extent(second, members)[0]
        if start_second < end_first - 1e-9:
            errors.add(
                f"supports '{first.id}' and '{second.id}' of '{member.id}' overlap along it "
                f"(centres {(first.upper.at or 0.0) * 1000:.0f} mm and {(second.upper.at or 0.0) * 1000:.0f} mm); "
                "give one bearing, or move them apart",
                second.loc,
            )


def _check_support_graph(members: dict[str, Member], bearings: tuple[Bearing, ...], errors: ErrorCollector) -> None:
    supports: dict[str, list[Bearing]] = {m: [] for m in members}
    for b in bearings:
        supports[b.upper.member].append(b)
    for member in members.values():
        below = supports[member.id]
        if member.vertical and len(below) > 1:
            errors.add(
                f"post '{member.id}' bears on {len(below)} members; a post has one bearing at its foot",
                below[1].loc,
            )
        elif not member.vertical and member.continuous and below:
            errors.add(
                f"'{member.id}' is continuously supported and cannot also bear on other members",
                below[0].loc,
            )
        elif not member.vertical and not member.continuous and len(below) < 2:
            errors.add(
                f"horizontal member '{member.id}' has {len(below)} support(s); it needs at least two "
                "bearings, or 'support: continuous'",
                member.loc,
            )
        _check_supports_apart(member, below, members, errors)
    cycle = find_support_cycle(members, bearings)
    if cycle:
        first = next(b for b in bearings if b.upper.member == cycle[0] and b.lower.member == cycle[1])
        errors.add(f"members support each other in a cycle: {' -> '.join(cycle)}", first.loc)


def find_support_cycle(members: dict[str, Member], bearings: tuple[Bearing, ...]) -> list[str]:
    """A list of member ids forming a cycle (upper -> lower -> ... -> upper), or []."""
    below: dict[str, list[str]] = {m: [] for m in members}
    for b in bearings:
        below[b.upper.member].append(b.lower.member)
    state: dict[str, int] = {}
    for start in sorted(members):
        if state.get(start):
            continue
        stack: list[tuple[str, int]] = [(start, 0)]
        path: list[str] = []
        while stack:
            node, i = stack.pop()
            if i == 0:
                state[node] = 1
                path.append(node)
            nxt = below[node]
            if i < len(nxt):
                stack.append((node, i + 1))
                child = nxt[i]
                if state.get(child) == 1:
                    return [*path[path.index(child) :], child]
                if not state.get(child):
                    stack.append((child, 0))
            else:
                state[node] = 2
                path.pop()
    return []
