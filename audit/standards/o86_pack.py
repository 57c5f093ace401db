"""CSA O86's rule packs: the fields, choices and readings of O86's bearing clauses, read into ``O86Pack``.

The fields every standard's pack shares are read by ``packs.read_core_fields``; this module reads
the rest (phi, KB, KZcp, KD, KScp, KSc, the near-support clause) and refuses a field, choice or
reading that O86's code does not implement.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass
from functools import cached_property
from typing import Any

from audit.core.errors import ErrorCollector, InputError
from audit.core.located_yaml import Node
from audit.core.units import parse_quantity
from audit.standards.packs import (
    DURATIONS,
    PACK_HEAD_KEYS,
    SERVICES,
    PackCore,
    PackReader,
    Sourced,
    _family_list,
    _length,
    _number,
    check_readings,
    read_choice,
    read_core_fields,
    refuse_unknown_fields,
)

# The two-way readings every resistance pack states, as (section, key); a project selects one
# by its dotted name "section.key".
CHOICES = (
    ("near_support", "area_limit"),
    ("near_support", "kb_reading"),
    ("near_support", "opposite_bearings"),
    ("near_support", "distributed_loads"),
    ("kzcp", "built_up"),
)
# The readings O86's resistance code implements at each choice: a pack naming another is refused
# (a new reading is new code in the standard's module, never a label the old formula runs under).
O86_READINGS = {
    "near_support.area_limit": ("length_cap", "area_cap"),
    "near_support.kb_reading": ("both_qualify", "shorter_bearing"),
    "near_support.opposite_bearings": ("longest_single", "summed"),
    "near_support.distributed_loads": ("within_d", "bearings_only"),
    "kzcp.built_up": ("per_ply", "combined"),
}


O86_KEYS = (
    *PACK_HEAD_KEYS,
    "phi",
    "timber_families",
    "clauses",
    "fcp",
    "fc",
    "kb",
    "kzcp",
    "kd",
    "kscp",
    "ksc",
    "uplift",
    "near_support",
)


@dataclass(frozen=True)
class Table:
    """Piecewise-linear table, held constant beyond its ends."""

    points: tuple[tuple[float, float], ...]

    def __post_init__(self) -> None:
        xs = [p[0] for p in self.points]
        if len(xs) < 2 or any(b <= a for a, b in itertools.pairwise(xs)):
            raise ValueError("table x values must rise strictly, with at least two points")

    def at(self, x: float) -> float:
        pts = self.points
        if x <= pts[0][0]:
            return pts[0][1]
        for (x0, y0), (x1, y1) in itertools.pairwise(pts):
            if x <= x1:
                return y0 + (y1 - y0) * (x - x0) / (x1 - x0)
        return pts[-1][1]


@dataclass(frozen=True)
class O86Pack(PackCore):
    """A CSA O86 pack: the core, and the factors and readings of O86's bearing clauses."""

    phi: Sourced
    kb_max_length: Sourced  # m
    kb_min_end_distance: Sourced  # m
    kb_table: Sourced  # Table over bearing length in m
    kzcp_families: Sourced
    kzcp_table: Sourced  # Table over b/d
    kd: dict[str, Sourced]
    kd_long_term: Sourced  # dict intercept/slope/floor
    kd_long_term_live: Sourced  # live-load kinds counted as long-term in the KD formula, e.g. [storage]
    kscp: dict[str, Sourced]  # family -> {dry, wet}
    ksc: dict[str, Sourced]
    near_factor: Sourced
    near_reach: Sourced
    near_area_ratio: float

    @cached_property
    def long_term_live(self) -> tuple[str, ...]:
        """The load cases of live load the KD formula counts as long-term, e.g. ('L:storage',)."""
        return tuple(f"L:{kind}" for kind in self.kd_long_term_live.value)

    def all_sourced(self) -> list[tuple[str, Sourced]]:
        """Every value with a dotted name, for listing."""
        out: list[tuple[str, Sourced]] = [("phi", self.phi), *self.core_sourced()]
        out += [
            ("kb.max_length", self.kb_max_length),
            ("kb.min_end_distance", self.kb_min_end_distance),
            ("kb.table", self.kb_table),
            ("kzcp.families", self.kzcp_families),
            ("kzcp.table", self.kzcp_table),
        ]
        out += [(f"kd.{k}", v) for k, v in self.kd.items()]
        out.append(("kd.long_term_formula", self.kd_long_term))
        out.append(("kd.long_term_live", self.kd_long_term_live))
        out.append(("uplift.note_below", self.uplift_note_below))
        out += [(f"kscp.{k}", v) for k, v in self.kscp.items()]
        out += [(f"ksc.{k}", v) for k, v in self.ksc.items()]
        out += [
            ("near_support.factor", self.near_factor),
            ("near_support.reach", self.near_reach),
        ]
        out += [(name, c.default) for name, c in self.choices.items()]
        return out


def _number_conv(node: Node, _parent: Node) -> float:
    return _number(node)


