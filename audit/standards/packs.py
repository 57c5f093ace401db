"""Read rule packs (data files under ``rules/``) into frozen, self-validating records.

Code interprets, data states: every number the resistance stage uses comes from here, and
each keeps its clause, source and status so the memo and ``bearing-audit rules`` can show
where it came from.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

from audit.core.errors import ErrorCollector, InputError
from audit.core.located_yaml import Node, node_text
from audit.core.suggest import did_you_mean
from audit.core.units import parse_quantity
from audit.engine.model import STORAGE_LIVE, base_case
from audit.standards import plausible

DURATIONS = ("permanent", "standard", "short")
# The check kinds whose clauses an O86 pack states; a standard with other kinds declares its own (NDS and EC5
# have no near-support check, so their packs state the local clause alone).
CLAUSE_KINDS = ("local", "near-support")
PACK_HEAD_KEYS = ("kind", "id", "title", "edition", "provenance", "standard", "review")
SERVICES = ("dry", "wet")
TIMBER_FAMILIES_ALL = ("sawn_lumber", "timber", "glulam", "engineered")
ALL_FAMILIES = (*TIMBER_FAMILIES_ALL, "steel", "concrete", "masonry")


@dataclass(frozen=True)
class Sourced:
    """A value with its provenance."""

    value: Any
    clause: str
    source: str
    status: str


@dataclass(frozen=True)
class SpeciesStrength:
    fcp: Sourced  # Pa; for glulam, bearing on the compression-face laminations
    grades: tuple[str, ...]
    tension_face: Sourced | None = None  # Pa, glulam bearing on the tension-face laminations, where it differs


@dataclass(frozen=True)
class Choice:
    """A place where the standard is read two ways: both readings are stated, the default is the conservative one."""

    name: str  # dotted place in the pack, e.g. near_support.area_limit; how a project selects it
    title: str  # how the memo names it
    default: Sourced  # value: the id of the default reading
    readings: dict[str, str]  # reading id -> what it says

    def text(self, reading: str) -> str:
        return self.readings[reading]


@dataclass(frozen=True)
class PackCore:
    """What every standard's resistance pack states: the materials, the clauses findings cite, the readings."""

    id: str
    title: str
    edition: str
    provenance: str
    path: str
    standard: str  # the standard module that interprets the pack (o86, nds, ec5)
    timber_families: Sourced
    fcp: dict[str, dict[str, SpeciesStrength]]  # strength perpendicular to grain by family and species
    fc: dict[str, dict[str, Sourced]]  # value: Pa for every grade, or grade -> Pa
    clauses: dict[str, Sourced]  # family -> {local: clause, near_support: clause}, as findings cite them
    uplift_note_below: Sourced  # N: calculated uplift below this is a note (continuity of the statics)
    choices: dict[str, Choice]  # every two-way reading, by its dotted name
    own_comment_from: Sourced  # Qf/Qr from which a missing check is a review comment of its own

    def fc_for(self, family: str, species: str, grade: str) -> float | None:
        """Compression parallel to grain for Hankinson's formula, by grade where the pack tabulates it."""
        entry = self.fc.get(family, {}).get(species)
        if entry is None:
            return None
        return entry.value.get(grade) if isinstance(entry.value, dict) else entry.value

    def is_timber(self, family: str) -> bool:
        return family in self.timber_families.value

    def clause_for(self, family: str, kind: str) -> str:
        """The clause a finding on this family cites: local bearing, or loads near a support."""
        return self.clauses[family].value[clause_key(kind)]

    def in_force(self, chosen: dict[str, str]) -> dict[str, str]:
        """The reading in force at every choice: the project's where it chose, else the pack's default."""
        return {name: chosen.get(name, c.default.value) for name, c in self.choices.items()}

    def core_sourced(self) -> list[tuple[str, Sourced]]:
        out: list[tuple[str, Sourced]] = [("timber_families", self.timber_families)]
        for fam, species in self.fcp.items():
            for sp, strength in species.items():
                out.append((f"fcp.{fam}.{sp}", strength.fcp))
                if strength.tension_face is not None:
                    out.append((f"fcp.{fam}.{sp}.tension_face", strength.tension_face))
        out += [(f"clauses.{fam}", clause) for fam, clause in self.clauses.items()]
        for fam, by_species in self.fc.items():
            for sp, val in by_species.items():
                out.append((f"fc.{fam}.{sp}", val))
        out.append(("review.own_comment_from", self.own_comment_from))
        return out

    def all_sourced(self) -> list[tuple[str, Sourced]]:
        """Every value with a dotted name, for listing."""
        return self.core_sourced() + [(name, c.default) for name, c in self.choices.items()]


