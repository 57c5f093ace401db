"""The table of units read without pint: each factor checked against pint and against the definitions.

Outside references: pint (PyPI), its default registry (plf, klf, psf and ksf defined in it as lbf/ft,
kip/ft, lbf/ft2 and kip/ft2, as the program defines them); and the exact definitions of the international inch
(0.0254 m) and foot (0.3048 m) and the pound-force (0.45359237 kg x 9.80665 m/s2), 1959
international yard and pound agreement and the 3rd CGPM (1901).
"""

from __future__ import annotations

import math
import subprocess
import sys
from fractions import Fraction
from pathlib import Path

import pint
import pytest

from audit.core.errors import InputError, Location
from audit.core.units import DIMENSIONS, UNIT_TABLE, parse_quantity

ROOT = Path(__file__).resolve().parents[1]
REFERENCE = pint.UnitRegistry()
REFERENCE.define("plf = lbf / foot")
REFERENCE.define("klf = kip / foot")
REFERENCE.define("psf = lbf / foot ** 2")
REFERENCE.define("ksf = kip / foot ** 2")

IN, FT = Fraction("0.0254"), Fraction("0.3048")
LBF = Fraction("0.45359237") * Fraction("9.80665")
EXACT = {
    "in": IN,
    "ft": FT,
    "lbf": LBF,
    "kip": 1000 * LBF,
    "lbf/ft": LBF / FT,
    "plf": LBF / FT,
    "klf": 1000 * LBF / FT,
    "kip/ft": 1000 * LBF / FT,
    "lbf/in": LBF / IN,
    "psi": LBF / IN**2,
    "psf": LBF / FT**2,
    "ksf": 1000 * LBF / FT**2,
    "ksi": 1000 * LBF / IN**2,
    "in**2": IN**2,
    "in^2": IN**2,
    "ft**2": FT**2,
}


@pytest.mark.parametrize("unit", sorted(UNIT_TABLE))
def test_each_table_unit_has_pints_dimension_and_factor(unit):
    dimension, factor = UNIT_TABLE[unit]
    quantity = REFERENCE.Quantity(1, unit)
    si_unit = DIMENSIONS[dimension][1]
    if dimension == "angle":
        assert quantity.dimensionless
    else:
        assert quantity.dimensionality == REFERENCE.get_dimensionality(DIMENSIONS[dimension][0])
    assert factor == pytest.approx(quantity.to(si_unit).magnitude, rel=1e-12)


@pytest.mark.parametrize("unit", sorted(EXACT))
def test_us_units_in_the_table_are_the_exact_definitions(unit):
    assert UNIT_TABLE[unit][1] == pytest.approx(float(EXACT[unit]), rel=1e-15)


def test_a_value_read_through_the_table_is_number_times_factor():
    # 2800 lbf by the definition: 2800 x 4.4482216152605 N = 12,455.02 N (hand calculation)
    assert parse_quantity("2800 lbf", "force", Location("t")) == pytest.approx(12455.0205227294, rel=1e-12)
    assert parse_quantity("5.125 in", "length", Location("t")) == pytest.approx(0.130175, rel=1e-12)
    assert parse_quantity("30 deg", "angle", Location("t")) == pytest.approx(math.pi / 6, rel=1e-12)


def test_a_unit_outside_the_table_is_still_read_through_pint():
    assert "yd" not in UNIT_TABLE and "kgf" not in UNIT_TABLE
    assert parse_quantity("2 yd", "length", Location("t")) == pytest.approx(1.8288, rel=1e-12)  # yard 0.9144 m
    assert parse_quantity("1 kgf", "force", Location("t")) == pytest.approx(9.80665, rel=1e-12)  # g x 1 kg


@pytest.mark.parametrize(
    "text, dimension, words",
    [
        ("12 mm", "force", "'12 mm' is a length, not a force (e.g. 12.5 kN, 2800 lbf)"),
        ("30 deg", "length", "'30 deg' is a plain number, not a length (e.g. 130 mm, 5.125 in)"),
        ("130 mm", "angle", "'130 mm' is not an angle (e.g. 30 deg)"),
        ("130 mmm", "length", "cannot read '130 mmm' as a length (e.g. 130 mm, 5.125 in)"),
    ],
)
def test_a_table_unit_of_the_wrong_kind_is_refused_in_the_same_words(text, dimension, words):
    with pytest.raises(InputError) as caught:
        parse_quantity(text, dimension, Location("model.yaml", 3, 5, "members[0].b"))
    assert words in str(caught.value)


def test_reviewing_the_demo_does_not_import_pint():
    code = (
        "import sys\n"
        "from audit.cli import run\n"
        "run(['review', 'fixtures/demo/model.yaml', '--claims', 'fixtures/demo/claims.yaml'])\n"
        "print('pint' in sys.modules)\n"
    )
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True, cwd=ROOT)
    assert done.stdout.strip().splitlines()[-1] == "False"


def test_a_text_read_again_gives_the_same_value_and_a_refused_text_is_refused_every_time():
    first = parse_quantity("38 mm", "length", Location("a.yaml", 1, 1, "b"))
    assert parse_quantity("38 mm", "length", Location("a.yaml", 9, 1, "b")) == first == pytest.approx(0.038)
    # the same text as another dimension is read (and refused) as that dimension
    with pytest.raises(InputError, match="is a length, not a force"):
        parse_quantity("38 mm", "force", Location("a.yaml", 2, 1, "q"))
    for line in (3, 4):  # each refusal names its own place
        with pytest.raises(InputError, match=f"a.yaml:{line}:1: .*implausibly large"):
            parse_quantity("5000 m", "length", Location("a.yaml", line, 1, "b"))
