"""Cell values: numbers with thousands separators, units from the header or the cell, OK columns."""

from __future__ import annotations

import re

from audit.core.errors import InputError, Location
from audit.inputs.pdf.columns import FIELD_DIMENSION, UNIT_ALIASES

# SI factors of the units calc sheets print, so reading a cell needs no unit library; any other unit
# goes to pint (core/units.py). tests/test_extract_pdf.py checks each factor against pint.
SI_FACTOR: dict[tuple[str, str], float] = {
    ("force", "N"): 1.0,
    ("force", "kN"): 1000.0,
    ("force", "lbf"): 4.4482216152605,  # the pound-force, exactly by definition
    ("force", "kip"): 4448.2216152605,
    ("stress", "MPa"): 1e6,
    ("stress", "psi"): 6894.757293168361,
    ("stress", "ksi"): 6894757.293168361,
    ("length", "mm"): 1e-3,
    ("length", "m"): 1.0,
    ("length", "in"): 0.0254,
    ("length", "ft"): 0.3048,
    ("area", "mm**2"): 1e-6,
    ("area", "m**2"): 1.0,
    ("area", "in**2"): 0.00064516,
}
PLAUSIBLE = {"force": 1e10, "stress": 1e10, "length": 1e3, "area": 1e4}  # as core/units.LIMITS


def quantity(number: float, unit: str, dimension: str, where: Location) -> float:
    """number × unit in SI: from the table above, else (a rare unit, an implausible value) through pint."""
    name = unit_name(unit)
    factor = SI_FACTOR.get((dimension, name))
    if factor is not None and abs(number * factor) <= PLAUSIBLE[dimension]:
        return number * factor
    from audit.core.units import parse_quantity

    return parse_quantity(f"{number!r} {name}", dimension, where)


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
    return quantity(number, unit, dimension, where)


def parse_adequate(text: str) -> bool | None:
    t = text.strip().lower().replace(".", "")
    if t in ("ok", "yes", "pass", "passes", "adequate", "✓", "y", "satisfactory"):
        return True
    if t in ("ng", "no", "fail", "fails", "inadequate", "not ok", "✗", "n"):
        return False
    return None