@dataclass(frozen=True)
class Combination:
    name: str
    factors: dict[str, float]
    duration: str
    source: Sourced


@dataclass(frozen=True)
class CombinationPack:
    id: str
    title: str
    edition: str
    provenance: str
    path: str
    cases: tuple[str, ...]
    combinations: tuple[Combination, ...]
    counteracting_dead: Sourced  # dead-load factor where dead load resists (uplift search)
    patterns: dict[str, Sourced]  # case -> (low, high) factors a span may take on a continuous member
    storage_companion: Sourced  # companion factor of storage, equipment and service-room live load
    format: str = "limit-states"  # limit-states | ASD | LRFD: which standards can read it


# ---------------------------------------------------------------- reading


class PackReader:
    """Small helpers that read located nodes and collect errors."""

    def __init__(self, errors: ErrorCollector) -> None:
        self.errors = errors

    def mapping(self, node: Node, key: str) -> Node | None:
        child = node.value.get(key) if isinstance(node.value, dict) else None
        if child is None:
            self.errors.add(f"missing '{key}'", node.child_loc(key) if node else None)
            return None
        if not isinstance(child.value, dict):
            self.errors.add("expected a mapping", child.loc)
            return None
        return child

    def text(self, node: Node, key: str, default: str | None = None) -> str:
        child = node.value.get(key) if isinstance(node.value, dict) else None
        if child is None:
            if default is None:
                self.errors.add(f"missing '{key}'", node.child_loc(key))
            return default or ""
        return str(child.value).strip()

    def sourced(self, node: Node | None, convert: Any = None) -> Sourced | None:
        if node is None:
            return None
        if not isinstance(node.value, dict) or "value" not in node.value:
            self.errors.add("expected a mapping with value, clause, source and status", node.loc)
            return None
        for k in ("source", "status"):
            if k not in node.value:
                self.errors.add(f"missing '{k}': every value carries its provenance", node.child_loc(k))
        for k, item in node.value.items():
            if isinstance(k, str) and k != "value" and item.value is None:
                # in a one-line {...} mapping an unquoted comma ends the text and starts a key of its own
                self.errors.add(f"'{k}' has no value: quote a text that holds a comma", node.child_loc(k))
        raw = node.value["value"]
        try:
            value = convert(raw, node) if convert else _plain(raw)
        except InputError as exc:
            self.errors.extend(exc)
            return None
        return Sourced(
            value=value,
            clause=self.text(node, "clause", ""),
            source=self.text(node, "source", ""),
            status=self.text(node, "status", ""),
        )


def _plain(node: Node) -> Any:
    v = node.value
    if isinstance(v, dict):
        return {k: _plain(n) for k, n in v.items()}
    if isinstance(v, list):
        return [_plain(n) for n in v]
    return v


def _number(node: Node, lo: float = 0.0, hi: float = math.inf) -> float:
    v = node.value
    if isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v):
        raise InputError("expected a plain number", node.loc)
    if not lo < v <= hi:
        raise InputError(f"expected a number in ({lo}, {hi}], got {v}", node.loc)
    return float(v)


