"""The units edge: quantities are read where values come in.

Inside the program every quantity is a plain SI float (N, m, Pa, N/m, rad). Nothing past
this module touches pint. The units a model or a calc is written in are in a table of their
SI factors (checked against pint and the exact definitions); pint, imported only when first
needed, reads any other unit and words every error.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import lru_cache
from typing import TYPE_CHECKING, Any

from audit.core.errors import InputError, Location

if TYPE_CHECKING:
    import pint


@lru_cache(maxsize=1)
def _registry() -> pint.UnitRegistry:
    """pint's registry, built on first use: importing pint and building it is a fifth of a small run."""
    import pint

    ureg: pint.UnitRegistry = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    ureg.define("plf = lbf / foot")
    ureg.define("klf = kip / foot")
    ureg.define("psf = lbf / foot ** 2")  # floor and roof loads in US practice (pint has no psf)
    ureg.define("ksf = kip / foot ** 2")
    return ureg


# unit as written -> (dimension, SI factor). The factors are the floats pint's conversion gives,
# so a value read through the table is the very float it was when pint read every unit (outputs
# stay byte for byte); the US ones lie within 4e-16 of the exact definitions (inch 0.0254 m,
# foot 0.3048 m, lbf 0.45359237 kg x 9.80665 m/s2 = 4.4482216152605 N). tests/test_units_table.py
# checks every entry against pint and against those definitions, so the table cannot drift.
UNIT_TABLE: dict[str, tuple[str, float]] = {
    "mm": ("length", 0.001),
    "cm": ("length", 0.01),
    "m": ("length", 1.0),
    "in": ("length", 0.0254),
    "ft": ("length", 0.30479999999999996),
    "N": ("force", 1.0),
    "kN": ("force", 1000.0),
    "lbf": ("force", 4.4482216152605005),
    "kip": ("force", 4448.221615260501),
    "N/m": ("line_load", 1.0),
    "kN/m": ("line_load", 1000.0),
    "N/mm": ("line_load", 1000.0),
    "lbf/ft": ("line_load", 14.59390293720637),
    "plf": ("line_load", 14.59390293720637),
    "klf": ("line_load", 14593.902937206369),
    "kip/ft": ("line_load", 14593.902937206369),
    "lbf/in": ("line_load", 175.12683524647645),
    "Pa": ("stress", 1.0),
    "kPa": ("stress", 1000.0),
    "MPa": ("stress", 1000000.0),
    "GPa": ("stress", 1000000000.0),
    "N/mm**2": ("stress", 1000000.0),
    "N/mm^2": ("stress", 1000000.0),
    "kN/m**2": ("stress", 1000.0),
    "psf": ("stress", 47.88025898033584),
    "ksf": ("stress", 47880.25898033584),
    "psi": ("stress", 6894.7572931683635),
    "ksi": ("stress", 6894757.293168363),
    "mm**2": ("area", 1e-06),
    "mm^2": ("area", 1e-06),
    "cm**2": ("area", 0.0001),
    "m**2": ("area", 1.0),
    "m^2": ("area", 1.0),
    "in**2": ("area", 0.00064516),
    "in^2": ("area", 0.00064516),
    "ft**2": ("area", 0.09290303999999999),
    "deg": ("angle", 0.017453292519943295),
    "degree": ("angle", 0.017453292519943295),
    "rad": ("angle", 1.0),
    "radian": ("angle", 1.0),
}

# Largest plausible magnitude per dimension (SI): beyond it a value is a typo or a hostile file.
LIMITS = {"length": 1e3, "force": 1e10, "line_load": 1e9, "stress": 1e10, "angle": 7.0, "area": 1e4}

# dimension name -> (pint dimensionality, SI unit used inside, example for messages)
DIMENSIONS: dict[str, tuple[str, str, str]] = {
    "length": ("[length]", "m", "130 mm, 5.125 in"),
    "force": ("[force]", "N", "12.5 kN, 2800 lbf"),
    "line_load": ("[force] / [length]", "N/m", "4.2 kN/m, 290 plf"),
    "stress": ("[pressure]", "Pa", "7.0 MPa, 625 psi"),
    "angle": ("", "rad", "30 deg"),
    "area": ("[length] ** 2", "m**2", "19500 mm**2, 30 in**2"),
}


