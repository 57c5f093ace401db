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
from audit.engine.model import Material
from audit.standards.catalogue import load_all_packs
from audit.standards.o86 import kb_factor

INCH_MM = 25.4


@dataclass(frozen=True)
class Case:
    group: str
    name: str
    source: str
    reference: float
    computed: float
    tolerance: float  # absolute
    tolerance_text: str  # as the report prints it: fixed by the case, never computed from noisy values
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
                "0.01",
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
                    "0.01",
                )
            )
    return out + kb_rule_cases()


SAWN = Material("SPF", "sawn_lumber", "S-P-F", "No.2")
# (bearing length mm, distance from the member end to the bearing's near edge mm, why, tolerance)
# Between table nodes O86 interpolates linearly while the NDS expression is a hyperbola: the two
# part by up to about 0.05 (widest between 100 and 150 mm), so those rows allow 0.05; the rule
# rows (end bearing, long bearing) must agree exactly.
KB_RULE_SAMPLES = [
    (30.0, 300.0, "between table nodes", 0.05),
    (60.0, 300.0, "between table nodes", 0.05),
    (89.0, 300.0, "between table nodes", 0.05),
    (140.0, 300.0, "between table nodes", 0.05),
    (89.0, 40.0, "end bearing, under 75 mm (3 in) from the end", 1e-9),
    (178.0, 300.0, "longer than 150 mm (6 in)", 1e-9),
]

# Linear interpolation of the recalled table, worked by hand (O86 table as recalled, from
# memory: verify): 30 mm: 1.38 - 5/13 x 0.13; 60 mm: 1.19 - 10/25 x 0.06; 89 mm: 1.13 - 14/25 x
# 0.03; 140 mm: 1.10 - 40/50 x 0.10.
KB_BY_HAND = {30.0: 1.33, 60.0: 1.166, 89.0: 1.1132, 140.0: 1.02}


def nds_cb_with_rules(length_mm: float, end_mm: float) -> float:
    """US NDS 3.10.4 as a whole: Cb applies below 6 in of bearing and at 3 in or more from the end."""
    if length_mm / INCH_MM >= 6.0 or end_mm / INCH_MM < 3.0:
        return 1.0
    return nds_bearing_area_factor(length_mm / INCH_MM)


def kb_rule_cases() -> list[Case]:
    """The code's own KB (interpolation, length limit, end-distance rule) against NDS Cb."""
    pack = load_all_packs()[0]["o86-2019-recalled"]
    out = []
    for length_mm, end_mm, why, tolerance in KB_RULE_SAMPLES:
        ours = kb_factor(length_mm / 1000.0, end_mm / 1000.0, SAWN, pack).value
        out.append(
            Case(
                "KB vs NDS Cb",
                f"KB for {length_mm:g} mm, {end_mm:g} mm from the end ({why})",
                "US NDS 3.10.4, Cb with its 6 in length and 3 in end-distance rules",
                round(nds_cb_with_rules(length_mm, end_mm), 4),
                round(ours, 4),
                tolerance,
                f"{tolerance:g}",
            )
        )
    for length_mm, hand in KB_BY_HAND.items():
        ours = kb_factor(length_mm / 1000.0, 0.3, SAWN, pack).value
        out.append(
            Case(
                "KB vs NDS Cb",
                f"KB for {length_mm:g} mm, interpolated",
                "O86 KB table as recalled (from memory: verify), linear interpolation by hand",
                hand,
                round(ours, 4),
                1e-3,
                "0.001",
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
                    "0.1 % (at least 0.001 kN)",
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
SI = {"mm": 1e-3, "kN": 1e3, "kN/m": 1e3, "MPa": 1e6, "N": 1.0, "N/m": 1.0, "Pa": 1.0}

# Exact definitions, written out by hand (not taken from pint): the international foot is
# 0.3048 m and the inch 0.0254 m (1959 agreement); the pound 0.45359237 kg and standard
# gravity 9.80665 m/s2, so 1 lbf = 4.4482216152605 N.
LBF_N = 0.45359237 * 9.80665
FT_M = 0.3048
EXACT_FACTORS = [
    ("1 lbf", "force", "N", LBF_N, "1 lbf = 0.45359237 kg x 9.80665 m/s2 (definition)"),
    ("1 kip", "force", "N", 1000 * LBF_N, "1 kip = 1000 lbf (definition)"),
    ("1 plf", "line_load", "N/m", LBF_N / FT_M, "1 plf = 1 lbf/ft, ft = 0.3048 m (definition)"),
    ("1 klf", "line_load", "N/m", 1000 * LBF_N / FT_M, "1 klf = 1000 lbf/ft (definition)"),
    ("1 psi", "stress", "Pa", LBF_N / 0.0254**2, "1 psi = 1 lbf/in2, in = 0.0254 m (definition)"),
    ("1 ft", "length", "mm", 304.8, "1 ft = 304.8 mm (definition)"),
]


def unit_cases() -> list[Case]:
    ureg = pint.UnitRegistry()  # a registry of pint's own, not the program's
    out = []
    for text, dimension, unit in UNIT_SAMPLES:
        ref = ureg.Quantity(text).to(unit).magnitude
        ours = parse_quantity(text, dimension, Location("test")) / SI[unit]
        out.append(
            Case(
                "Units vs pint",
                f"'{text}' in {unit}",
                "pint (PyPI) default registry",
                ref,
                ours,
                1e-9 * abs(ref),
                "1e-9 relative",
            )
        )
    for text, dimension, unit, factor, source in EXACT_FACTORS:
        ours = parse_quantity(text, dimension, Location("test")) / SI[unit]
        out.append(
            Case(
                "Units vs exact definitions",
                f"'{text}' in {unit}",
                source,
                factor,
                ours,
                1e-9 * factor,
                "1e-9 relative",
            )
        )
    out.append(
        Case(
            "Units vs pint",
            "1 in in mm",
            "international inch, exactly 25.4 mm (common practice)",
            25.4,
            parse_quantity("1 in", "length", Location("test")) * 1000,
            1e-12,
            "1e-12",
        )
    )
    return out


def all_cases() -> list[Case]:
    from tests.verification.details import detail_cases  # it builds on Case: imported here, not at the top
    from tests.verification.diagnosis import diagnosis_cases
    from tests.verification.remedies import remedy_cases
    from tests.verification.standards import ec5_rule_cases, standards_cases

    return (kb_cases() + statics_cases() + unit_cases() + detail_cases() + standards_cases() + ec5_rule_cases()) + (
        remedy_cases() + diagnosis_cases()
    )