def _stress(node: Node, _parent: Node) -> float:
    value = parse_quantity(node.value, "stress", node.loc)
    if value <= 0:
        raise InputError("strength must be positive", node.loc)
    return value


def _stress_by_grade(node: Node, parent: Node) -> float | dict[str, float]:
    """One strength for every grade, or a mapping of grade -> strength."""
    if isinstance(node.value, dict):
        return {grade: _stress(value, node) for grade, value in node.value.items()}
    return _stress(node, parent)


def _length(node: Node, _parent: Node) -> float:
    value = parse_quantity(node.value, "length", node.loc)
    if value <= 0:
        raise InputError("length must be positive", node.loc)
    return value


def force_or_zero(node: Node, _parent: Node) -> float:
    value = parse_quantity(node.value, "force", node.loc)
    if value < 0:
        raise InputError("a force threshold must not be negative", node.loc)
    return value


def _family_list(node: Node, _parent: Node) -> tuple[str, ...]:
    if not isinstance(node.value, list):
        raise InputError("expected a list of material families", node.loc)
    out = []
    for item in node.value:
        if item.value not in ALL_FAMILIES:
            raise InputError(f"unknown family '{item.value}' (known: {', '.join(ALL_FAMILIES)})", item.loc)
        out.append(item.value)
    return tuple(out)


def _reading(node: Node, parent: Node) -> str:
    readings = parent.value.get("readings")
    names = set(readings.value) if readings is not None and isinstance(readings.value, dict) else set()
    if node.value not in names:
        raise InputError(f"reading '{node.value}' is not one of {sorted(names)}", node.loc)
    return str(node.value)


def _plausible_strength(value: Any, name: str, family: str, node: Node, errors: ErrorCollector) -> bool:
    """A strength (or one per grade) within the plausible range of its family; errors where it is not."""
    bounds = (plausible.ranges().fcp if name == "fcp" else plausible.ranges().fc).get(family)
    raw = node.value["value"]
    if isinstance(value, dict):
        return all(
            plausible.check(v, bounds, f"{name} of {family} grade {g}", raw.value[g].loc, errors)
            for g, v in value.items()
        )
    return plausible.check(value, bounds, f"{name} of {family}", raw.loc, errors)


def read_core_fields(
    root: Node, r: PackReader, errors: ErrorCollector, kinds: tuple[str, ...] = CLAUSE_KINDS
) -> dict[str, Any]:
    """The fields every standard's pack states: strengths, compression parallel, families, the clause of each check
    kind the standard declares (``kinds``), uplift note."""
    get = root.value.get

    def sub(parent: Node | None, key: str) -> Node | None:
        return r.mapping(parent, key) if parent is not None else None

    fcp: dict[str, dict[str, SpeciesStrength]] = {}
    fcp_node = sub(root, "fcp")
    for fam, fam_node in fcp_node.value.items() if fcp_node else []:
        if fam not in TIMBER_FAMILIES_ALL:
            errors.add(f"unknown family '{fam}'", fam_node.loc)
            continue
        fcp[fam] = {}
        for sp, sp_node in fam_node.value.items():
            s = r.sourced(sp_node, _stress)
            if s is not None and not _plausible_strength(s.value, "fcp", fam, sp_node, errors):
                continue
            grades_node = sp_node.value.get("grades") if isinstance(sp_node.value, dict) else None
            grades = tuple(node_text(g) for g in grades_node.value) if grades_node else ()
            tension = _tension_face(sp_node, s, errors)
            if s is not None:
                fcp[fam][sp] = SpeciesStrength(s, grades, tension)
    fc: dict[str, dict[str, Sourced]] = {}
    fc_node = get("fc")
    for fam, fam_node in fc_node.value.items() if fc_node else []:
        fc[fam] = {
            sp: s
            for sp, n in fam_node.value.items()
            if (s := r.sourced(n, _stress_by_grade)) and _plausible_strength(s.value, "fc", fam, n, errors)
        }

    clauses_node = sub(root, "clauses")
    return {
        "fcp": fcp,
        "fc": fc,
        "timber_families": r.sourced(sub(root, "timber_families"), _family_list),
        "clauses": {
            fam: c
            for fam, n in (clauses_node.value.items() if clauses_node else [])
            if (c := r.sourced(n, clauses_of(kinds)))
        },
        "uplift_note_below": r.sourced(sub(sub(root, "uplift"), "note_below"), force_or_zero),
        "own_comment_from": _own_comment_from(root, r),
    }


