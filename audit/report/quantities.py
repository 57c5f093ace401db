"""Quantities in the project's units, as the trade writes them: SI floats in, text out.

One place for every length, line load, force and stress that the sketches, the level plans and
``explain`` print. An SI project reads as it always has (mm, kN, kN/m, MPa). A US project
(``project.units: US``, which a US-customary standard's pack sets unless the project says otherwise)
reads in feet and inches, plf or klf, kip or lbf, and psi.

Rounding (US): lengths to the nearest 1/16 in, the finest fraction framing dimensions are written in
(5 1/8", 11 7/8"), with the fraction reduced (1/2, 1/4, 1/8, 1/16). A length under 1 ft is written in
inches (3 1/2"); from 1 ft up, in feet and inches (20'-0", 12'-2 1/2"); a section size (b, d) is always
in inches (12", 24"), as sizes are. Line loads in plf (whole pounds) below 10 klf, in klf (two decimals)
from there; forces in the project's force unit (kip, two decimals; lbf, whole pounds); stresses in whole psi.

Factors are the exact definitions, not pint (which stays at the edges): 1 in = 0.0254 m, 1 ft = 0.3048 m,
1 lbf = 0.45359237 kg x 9.80665 m/s2 = 4.4482216152605 N; so 1 plf = 14.5939 N/m and 1 psi = 6894.76 Pa.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING

from audit.core.units import DECIMALS, FORCE_UNITS, PROJECT_UNITS

if TYPE_CHECKING:
    from audit.review.review import Review

INCH = 0.0254  # m, exactly
FOOT = 12 * INCH  # 0.3048 m, exactly
LBF = 4.4482216152605  # N, exactly
PLF = LBF / FOOT  # N/m
KLF = 1000.0 * PLF
PSI = LBF / INCH**2  # Pa
FRACTION = 16  # lengths to the nearest 1/16 in
KLF_FROM = 10_000.0 * PLF  # line loads this large are written in klf


def _inch_text(sixteenths: int) -> str:
    """A whole number of sixteenths of an inch as the trade writes it: 3 1/2", 5 1/8", 12", 3/8"."""
    whole, part = divmod(sixteenths, FRACTION)
    if part == 0:
        return f'{whole}"'
    common = math.gcd(part, FRACTION)
    fraction = f"{part // common}/{FRACTION // common}"
    return f'{whole} {fraction}"' if whole else f'{fraction}"'


def _sixteenths(metres: float) -> tuple[str, int]:
    count = round(abs(metres) / INCH * FRACTION)
    return ("-" if metres < 0 and count else ""), count


def inches(metres: float) -> str:
    """A size in inches to the nearest 1/16: 0.0889 m -> 3 1/2"."""
    sign, count = _sixteenths(metres)
    return sign + _inch_text(count)


def feet_inches(metres: float) -> str:
    """A length in feet and inches to the nearest 1/16 in: 6.096 m -> 20'-0"; under 1 ft in inches."""
    sign, count = _sixteenths(metres)
    feet, rest = divmod(count, 12 * FRACTION)  # rounded first, so 11.9999 in is 1'-0", never 0'-12"
    if feet == 0:
        return sign + _inch_text(rest)
    return f"{sign}{feet}'-{_inch_text(rest)}"


@dataclass(frozen=True)
class Quantities:
    """How one project writes its quantities: its system (SI or US) and its force unit."""

    system: str = "SI"
    force_unit: str = "kN"

    @classmethod
    def for_project(cls, units: str, force_unit: str | None = None) -> Quantities:
        return cls(units, force_unit or PROJECT_UNITS[units])

    @property
    def us(self) -> bool:
        return self.system == "US"

    def length(self, metres: float) -> str:
        """A length along a member, a position, an elevation: 6096 mm or 20'-0"."""
        return feet_inches(metres) if self.us else f"{metres * 1000:.0f} mm"

    def size(self, metres: float) -> str:
        """A section size or contact dimension: 89 mm or 3 1/2"."""
        return inches(metres) if self.us else f"{metres * 1000:.0f} mm"

    def elevation(self, metres: float) -> str:
        """A level's elevation: 3.000 m or 9'-10 1/8"."""
        return feet_inches(metres) if self.us else f"{metres:.3f} m"

    def force_decimals(self) -> int:
        return 2 if self.force_unit == "kN" else DECIMALS[self.force_unit]

    def force(self, newtons: float, width: int = 0) -> str:
        """A force in the project's force unit: 12.50 kN, 0.40 kip, 400 lbf (``width``: the number's)."""
        value = newtons / FORCE_UNITS[self.force_unit]
        digits = self.force_decimals()
        return f"{value:{width}{',' if digits == 0 else ''}.{digits}f} {self.force_unit}"  # 1,000 lbf

    def line_load_unit(self, largest: float) -> tuple[str, float, int]:
        """The unit a set of line loads is written in, for the largest of them (N/m): name, N/m per unit, decimals."""
        if not self.us:
            return f"{self.force_unit}/m", FORCE_UNITS[self.force_unit], self.force_decimals()
        if abs(largest) >= KLF_FROM:
            return "klf", KLF, 2
        return "plf", PLF, 0

    def line_load(self, newtons_per_metre: float) -> str:
        """One line load: 14.60 kN/m or 1,000 plf."""
        unit, factor, decimals = self.line_load_unit(newtons_per_metre)
        return f"{newtons_per_metre / factor:,.{decimals}f} {unit}"

    def stress(self, pascals: float, width: int = 0) -> str:
        """A stress: 7.00 MPa or 1,015 psi (``width``: the number's)."""
        if self.us:
            return f"{pascals / PSI:{width},.0f} psi"
        return f"{pascals / 1e6:{width}.2f} MPa"


def quantities_of(review: Review) -> Quantities:
    """The project's units: the sketches, plans and explain write every quantity through them."""
    return Quantities.for_project(review.model.project.units, review.display.force_unit)
