"""Minimum bearing lengths (rules/minimum-bearing-recalled.yaml): the least length a code asks at a member's end.

Data with its provenance, like a rule pack's values, read once. The review compares each end
bearing of a joist or beam with the minimum for its role and what it bears on
(``review/minimum_bearing.py``); a standard with no rules here asks for no minimum.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

from audit.core.errors import InputError
from audit.core.located_yaml import Node, read_yaml_file
from audit.core.units import parse_quantity
from audit.standards.bundled import builtin_rules_dir

FILE = "minimum-bearing-recalled.yaml"
KIND = "minimum-bearing"
ROLES = ("joist", "beam")
SUPPORTS = ("wood", "masonry")


@dataclass(frozen=True)
class Minimum:
    role: str  # joist | beam
    on: str  # wood | masonry
    length: float  # m
    clause: str
    source: str
    status: str


def _text(item: Node, key: str) -> str:
    node = item.value.get(key)
    if node is None or isinstance(node.value, (dict, list)):
        raise InputError(f"missing or malformed field '{key}'", item.child_loc(key))
    return str(node.value)


def _rule(item: Node) -> Minimum:
    if not isinstance(item.value, dict):
        raise InputError("expected {role, on, value, clause, source, status}", item.loc)
    role, on = _text(item, "role"), _text(item, "on")
    if role not in ROLES or on not in SUPPORTS:
        raise InputError(f"role must be one of {', '.join(ROLES)} and on one of {', '.join(SUPPORTS)}", item.loc)
    value = item.value.get("value")
    if value is None:
        raise InputError("missing field 'value'", item.child_loc("value"))
    length = parse_quantity(value.value, "length", value.loc)
    return Minimum(role, on, length, _text(item, "clause"), _text(item, "source"), _text(item, "status"))


def read_minimums(root: Node) -> dict[str, tuple[Minimum, ...]]:
    """Standard id -> its minimum bearing rules."""
    table = root.value.get("minimums") if isinstance(root.value, dict) else None
    if table is None or not isinstance(table.value, dict):
        raise InputError("expected 'minimums' by standard", root.loc)
    out = {}
    for standard, rules in table.value.items():
        if not isinstance(rules.value, list):
            raise InputError("expected a list of rules", rules.loc)
        out[str(standard)] = tuple(_rule(item) for item in rules.value)
    return out


@lru_cache(maxsize=1)
def bundled_minimums() -> dict[str, tuple[Minimum, ...]]:
    return read_minimums(read_yaml_file(builtin_rules_dir() / FILE))


def minimum_for(standard: str, role: str, on: str) -> Minimum | None:
    return next((m for m in bundled_minimums().get(standard, ()) if m.role == role and m.on == on), None)