# how a message names each dimension: the reviewer's words, not the program's keys
SAID = {"line_load": "line load (force per length)", "stress": "stress or pressure"}


def _said(dimension: str) -> str:
    return SAID.get(dimension, dimension)


class UnitProblem(ValueError):
    """A quantity string that cannot be read as the wanted dimension."""


@lru_cache(maxsize=65536)
def _parse_cached(text: str, dimension: str) -> float:
    dim, si_unit, example = DIMENSIONS[dimension]
    ureg = _registry()
    try:
        q: Any = ureg.Quantity(text)
    except Exception:  # pint raises many kinds for unreadable text
        raise UnitProblem(f"cannot read '{text}' as a {_said(dimension)} (e.g. {example})") from None
    if not isinstance(q, ureg.Quantity):
        raise UnitProblem(f"'{text}' has no unit; give a {_said(dimension)} such as {example}")
    if dimension == "angle":
        if not (q.dimensionless and str(q.units) in {"degree", "radian", "arcminute"}):
            raise UnitProblem(f"'{text}' is not an angle (e.g. {example})")
    elif q.dimensionality != ureg.get_dimensionality(dim):
        raise UnitProblem(f"'{text}' is a {_describe(q)}, not a {_said(dimension)} (e.g. {example})")
    value = float(q.to(si_unit).magnitude)
    if not math.isfinite(value):
        raise UnitProblem(f"'{text}' is not a finite number")
    return value


def _describe(q: pint.Quantity) -> str:
    for name, (dim, _, _) in DIMENSIONS.items():
        if dim and q.dimensionality == _registry().get_dimensionality(dim):
            return _said(name)
    if q.dimensionless:
        return "plain number"
    return f"quantity of dimension {q.dimensionality}"


# "<number> <unit>": read the number with float() and the unit once (from the table, or through
# pint, cached), so thousands of quantities cost one look-up per distinct unit, not one per value.
_SIMPLE = re.compile(r"^([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([^\d\s.+-].*)$")


@lru_cache(maxsize=1024)
def _unit_factor(unit: str, dimension: str) -> float:
    known = UNIT_TABLE.get(unit)
    if known is not None and known[0] == dimension:
        return known[1]
    return _parse_cached(f"1 {unit}", dimension)  # pint reads it, or words why not


def _fast_parse(text: str, dimension: str) -> float:
    match = _SIMPLE.match(text)
    if match is None:
        return _parse_cached(text, dimension)
    try:
        factor = _unit_factor(match[2], dimension)
    except UnitProblem:
        return _parse_cached(text, dimension)  # the full parse words the message for the whole text
    value = float(match[1]) * factor
    if not math.isfinite(value):
        raise UnitProblem(f"'{text}' is not a finite number")
    return value


# A quantity is one number and a unit, never an expression: the unit is unit names joined by
# "*", "/" or a space, each with at most a small whole exponent of its own (mm**2, in^2).
_NUMBER = r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d{1,3})?"
_UNIT_NAME = r"[A-Za-z_°µμ][A-Za-z_°µμ]*(?:\s*(?:\*\*|\^)\s*[1-4])?"
_QUANTITY_FORM = re.compile(rf"^{_NUMBER}\s*{_UNIT_NAME}(?:\s*[*/]\s*{_UNIT_NAME}|\s+{_UNIT_NAME})*$")


def is_number_and_unit(text: str) -> bool:
    """True for '130 mm', '1.9 kN/m', '19500 mm**2', '2.5 kN*m'; False for sums, powers, brackets."""
    return _QUANTITY_FORM.match(text) is not None


# text -> SI float of every quantity read without error, per dimension: a building repeats its
# sizes and loads ("38 mm", "1.9 kN/m") thousands of times. Errors are not kept (their message
# names the place), and a file of millions of distinct values stops adding past the cap.
_READ: dict[str, dict[str, float]] = {name: {} for name in DIMENSIONS}
_READ_CAP = 200_000