# A pack that states no review.own_comment_from gets this: a review practice, not a value of the standard.
OWN_COMMENT_FROM = Sourced(
    value=0.9,
    clause="",
    source="a missing check within a tenth of its resistance is worth a comment of its own (bearing-audit's default)",
    status="common practice",
)


def _own_comment_from(root: Node, r: PackReader) -> Sourced:
    """The pack's review.own_comment_from where it states one (optional), else bearing-audit's default."""
    review = root.value.get("review")
    if review is None:
        return OWN_COMMENT_FROM
    node = r.mapping(root, "review")
    stated = r.sourced(r.mapping(node, "own_comment_from"), _ratio) if node is not None else None
    return stated or OWN_COMMENT_FROM


def _ratio(node: Node, _parent: Node) -> float:
    """A plain number from 0 to 1 (a Qf/Qr)."""
    v = node.value
    if isinstance(v, bool) or not isinstance(v, (int, float)) or not 0 <= v <= 1:
        raise InputError(f"expected a Qf/Qr from 0 to 1, got {v!r}", node.loc)
    return float(v)


def refuse_unknown_fields(root: Node, allowed: tuple[str, ...], standard: str, errors: ErrorCollector) -> None:
    """A pack field the standard does not implement is refused, never ignored."""
    for key in root.value:
        if key not in allowed:
            errors.add(
                f"field '{key}' is not one that standard {standard} implements{did_you_mean(key, allowed)}",
                root.key_loc(key),
            )


def check_readings(
    choice: Choice, node: Node, implemented: Mapping[str, tuple[str, ...]], standard: str, errors: ErrorCollector
) -> None:
    """Every reading a pack names at a choice must be one the standard's code implements."""
    known = implemented.get(choice.name)
    if known is None:
        errors.add(f"choice '{choice.name}' is not one that standard {standard} implements", node.loc)
        return
    readings = node.value["readings"]
    for reading in choice.readings:
        if reading not in known:
            errors.add(
                f"reading '{reading}' of {choice.name} is not one that standard {standard} implements "
                f"(it implements: {', '.join(known)})",
                readings.key_loc(reading),
            )


def _tension_face(node: Node, compression: Sourced | None, errors: ErrorCollector) -> Sourced | None:
    """A glulam species' fcp on its tension face, under the same provenance as its fcp."""
    item = node.value.get("tension_face") if isinstance(node.value, dict) else None
    if item is None or compression is None:
        return None
    try:
        value = _stress(item, node)
    except InputError as exc:
        errors.extend(exc)
        return None
    return Sourced(value, compression.clause, compression.source + " (tension-face bearing)", compression.status)


def clause_key(kind: str) -> str:
    """A check kind as a pack's clauses name it: near-support -> near_support."""
    return kind.replace("-", "_")


def clauses_of(kinds: tuple[str, ...]):
    """The reader of one family's clauses: one per check kind the standard declares, no more and no fewer."""
    keys = tuple(clause_key(k) for k in kinds)

    def read(node: Node, _parent: Node) -> dict[str, str]:
        if not isinstance(node.value, dict) or set(node.value) != set(keys):
            raise InputError("expected {" + ", ".join(f"{k}: clause" for k in keys) + "}", node.loc)
        return {k: node_text(v) for k, v in node.value.items()}

    return read


def read_choice(r: PackReader, node: Node, name: str) -> Choice | None:
    default = r.sourced(node, _reading)
    if default is None:
        return None
    readings = node.value["readings"].value
    return Choice(name, r.text(node, "title", name), default, {k: str(v.value) for k, v in readings.items()})


