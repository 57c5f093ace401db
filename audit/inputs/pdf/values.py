"""Cell values: numbers with thousands separators, units from the header or the cell, OK columns."""

from __future__ import annotations

import re

from audit.core.errors import InputError, Location
from audit.core.units import parse_quantity
from audit.inputs.pdf.columns import FIELD_DIMENSION, UNIT_ALIASES

STARTS_NUMERIC = re.compile(r"^\s*[-+\u2212]?\d")
NUMBER = re.compile(r"^[-+]?(\d{1,3}(,\d{3})+|\d+)(\.\d+)?$")


def parse_number(text: str) -> float | None:
    text = text.strip().replace("\u2212", "-")
    if not NUMBER.match(text):
        return None
    return float(text.replace(",", ""))


def unit_name(text: str) -> str:
    text = text.strip().strip(".")
    return UNIT_ALIASES.get(text.lower(), UNIT_ALIASES.get(text, text))


def parse_value(cell: str, name: str, table_units: dict[str, str], where: Location) -> float:
    """A cell's value in SI (N, Pa, m, m²) or as a plain number for factors."""
    cell = cell.strip()
    m = re.match(r"^([-+\u2212]?[\d,]*\.?\d+)\s*(.*)$", cell)
    if not m:
        raise InputError(f"'{cell}' is not a number", where)
    number = parse_number(m[1])
    if number is None:
        raise InputError(f"'{cell}' is not a number", where)
    unit = m[2].strip()
    if name == "utilisation":
        return number / 100.0 if unit == "%" else number
    dimension = FIELD_DIMENSION.get(name)
    if dimension is None:
        return number
    unit = unit or table_units.get(name, "")
    if not unit:
        raise InputError(f"'{cell}' for {name} has no unit in the cell or the header; give one in a --map", where)
    return parse_quantity(f"{number!r} {unit_name(unit)}", dimension, where)


def parse_adequate(text: str) -> bool | None:
    t = text.strip().lower().replace(".", "")
    if t in ("ok", "yes", "pass", "passes", "adequate", "✓", "y", "satisfactory"):
        return True
    if t in ("ng", "no", "fail", "fails", "inadequate", "not ok", "✗", "n"):
        return False
    return None
