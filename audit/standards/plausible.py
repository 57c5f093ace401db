"""Plausible ranges (rules/plausible-ranges.yaml): a value outside its range is a slip, refused where it stands.

The ranges are data with their provenance, like a rule pack's values; this module reads them
once and says whether a value lies within. Outside, a value is a unit, sign or decimal-point
slip (5.3 GPa for 5.3 MPa, a load factor of -1.25, a joist 38 m wide), never a material or a
code, so it is refused with its file, line and key rather than carried into a plausible-looking
wrong number.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

from audit.core.errors import ErrorCollector, InputError, Location
from audit.core.located_yaml import Node, read_yaml_file
from audit.core.units import parse_quantity
from audit.standards.bundled import builtin_rules_dir

FILE = "plausible-ranges.yaml"
KIND = "plausible"


@dataclass(frozen=True)
class Range:
    low: float
    high: float
    unit: str  # how the bounds are shown: "MPa", "mm" or ""
    source: str

    def holds(self, value: float) -> bool:
        return self.low <= value <= self.high

    def shown(self) -> str:
        scale = {"MPa": 1e6, "mm": 1e-3}.get(self.unit, 1.0)
        unit = f" {self.unit}" if self.unit else ""
        return f"{self.low / scale:g}{unit} to {self.high / scale:g}{unit}"


@dataclass(frozen=True)
class Ranges:
    fcp: dict[str, Range]
    fc: dict[str, Range]
    load_factor: Range
    section: Range
    least_load_unit_weight: float  # N/m3: a load on a timber member below its own weight at this is warned


def _range(node: Node, dimension: str | None, unit: str) -> Range:
    if not isinstance(node.value, dict) or "value" not in node.value:
        raise InputError("expected {value: [low, high], clause, source, status}", node.loc)
    bounds = node.value["value"]
    if not isinstance(bounds.value, list) or len(bounds.value) != 2:
        raise InputError("expected [low, high]", bounds.loc)
    if dimension is None:
        values = []
        for b in bounds.value:
            if isinstance(b.value, bool) or not isinstance(b.value, (int, float)):
                raise InputError("expected a plain number", b.loc)
            values.append(float(b.value))
    else:
        values = [parse_quantity(b.value, dimension, b.loc) for b in bounds.value]
    low, high = values
    if not low <= high:
        raise InputError("the low bound is above the high one", bounds.loc)
    source = node.value.get("source")
    return Range(low, high, unit, str(source.value) if source is not None else "")


@lru_cache(maxsize=1)
def ranges() -> Ranges:

    root = read_yaml_file(builtin_rules_dir() / FILE)
    get = root.value.get

    def by_family(key: str) -> dict[str, Range]:
        node = get(key)
        if node is None or not isinstance(node.value, dict):
            raise InputError(f"missing '{key}' by family", root.child_loc(key))
        return {fam: _range(n, "stress", "MPa") for fam, n in node.value.items()}

    for key in ("load_factor", "section_dimension", "least_load_unit_weight"):
        if get(key) is None:
            raise InputError(f"missing '{key}'", root.child_loc(key))
    return Ranges(
        by_family("strength_perpendicular"),
        by_family("strength_parallel"),
        _range(get("load_factor"), None, ""),
        _range(get("section_dimension"), "length", "mm"),
        _unit_weight(get("least_load_unit_weight")),
    )


def _unit_weight(node: Node) -> float:
    """A unit weight stated in kN/m**3 (the dimension no quantity of a model has), as N/m3."""
    value = node.value.get("value") if isinstance(node.value, dict) else None
    unit = node.value.get("unit") if isinstance(node.value, dict) else None
    if value is None or isinstance(value.value, bool) or not isinstance(value.value, (int, float)) or value.value <= 0:
        raise InputError("expected {value: <kN per cubic metre>, unit: kN/m**3, ...}", node.loc)
    if unit is None or unit.value != "kN/m**3":
        raise InputError("the unit weight is stated in kN/m**3", node.loc)
    return float(value.value) * 1000.0


def light_load_warnings(members: dict[str, Any], loads: tuple[Any, ...], timber: Callable[[Any], bool]) -> list[str]:
    """One warning per load entry (a layout area's shares come from one entry) lighter than its member."""
    unit_weight = ranges().least_load_unit_weight
    out: dict[str, str] = {}
    biggest: dict[tuple[str, str], float] = {}
    for load in loads:
        key = (load.id, load.member)
        biggest[key] = max(biggest.get(key, 0.0), abs(load.magnitude))
    for load in loads:
        member = members.get(load.member)
        where = str(load.loc)
        if member is None or where in out or not timber(member):
            continue
        per_metre = unit_weight * member.b * member.d
        own, what = (per_metre, "") if load.kind == "uniform" else (per_metre * member.length, " for the whole member")
        largest = biggest[(load.id, load.member)]
        if 0 < largest < own:
            unit = "N/m" if load.kind == "uniform" else "N"
            out[where] = (
                f"{where}: load '{load.id}' on '{member.id}' is {largest:.3g} {unit} at most, less than the member's "
                f"own weight ({own:.3g} {unit}{what}): kN or kPa meant?"
            )
    return list(out.values())


def check(value: float, bounds: Range | None, what: str, where: Location, errors: ErrorCollector) -> bool:
    """Note an error where ``value`` lies outside ``bounds``; True when it lies within (or nothing bounds it)."""
    if bounds is None or bounds.holds(value):
        return True
    scale = {"MPa": 1e6, "mm": 1e-3}.get(bounds.unit, 1.0)
    unit = f" {bounds.unit}" if bounds.unit else ""
    errors.add(
        f"{what} = {value / scale:g}{unit} is implausible: outside {bounds.shown()} (see {FILE}); a unit, sign or "
        "decimal-point slip?",
        where,
    )
    return False