def _table(node: Node, parent: Node) -> Table:
    if not isinstance(node.value, list):
        raise InputError("expected a list of [x, y] points", node.loc)
    scale = 1.0
    unit_node = parent.value.get("unit")
    if unit_node is not None:
        scale = parse_quantity(f"1 {unit_node.value}", "length", unit_node.loc)
    points = []
    for item in node.value:
        if not isinstance(item.value, list) or len(item.value) != 2:
            raise InputError("expected a point [x, y]", item.loc)
        points.append((_number(item.value[0]) * scale, _number(item.value[1])))
    try:
        return Table(tuple(points))
    except ValueError as exc:
        raise InputError(str(exc), node.loc) from None


def _service_pair(node: Node, _parent: Node) -> dict[str, float]:
    if not isinstance(node.value, dict) or set(node.value) != set(SERVICES):
        raise InputError("expected {dry: number, wet: number}", node.loc)
    return {k: _number(node.value[k], 0.0, 2.0) for k in SERVICES}


def _live_kinds(node: Node, _parent: Node) -> tuple[str, ...]:
    if not isinstance(node.value, list) or any(item.value not in ("storage",) for item in node.value):
        raise InputError("expected a list of live-load kinds: [storage] or []", node.loc)
    return tuple(str(item.value) for item in node.value)


def _long_term(node: Node, _parent: Node) -> dict[str, float]:
    if not isinstance(node.value, dict) or set(node.value) != {"intercept", "slope", "floor"}:
        raise InputError("expected {intercept, slope, floor}", node.loc)
    return {k: _number(v) for k, v in node.value.items()}


def read_o86_pack(root: Node, path: str) -> O86Pack:
    """A CSA O86 pack."""
    errors = ErrorCollector()
    r = PackReader(errors)
    refuse_unknown_fields(root, O86_KEYS, "o86", errors)
    get = root.value.get

    def sub(parent: Node | None, key: str) -> Node | None:
        return r.mapping(parent, key) if parent is not None else None

    core = read_core_fields(root, r, errors)
    kb = sub(root, "kb")
    kz = sub(root, "kzcp")
    kd = sub(root, "kd")
    ns = sub(root, "near_support")
    kscp = sub(root, "kscp")
    ksc = get("ksc")
    area = sub(ns, "area_limit")
    pack_kwargs: dict[str, Any] = dict(
        phi=r.sourced(get("phi"), lambda n, p: _number(n, 0.0, 1.0)),
        clauses=core["clauses"],
        timber_families=core["timber_families"],
        kb_max_length=r.sourced(sub(kb, "max_length"), _length),
        kb_min_end_distance=r.sourced(sub(kb, "min_end_distance"), _length),
        kb_table=r.sourced(sub(kb, "table"), _table),
        kzcp_families=r.sourced(sub(kz, "families"), _family_list),
        kzcp_table=r.sourced(sub(kz, "table"), _table),
        kd={d: s for d in DURATIONS if (s := r.sourced(sub(kd, d), _number_conv))},
        kd_long_term=r.sourced(sub(kd, "long_term_formula"), _long_term),
        kd_long_term_live=r.sourced(sub(kd, "long_term_live"), _live_kinds),
        kscp={f: s for f, n in (kscp.value.items() if kscp else []) if (s := r.sourced(n, _service_pair))},
        ksc={f: s for f, n in (ksc.value.items() if ksc else []) if (s := r.sourced(n, _service_pair))},
        near_factor=r.sourced(sub(ns, "factor"), lambda n, p: _number(n, 0.0, 1.0)),
        near_reach=r.sourced(sub(ns, "reach"), _number_conv),
        uplift_note_below=core["uplift_note_below"],
    )
    pack_kwargs["own_comment_from"] = core["own_comment_from"]
    choices = {}
    for section, key in CHOICES:
        parent = root.value.get(section)
        node = parent.value.get(key) if parent is not None and isinstance(parent.value, dict) else None
        if node is None:
            errors.add(f"missing '{key}': a reading of the standard every pack states", root.child_loc(section))
            continue
        choice = read_choice(r, node, f"{section}.{key}")
        if choice is not None:
            check_readings(choice, node, O86_READINGS, "o86", errors)
            choices[choice.name] = choice
    ratio = 1.5
    if area is not None and "ratio" in area.value:
        try:
            ratio = _number(area.value["ratio"])
        except InputError as exc:
            errors.extend(exc)
    errors.raise_if_any()
    missing = [k for k, v in pack_kwargs.items() if v is None]
    if missing:
        raise InputError(f"rule pack lacks {', '.join(missing)}", root.loc)
    uncited = [f for f in pack_kwargs["timber_families"].value if f not in pack_kwargs["clauses"]]
    if uncited:
        raise InputError(f"rule pack gives no clauses for {', '.join(uncited)}", root.child_loc("clauses"))
    return O86Pack(
        id=r.text(root, "id"),
        title=r.text(root, "title", ""),
        edition=r.text(root, "edition", ""),
        provenance=r.text(root, "provenance", ""),
        path=path,
        standard="o86",
        fcp=core["fcp"],
        fc=core["fc"],
        near_area_ratio=ratio,
        choices=choices,
        **pack_kwargs,
    )