def parse_quantity(value: object, dimension: str, loc: Location) -> float:
    """Read a quantity (a string with a unit) into an SI float, or raise InputError."""
    read = _READ[dimension]
    if isinstance(value, str):
        known = read.get(value)
        if known is not None:
            return known
    if isinstance(value, bool) or value is None:
        raise InputError(f"expected a {_said(dimension)} with a unit, got {value!r}", loc)
    if isinstance(value, (int, float)):
        example = DIMENSIONS[dimension][2]
        raise InputError(f"bare number {value!r}: give a {_said(dimension)} with a unit (e.g. {example})", loc)
    if not isinstance(value, str):
        raise InputError(f"expected a {_said(dimension)} with a unit, got a {type(value).__name__}", loc)
    if len(value) > 200:
        raise InputError(f"value is {len(value)} characters long; expected a {_said(dimension)}", loc)
    text = value.strip()
    if re.match(r"^[-+]?(?:inf|infinity|nan)\b", text, re.IGNORECASE):
        raise InputError(f"'{value}' is not a finite number", loc)
    if not is_number_and_unit(text):
        example = DIMENSIONS[dimension][2]
        if re.match(rf"^{_NUMBER}$", text):
            raise InputError(f"'{value}' has no unit; give a {_said(dimension)} such as {example}", loc)
        raise InputError(
            f"'{value}' is not one number and a unit (arithmetic is not read); give a {_said(dimension)} "
            f"such as {example}",
            loc,
        )
    try:
        result = _fast_parse(text, dimension)
    except UnitProblem as exc:
        raise InputError(str(exc), loc) from None
    if abs(result) > LIMITS[dimension]:
        raise InputError(f"'{value}' is implausibly large for a {_said(dimension)}", loc)
    if len(read) < _READ_CAP:
        read[value] = result
    return result


# ---------------------------------------------------------------- display

LBF = 4.4482216152605  # N, exactly (the pound-force by definition)
FORCE_UNITS = {"kN": 1000.0, "N": 1.0, "lbf": LBF, "kip": 1000.0 * LBF}
DECIMALS = {"kN": 2, "N": 0, "lbf": 0, "kip": 2}
PROJECT_UNITS = {"SI": "kN", "US": "kip"}  # how a project shows forces


def force_unit_of(text: object) -> str:
    """The display unit a force was written in ('kN', 'N', 'lbf', 'kip'), or '' when it is none of those."""
    if not isinstance(text, str):
        return ""
    match = _SIMPLE.match(text.strip())
    if match is None:
        return ""
    try:
        factor = _unit_factor(match[2].strip(), "force")
    except UnitProblem:
        return ""
    return next((name for name, f in FORCE_UNITS.items() if abs(f - factor) <= 1e-9 * f), "")


@dataclass(frozen=True)
class Display:
    """How numbers are shown: forces in one unit, with its usual decimals."""

    force_unit: str = "kN"

    @classmethod
    def for_project(cls, units: str) -> Display:
        """The display of a project's units (SI or US)."""
        return cls(PROJECT_UNITS[units])

    def value(self, newtons: float) -> float:
        return newtons / FORCE_UNITS[self.force_unit]

    def force(self, newtons: float) -> str:
        """'12.34 kN', '2,775 lbf', '2.78 kip'."""
        digits = DECIMALS[self.force_unit]
        return f"{self.value(newtons):,.{digits}f} {self.force_unit}"

    def force_not_zero(self, newtons: float) -> str:
        """As ``force``, but a force that is not zero is never shown as one: 1.8 N is '0.0018 kN', not '0.00 kN'."""
        shown = self.force(newtons)
        if newtons == 0 or any(ch in "123456789" for ch in shown.split(" ")[0]):
            return shown
        return f"{self.value(newtons):.2g} {self.force_unit}"

    def number(self, newtons: float) -> str:
        digits = DECIMALS[self.force_unit]
        return f"{self.value(newtons):,.{digits}f}"
