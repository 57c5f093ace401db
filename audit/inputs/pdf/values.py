"""Cell values: numbers with thousands separators or decimal commas, units from the header or the cell,
OK columns."""

from __future__ import annotations

import re
from collections.abc import Iterable
from dataclasses import dataclass

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
NUMBER_TEXT = r"\d(?:[\d.,]*\d)?"  # digits with commas and points between them, as any calc prints a number
_NUMBER_TEXT = re.compile(rf"([-+]?)({NUMBER_TEXT})")
DECIMAL_MARKS = ("point", "comma", "either")
# a number with one comma or point between digits, standing alone (not a clause 6.1.5 nor a date)
_ONE_MARK = re.compile(r"(?<![\d.,])(\d+)([.,])(\d+)(?![\d.,])")


def parse_number(text: str) -> float | None:
    """A number as a calc with decimal points prints it (1,250.5); None where it is not one."""
    text = text.strip().replace("\u2212", "-")
    if not NUMBER.match(text):
        return None
    return float(text.replace(",", ""))


class NumberProblem(ValueError):
    """A number that is not read: why, in the reader's words."""


@dataclass(frozen=True)
class Numbers:
    """How a page writes numbers: the decimal mark its calc is declared to use (by the standard, a column
    map or the command line: point, comma, or either where both habits occur) and the marks its own
    values show beyond doubt ('12.5' a point, '3,12' or '0,250' a comma)."""

    declared: str = "point"
    seen: frozenset[str] = frozenset()

    @property
    def mixed(self) -> bool:
        """Both habits may occur: a comma or a point before three digits may group thousands or mark decimals."""
        return self.declared == "either" or ({"point", "comma"} - {self.declared}) <= self.seen


POINT = Numbers()


def marks_seen(texts: Iterable[str]) -> frozenset[str]:
    """The decimal marks that numbers in ``texts`` show beyond doubt: a mark followed by other than three
    digits, or after a whole part of 0 or of more than three digits, cannot group thousands."""
    seen: set[str] = set()
    for whole, mark, fraction in _ONE_MARK.findall("\n".join(texts)):
        if len(fraction) != 3 or whole.startswith("0") or len(whole) > 3:
            seen.add("comma" if mark == "," else "point")
    return frozenset(seen)


def read_number(text: str, numbers: Numbers = POINT) -> float:
    """A number as the page writes it; NumberProblem where it is not one or where its marks can be read
    two ways (never a guess between thousands and decimals)."""
    clean = text.strip().replace("\u2212", "-")
    m = _NUMBER_TEXT.fullmatch(clean)
    if not m:
        raise NumberProblem(f"'{text}' is not a number")
    sign, body = m[1], m[2]
    commas, points = body.count(","), body.count(".")
    if not commas and not points:
        return float(clean)
    if not numbers.mixed and numbers.declared == "point":
        if NUMBER.match(clean):
            return float(clean.replace(",", ""))
        raise NumberProblem(
            f"'{text}' is not a number as a calc with decimal points writes one "
            "(give --decimal-mark comma if the calc writes decimal commas)"
        )
    if commas + points == 1:
        mark = "," if commas else "."
        whole, fraction = body.split(mark)
        groups_thousands = len(fraction) == 3 and not whole.startswith("0") and len(whole) <= 3
        if mark == "," and not numbers.mixed:
            return float(f"{sign}{whole}.{fraction}")  # a calc with decimal commas: 3,125 is 3.125
        if not groups_thousands:
            return float(f"{sign}{whole}.{fraction}")  # '3,12', '12.5', '0,250': a decimal mark, whichever
        if numbers.mixed:
            raise NumberProblem(
                f"'{text}' is ambiguous: {_habits(numbers)}, so its '{mark}' may group thousands or mark "
                "decimals; not read (give --decimal-mark comma or point)"
            )
        raise NumberProblem(
            f"'{text}' is ambiguous: in a calc with decimal commas a point before three digits may group "
            "thousands or mark decimals; not read (give --decimal-mark point if the calc writes decimal points)"
        )
    marks = "a comma and a point" if commas and points else "its marks repeated"
    raise NumberProblem(
        f"'{text}' is ambiguous: with {marks}, in a calc read with {_declared(numbers)} that "
        f"{'may write either' if numbers.mixed else 'writes them'}, thousands and decimals cannot be told apart; "
        "not read"
    )


def _habits(numbers: Numbers) -> str:
    if numbers.declared == "either":
        return "the calc may write decimals with a comma or a point"
    return "this page writes decimals both with a comma and with a point"


def lenient_number(text: str) -> float | None:
    """A stand-in value for text that reads as a number under some habit (read again with the page's
    habit before it is used); None where it reads as none."""
    m = _NUMBER_TEXT.fullmatch(text.strip().replace("\u2212", "-"))
    return None if m is None else float(m[1] + m[2].replace(",", "").replace(".", "", m[2].count(".") - 1))


def unit_name(text: str) -> str:
    text = text.strip().strip(".")
    return UNIT_ALIASES.get(text.lower(), UNIT_ALIASES.get(text, text))


def parse_value(cell: str, name: str, table_units: dict[str, str], where: Location, numbers: Numbers = POINT) -> float:
    """A cell's value in SI (N, Pa, m, m²) or as a plain number for factors; ``numbers``: the page's habit."""
    cell = cell.strip()
    m = re.match(rf"^([-+\u2212]?{NUMBER_TEXT})\s*(.*)$", cell)
    if not m:
        raise InputError(f"'{cell}' is not a number", where)
    try:
        number = read_number(m[1], numbers)
    except NumberProblem as problem:
        raise InputError(str(problem), where) from None
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


def _declared(numbers: Numbers) -> str:
    return "decimal commas or points" if numbers.declared == "either" else f"decimal {numbers.declared}s"
