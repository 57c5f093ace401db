"""Checks of bearing-audit against sources outside the project.

Each case names its source. The tests assert every case; ``write_report.py`` writes the
same cases to reports/verification.md, so the report cannot drift from the tests.
"""

from __future__ import annotations

import itertools
from dataclasses import dataclass

import pint

from audit.core.errors import Location
from audit.core.units import parse_quantity
from audit.engine.beam_statics import reactions
from audit.standards.packs import load_all_packs

INCH_MM = 25.4


@dataclass(frozen=True)
class Case:
    group: str
    name: str
    source: str
    reference: float
    computed: float
    tolerance: float  # absolute
    note: str = ""

    @property
    def ok(self) -> bool:
        return abs(self.reference - self.computed) <= self.tolerance


def nds_bearing_area_factor(lb_in: float) -> float:
    """US NDS 3.10.4: Cb = (lb + 0.375 in) / lb for bearings shorter than 6 in away from member ends."""
    return (lb_in + 0.375) / lb_in


# Tabulated O86 bearing lengths (mm) and the nominal inch sizes they render in metric.
KB_NOMINAL_INCHES = {12.5: 0.5, 25.0: 1.0, 38.0: 1.5, 50.0: 2.0, 75.0: 3.0, 100.0: 4.0}


def kb_cases() -> list[Case]:
    pack = load_all_packs()[0]["o86-2019-recalled"]
    table = pack.kb_table.value
    out = []
    for length_mm, inches in KB_NOMINAL_INCHES.items():
        out.append(
            Case(
                "KB vs NDS Cb",
                f"KB at tabulated {length_mm:g} mm (nominal {inches:g} in)",
                "US NDS 3.10.4, Cb = (lb + 0.375 in)/lb, at the nominal inch size",
                round(nds_bearing_area_factor(inches), 4),
                round(table.at(length_mm / 1000.0), 4),
                0.01,
            )
        )
        if length_mm >= 25.0:
            out.append(
                Case(
                    "KB vs NDS Cb",
                    f"KB at exactly {length_mm:g} mm",
                    "US NDS 3.10.4, Cb = (lb + 0.375 in)/lb, lb converted from mm",
                    round(nds_bearing_area_factor(length_mm / INCH_MM), 4),
                    round(table.at(length_mm / 1000.0), 4),
                    0.01,
                )
            )
    return out


def _anastruct_reactions(supports: list[float], points: list[tuple[float, float]], uniforms) -> list[float]:
    from anastruct import SystemElements

    xs = sorted({0.0, *supports, *(x for x, _ in points), *(u[0] for u in uniforms), *(u[1] for u in uniforms)})
    ss = SystemElements(EI=5000.0, EA=1.0e9)
    for a, b in itertools.pairwise(xs):
        ss.add_element(location=[[a, 0.0], [b, 0.0]])
    node_of = {x: i + 1 for i, x in enumerate(xs)}
    ss.add_support_hinged(node_id=node_of[supports[0]])
    for s in supports[1:]:
        ss.add_support_roll(node_id=node_of[s], direction=2)
    for x, p in points:
        ss.point_load(node_id=node_of[x], Fy=-p)
    for x1, x2, w in uniforms:
        for element, (a, b) in enumerate(itertools.pairwise(xs), start=1):
            if a >= x1 - 1e-12 and b <= x2 + 1e-12:
                ss.q_load(q=-w, element_id=element)
    ss.solve()
    return [-ss.get_node_results_system(node_id=node_of[s])["Fy"] for s in supports]


BEAMS = {
    "simple span, off-centre point load": ([0.0, 5.0], [(1.5, 10.0)], []),
    "simple span, partial uniform load": ([0.0, 6.0], [], [(1.0, 4.0, 3.0)]),
    "overhang both ends": ([1.0, 5.0], [(0.0, 4.0), (6.5, 6.0)], [(0.0, 6.5, 2.0)]),
    "two equal spans, uniform load": ([0.0, 4.0, 8.0], [], [(0.0, 8.0, 1.0)]),
    "three unequal spans, mixed loads": ([0.0, 3.0, 7.5, 11.0], [(1.2, 8.0), (5.0, 15.0)], [(2.0, 10.0, 2.5)]),
    "continuous with overhang": ([1.0, 4.0, 9.0], [(0.0, 5.0), (6.0, 12.0)], [(0.0, 9.0, 1.5)]),
}


def statics_cases() -> list[Case]:
    out = []
    for name, (supports, points, uniforms) in BEAMS.items():
        ours = reactions(supports, points, uniforms)
        ref = _anastruct_reactions(supports, points, uniforms)
        for i, (a, b) in enumerate(zip(ref, ours, strict=True)):
            out.append(
                Case(
                    "Support reactions vs anastruct",
                    f"{name}: R{i + 1} (kN)",
                    "anastruct (PyPI), 2D frame solver, supports pinned/rolled",
                    round(a, 4),
                    round(b, 4),
                    1e-3 * max(1.0, abs(a)),
                )
            )
    return out


UNIT_SAMPLES = [
    ("5.5 in", "length", "mm"),
    ("12 ft", "length", "mm"),
    ("2800 lbf", "force", "kN"),
    ("3.5 kip", "force", "kN"),
    ("450 lbf/ft", "line_load", "kN/m"),
    ("625 psi", "stress", "MPa"),
    ("7 N/mm**2", "stress", "MPa"),
]
SI = {"mm": 1e-3, "kN": 1e3, "kN/m": 1e3, "MPa": 1e6}


def unit_cases() -> list[Case]:
    ureg = pint.UnitRegistry()  # a registry of pint's own, not the program's
    out = []
    for text, dimension, unit in UNIT_SAMPLES:
        ref = ureg.Quantity(text).to(unit).magnitude
        ours = parse_quantity(text, dimension, Location("test")) / SI[unit]
        out.append(
            Case("Units vs pint", f"'{text}' in {unit}", "pint (PyPI) default registry", ref, ours, 1e-9 * abs(ref))
        )
    out.append(
        Case(
            "Units vs pint",
            "1 in in mm",
            "international inch, exactly 25.4 mm (common practice)",
            25.4,
            parse_quantity("1 in", "length", Location("test")) * 1000,
            1e-12,
        )
    )
    return out


def all_cases() -> list[Case]:
    return kb_cases() + statics_cases() + unit_cases()
