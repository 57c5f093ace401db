"""Reading one mapping of an input file: fields by kind, each error located, none fatal on its own.

Shared by the model, claims and stud-wall readers. A reader collects every error of a file
and the caller raises them together.
"""

from __future__ import annotations

import math
from typing import Any

from audit.core.errors import ErrorCollector, InputError, Location
from audit.core.located_yaml import Node, node_text
from audit.core.suggest import did_you_mean
from audit.core.units import parse_quantity

__all__ = ["FieldReader", "describe_value", "list_items"]


class FieldReader:
    """Reads the fields of one mapping node, collecting errors instead of stopping."""

    def __init__(self, node: Node, allowed: set[str], errors: ErrorCollector, what: str) -> None:
        self.node = node
        self.errors = errors
        self.ok = True
        if not isinstance(node.value, dict):
            errors.add(f"expected a mapping for {what}, got {describe_value(node.value)}", node.loc)
            self.ok = False
            self.map: dict[str, Node] = {}
            return
        self.map = node.value
        for key in node.value:
            if key not in allowed:
                hint = did_you_mean(key, allowed)
                errors.add(
                    f"unknown key '{key}' in {what}{hint or ' (allowed: ' + ', '.join(sorted(allowed)) + ')'}",
                    node.key_loc(key),
                )

    def has(self, key: str) -> bool:
        return key in self.map

    def loc(self, key: str) -> Location:
        return self.map[key].loc if key in self.map else self.node.child_loc(key)

    def _get(self, key: str, required: bool) -> Node | None:
        node = self.map.get(key)
        if node is None and required and self.ok:
            self.errors.add(f"missing field '{key}'", self.node.child_loc(key))
            self.ok = False
        return node

    def text(self, key: str, required: bool = True, default: str = "", limit: int = 500) -> str:
        node = self._get(key, required)
        if node is None:
            return default
        if isinstance(node.value, (dict, list)) or node.value is None:
            self.errors.add(f"expected text, got {describe_value(node.value)}", node.loc)
            self.ok = False
            return default
        text = node_text(node)
        if len(text) > limit:
            self.errors.add(f"text is {len(text)} characters long (limit {limit})", node.loc)
            self.ok = False
            return default
        return text

    def choice(self, key: str, options: tuple[str, ...], required: bool = True, default: str = "") -> str:
        value = self.text(key, required, default)
        if value and value not in options:
            self.errors.add(f"'{value}' is not one of: {', '.join(options)}", self.loc(key))
            self.ok = False
            return default
        return value

    def quantity(self, key: str, dimension: str, required: bool = True, positive: bool = False) -> float | None:
        node = self._get(key, required)
        if node is None:
            return None
        try:
            value = parse_quantity(node.value, dimension, node.loc)
        except InputError as exc:
            self.errors.extend(exc)
            self.ok = False
            return None
        if positive and value <= 0:
            self.errors.add(f"{key} must be positive, got '{node.value}'", node.loc)
            self.ok = False
            return None
        return value

    def flag(self, key: str, default: bool = False) -> bool:
        """A yes/no field given as true or false."""
        node = self._get(key, False)
        if node is None:
            return default
        if not isinstance(node.value, bool):
            self.errors.add(f"expected true or false, got {describe_value(node.value)}", node.loc)
            self.ok = False
            return default
        return node.value

    def number(self, key: str, lo: float, hi: float, default: float) -> float:
        node = self._get(key, False)
        if node is None:
            return default
        v = node.value
        if isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v) or not lo <= v <= hi:
            self.errors.add(f"expected a number from {lo} to {hi}, got {v!r}", node.loc)
            self.ok = False
            return default
        return float(v)


def describe_value(value: Any) -> str:
    if isinstance(value, dict):
        return "a mapping"
    if isinstance(value, list):
        return "a list"
    if value is None:
        return "nothing"
    return f"'{str(value)[:40]}'"


def list_items(node: Node, what: str, errors: ErrorCollector) -> list[Node]:
    if node.value is None:
        return []
    if not isinstance(node.value, list):
        errors.add(f"expected a list of {what}, got {describe_value(node.value)}", node.loc)
        return []
    return node.value