def read_combination_pack(root: Node, path: str) -> CombinationPack:
    errors = ErrorCollector()
    r = PackReader(errors)
    cases_node = root.value.get("cases")
    cases = tuple(str(c.value) for c in cases_node.value) if cases_node else ()
    if not cases:
        errors.add("missing 'cases'", root.child_loc("cases"))
    combos = []
    combos_node = root.value.get("combinations")
    for item in combos_node.value if combos_node else []:
        if not isinstance(item.value, dict):
            errors.add("expected a mapping", item.loc)
            continue
        name = r.text(item, "name")
        duration = r.text(item, "duration")
        if duration and duration not in DURATIONS:
            errors.add(f"duration must be one of {', '.join(DURATIONS)}", item.child_loc("duration"))
        factors: dict[str, float] = {}
        f_node = item.value.get("factors")
        for case, val in f_node.value.items() if f_node else []:
            # a combination may state storage live load's own factor (EN 1990's seismic psi2 of storage)
            if case not in cases and not (case == STORAGE_LIVE and base_case(case) in cases):
                errors.add(f"unknown load case '{case}'", val.loc)
                continue
            try:
                factors[case] = _number(val, -10.0, 10.0)
                plausible.check(
                    factors[case], plausible.ranges().load_factor, f"load factor of {case}", val.loc, errors
                )
            except InputError as exc:
                errors.extend(exc)
        src = Sourced(None, r.text(item, "clause", ""), r.text(item, "source"), r.text(item, "status"))
        combos.append(Combination(name, factors, duration, src))
    if not combos:
        errors.add("no combinations", root.loc)
    counteracting = r.sourced(_required(root, "counteracting_dead", errors), lambda n, p: _number(n, 0.0, 2.0))
    patterns_node = root.value.get("patterns")
    patterns = {}
    for case, node in patterns_node.value.items() if patterns_node and isinstance(patterns_node.value, dict) else []:
        if case not in cases:
            errors.add(f"unknown load case '{case}'", node.loc)
            continue
        if (p := r.sourced(node, _span_factors)) is not None:
            patterns[case] = p
    storage_node = _required(root, "storage_live", errors)
    companion = _required(storage_node, "companion", errors) if storage_node is not None else None
    storage = r.sourced(companion, lambda n, p: _number(n, 0.0, 2.0))
    errors.raise_if_any()
    if counteracting is None or storage is None:
        raise InputError("combination pack lacks counteracting_dead or storage_live", root.loc)
    return CombinationPack(
        id=r.text(root, "id"),
        title=r.text(root, "title", ""),
        edition=r.text(root, "edition", ""),
        provenance=r.text(root, "provenance", ""),
        path=path,
        cases=cases,
        combinations=tuple(combos),
        counteracting_dead=counteracting,
        patterns=patterns,
        storage_companion=storage,
        format=r.text(root, "format", "limit-states"),
    )


def _required(node: Node, key: str, errors: ErrorCollector) -> Node | None:
    child = node.value.get(key) if isinstance(node.value, dict) else None
    if child is None:
        errors.add(f"missing '{key}'", node.child_loc(key))
    return child


def _span_factors(node: Node, _parent: Node) -> tuple[float, float]:
    """The two factors a span may take, low and high, each from 0 to 1."""
    if not isinstance(node.value, list) or len(node.value) != 2:
        raise InputError("expected [low, high] span factors, e.g. [0.0, 1.0]", node.loc)
    low, high = (_number_or_zero(item) for item in node.value)
    if not 0.0 <= low < high <= 1.0:
        raise InputError("span factors must satisfy 0 <= low < high <= 1", node.loc)
    return low, high


def _number_or_zero(node: Node) -> float:
    if node.value == 0:
        return 0.0
    return _number(node, 0.0, 1.0)
