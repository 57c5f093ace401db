"""Framing details worked by hand: the model, and the hand derivation of each number.

Each case's reference is written out here factor by factor (the pack's values, from memory
of CSA O86: verify); the computed value is the engine's. The tests assert every case and
reports/verification.md lists them, so a reviewer can redo each one on paper.
"""

from __future__ import annotations

import itertools

from tests.conftest import review_dict
from tests.verification.cases import Case

HAND = "hand derivation in tests/verification/details.py; factors from the pack (from memory: verify)"
SEAT = {"length": "65 mm"}  # the rafter sits on half the 130 mm ridge
BIRDSMOUTH = {"length": "89 mm"}  # seat cut 89 mm long along the rafter


def roof(seat_on_ridge: dict | None = None, birdsmouth: dict | None = None, bearing_width: str | None = None) -> dict:
    """A rafter seated on half a glulam ridge at one end and birdsmouthed on a wall plate at the other."""
    ridge_bearing: dict = {
        "id": "R/G",
        "upper": {"member": "R", "at": "3967.5 mm", **(seat_on_ridge or {})},
        "lower": {"member": "G", "at": "3 m"},
    }
    if bearing_width:
        ridge_bearing["width"] = bearing_width
    return {
        "project": {"title": "Roof (fictional)"},
        "materials": {
            "GL": {"family": "glulam", "species": "D.Fir-L", "grade": "24f-EX"},
            "SPF": {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"},
            "STEEL": {"family": "steel"},
        },
        "members": [
            {"id": "G", "material": "GL", "b": "130 mm", "d": "380 mm", "length": "6 m"},
            {"id": "C1", "material": "STEEL", "b": "152 mm", "d": "152 mm", "length": "3 m", "orientation": "vertical"},
            {"id": "C2", "material": "STEEL", "b": "152 mm", "d": "152 mm", "length": "3 m", "orientation": "vertical"},
            {"id": "R", "material": "SPF", "b": "38 mm", "d": "184 mm", "length": "4 m"},
            {"id": "W", "material": "SPF", "b": "140 mm", "d": "38 mm", "length": "5 m", "support": "continuous"},
        ],
        "bearings": [
            {"id": "G/C1", "upper": {"member": "G", "at": "76 mm"}, "lower": "C1", "width": "152 mm"},
            {"id": "G/C2", "upper": {"member": "G", "at": "5924 mm"}, "lower": "C2"},
            ridge_bearing,
            {
                "id": "R/W",
                "upper": {"member": "R", "at": "44.5 mm", **(birdsmouth or {})},
                "lower": {"member": "W", "at": "2 m"},
            },
        ],
        "loads": [{"id": "roof", "member": "R", "type": "uniform", "specified": {"D": "0.6 kN/m", "S": "1.6 kN/m"}}],
    }


def beam_with_post_and_joist(joist_at: str = "550 mm", readings: dict | None = None, udl: bool = False) -> dict:
    """A 130 x 608 glulam beam on a steel post; within d of that support a timber post at 300 mm and a joist."""
    data: dict = {
        "project": {"title": "Near-support loads (fictional)", "readings": dict(readings or {})},
        "materials": {
            "GL": {"family": "glulam", "species": "D.Fir-L", "grade": "24f-EX"},
            "SPF": {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"},
            "DF": {"family": "timber", "species": "D.Fir-L", "grade": "No.1"},
            "STEEL": {"family": "steel"},
        },
        "members": [
            {"id": "B", "material": "GL", "b": "130 mm", "d": "608 mm", "length": "6 m"},
            {"id": "C1", "material": "STEEL", "b": "152 mm", "d": "152 mm", "length": "3 m", "orientation": "vertical"},
            {"id": "C2", "material": "STEEL", "b": "152 mm", "d": "152 mm", "length": "3 m", "orientation": "vertical"},
            {"id": "P", "material": "DF", "b": "140 mm", "d": "140 mm", "length": "3 m", "orientation": "vertical"},
            {"id": "J", "material": "SPF", "b": "38 mm", "d": "235 mm", "length": "4 m"},
            {"id": "W", "material": "SPF", "b": "140 mm", "d": "38 mm", "length": "5 m", "support": "continuous"},
        ],
        "bearings": [
            {"id": "B/C1", "upper": {"member": "B", "at": "76 mm"}, "lower": "C1"},
            {"id": "B/C2", "upper": {"member": "B", "at": "5924 mm"}, "lower": "C2"},
            {"id": "P/B", "upper": "P", "lower": {"member": "B", "at": "300 mm"}},
            {"id": "J/B", "upper": {"member": "J", "at": "3935 mm"}, "lower": {"member": "B", "at": joist_at}},
            {"id": "J/W", "upper": {"member": "J", "at": "65 mm"}, "lower": {"member": "W", "at": "2 m"}},
        ],
        "loads": [
            {"id": "roof", "member": "P", "type": "point", "specified": {"D": "10 kN", "S": "20 kN"}},
            {"id": "floor", "member": "J", "type": "uniform", "specified": {"D": "1 kN/m", "L": "2 kN/m"}},
        ],
    }
    if udl:
        data["loads"].append({"id": "wall", "member": "B", "type": "uniform", "specified": {"D": "2 kN/m"}})
    return data


# Qf' by hand: post P 10 kN D + 20 kN S; joist J (4 m, supports 65 and 3935 mm, 1 + 2 kN/m)
# 2 kN D + 4 kN L. Governing 1.25D + 1.5S + 0.5L = 1.25 x 12 + 1.5 x 20 + 0.5 x 4 = 47 kN.
QF_POST_AND_JOIST = 1.25 * 12e3 + 1.5 * 20e3 + 0.5 * 4e3
# Support contact: post C1's 152 mm depth, from the beam end (KB 1.0 on the support face).
# longest_single: L2 from post P alone (140 mm): L1 = 140, L2 = 152 (<= 1.5 x 140)
QR_LONGEST_SINGLE = (2 / 3) * 0.8 * 7.0e6 * (0.130 * (0.140 + 0.152) / 2)
# summed: 140 + 38 = 178 mm: L1 = 152, L2 = 178 (<= 1.5 x 152)
QR_SUMMED = (2 / 3) * 0.8 * 7.0e6 * (0.130 * (0.152 + 0.178) / 2)


def ridge_with_rafters_both_sides(station: str = "300 mm") -> dict:
    """A 130 x 380 glulam ridge on steel posts; a rafter from each side seated on half its width, both at
    ``station``, within d of the post at 76 mm: side by side across the ridge."""
    data = roof(SEAT, BIRDSMOUTH)
    data["project"]["title"] = "Ridge with rafters from both sides (fictional)"
    data["members"] += [
        {"id": "R2", "material": "SPF", "b": "38 mm", "d": "184 mm", "length": "4 m"},
        {"id": "W2", "material": "SPF", "b": "140 mm", "d": "38 mm", "length": "5 m", "support": "continuous"},
    ]
    data["bearings"][2]["lower"]["at"] = station
    data["bearings"] += [
        {"id": "R2/G", "upper": {"member": "R2", "at": "3967.5 mm", **SEAT}, "lower": {"member": "G", "at": station}},
        {
            "id": "R2/W2",
            "upper": {"member": "R2", "at": "44.5 mm", **BIRDSMOUTH},
            "lower": {"member": "W2", "at": "2 m"},
        },
    ]
    data["loads"].append(
        {"id": "roof2", "member": "R2", "type": "uniform", "specified": {"D": "0.6 kN/m", "S": "1.6 kN/m"}}
    )
    return data  # fmt: skip


# Each rafter: 4 m long, 0.6 kN/m D and 1.6 kN/m S over its length, on supports at 44.5 mm and 3967.5 mm;
# its ridge reaction by statics (moments about the plate, common practice) is w x 4 x (2 - 0.0445) / 3.923.
RAFTER_TO_RIDGE = 4.0 * (2.0 - 0.0445) / (3.9675 - 0.0445)  # m of w that reaches the ridge
QF_TWO_RAFTERS = 2 * (1.25 * 0.6e3 + 1.5 * 1.6e3) * RAFTER_TO_RIDGE  # 1.25D + 1.5S, both rafters within d
# Ab': the two 65 mm seats overlap along the ridge (same station, 38 mm each), so they are one bearing
# 65 + 65 = 130 mm wide (= b, the cap); the support on post C1 is 152 mm long, 130 mm across (G's b).
# L1 = 38, L2 = 152 taken as at most 1.5 x 38 = 57 (the conservative length cap); KB 1.0 (the support is at
# the beam end, so both faces do not qualify). Qr' = 2/3 x 0.8 x 7.0 MPa x 130 x (38 + 57)/2.
QR_SIDE_BY_SIDE = (2 / 3) * 0.8 * 7.0e6 * 0.130 * (0.038 + 1.5 * 0.038) / 2
# The false alarm it replaces: one 65 mm seat's width for Ab' while Qf' takes both rafters (half of Qr').
QR_ONE_SEAT_WIDTH = QR_SIDE_BY_SIDE / 2


def beam_with_leg(standard: str = "o86") -> dict:
    """The one-contact beam of tests/verification/standards.py (89 x 235 mm, 3 m, on steel posts) with an
    equipment leg at mid-span: 2 kN D and 4 kN L through a 50 mm x 60 mm foot."""
    from tests.verification.standards import contact_model

    data = contact_model(standard)
    data["project"]["title"] = f"Beam with an equipment leg under {standard} (invented)"
    data["loads"].append(
        {"id": "leg", "member": "B", "type": "point", "at": "1.5 m", "length": "50 mm", "width": "60 mm",
         "specified": {"D": "2 kN", "L": "4 kN"}}
    )  # fmt: skip
    return data


def _leg_by_hand() -> dict[str, tuple[float, float, str]]:
    """standard -> (Qf N, Qr N, governing combination) of the crushing check under the leg, worked by hand."""
    area = 0.050 * 0.060  # the foot: 50 mm along the beam, 60 mm across (less than b = 89 mm)
    lb = 0.050 / 0.0254  # in
    psi = 6894.757293168
    nds = 425 * psi * area * (lb + 0.375) / lb  # Fc-perp S-P-F x Ab x Cb (NDS 3.10.4; 1475 mm from the ends)
    return {
        # O86: phi 0.8 x fcp 5.3 MPa x Ab x KB(50 mm) 1.19 (table node, far from the ends) x KZcp 1.15 (89/235 <= 1)
        "o86": (1.25 * 2e3 + 1.5 * 4e3, 0.8 * 5.3e6 * area * 1.19 * 1.15, "1.25D+1.5L"),
        "nds-asd": (2e3 + 4e3, nds, "D+L"),
        "nds-lrfd": (1.2 * 2e3 + 1.6 * 4e3, nds * 1.67 * 0.9, "1.2D+1.6L+0.5S"),
        # EC5 6.1.5: kc,90 1.0 (a load on a member on discrete supports) x kmod 0.8 x 2.5 MPa / 1.3 x
        # 60 x (50 + 30 + 30) mm: nothing else on the top face, far from the ends
        "ec5": (1.35 * 2e3 + 1.5 * 4e3, 1.0 * 0.8 * 2.5e6 / 1.3 * 0.060 * (0.050 + 0.060), "1.35G+1.5Q"),
    }


LEG_BY_HAND = _leg_by_hand()


def joist_on_built_up_plate(readings: dict | None = None, **plate: str | int) -> dict:
    """A joist on a 2-ply 38 x 89 plate laid flat (b = 89, d = 76) on a wall."""
    data = roof(SEAT, BIRDSMOUTH)
    data["project"]["readings"] = dict(readings or {})
    data["members"][4] = {
        "id": "W",
        "material": "SPF",
        "b": "89 mm",
        "d": "76 mm",
        "length": "5 m",
        "support": "continuous",
        "plies": 2,
        "ply_thickness": "38 mm",
        **plate,
    }
    return data


# The plate under the birdsmouth: 38 mm along it x 89 mm across; KB(38) = 1.25 at 2 m from the ends.
# KZcp per ply: 89/38 = 2.34 >= 2.0 -> 1.00; combined: 89/76 = 1.171 -> 1.15 - 0.15 x 0.171 = 1.1243
KZCP_COMBINED = 1.15 - 0.15 * (89 / 76 - 1.0)
QR_PLATE_PER_PLY = 0.8 * 5.3e6 * (0.038 * 0.089) * 1.25 * 1.00
QR_PLATE_COMBINED = 0.8 * 5.3e6 * (0.038 * 0.089) * 1.25 * KZCP_COMBINED


def post_on_stud_wall(**studs) -> dict:
    """A timber post on a double top plate (2-ply 38 x 140 flat) over 38 mm studs at 406 mm, a 3-stud pack under it."""
    return {
        "project": {"title": "Post on a stud wall (fictional)"},
        "materials": {
            "SPF": {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"},
            "DF": {"family": "timber", "species": "D.Fir-L", "grade": "No.1"},
        },
        "members": [
            {
                "id": "WP",
                "material": "SPF",
                "b": "140 mm",
                "d": "76 mm",
                "length": "2.4 m",
                "plies": 2,
                "ply_thickness": "38 mm",
                "support": "studs",
                "studs": {"thickness": "38 mm", "spacing": "406 mm", "packs": [{"at": "1.2 m", "studs": 3}], **studs},
            },
            {"id": "P", "material": "DF", "b": "140 mm", "d": "140 mm", "length": "3 m", "orientation": "vertical"},
        ],
        "bearings": [{"id": "P/WP", "upper": "P", "lower": {"member": "WP", "at": "1.2 m"}}],
        "loads": [{"id": "roof", "member": "P", "type": "point", "specified": {"D": "10 kN", "S": "20 kN"}}],
    }


# The post stands over the pack's centre, so the pack takes all of it: 1.25 x 10 + 1.5 x 20 = 42.5 kN.
QF_POST_ON_WALL = 1.25 * 10e3 + 1.5 * 20e3
KB_114 = 1.10 - 0.10 * (114 - 100) / 50  # KB table between 100 mm (1.10) and 150 mm (1.00)
KB_140 = 1.10 - 0.10 * (140 - 100) / 50
# the plate's underside on the 3-stud pack: 114 mm along x 140 mm across, KZcp 1.00 (one ply 140/38)
QR_PLATE_ON_PACK = 0.8 * 5.3e6 * (0.114 * 0.140) * KB_114
# squeezed between post (L2 = 140) and pack (L1 = 114): Ab' = 140 x (114 + 140)/2; both qualify for KB
QR_PLATE_SQUEEZE = (2 / 3) * 0.8 * 5.3e6 * (0.140 * (0.114 + 0.140) / 2) * KB_114
QR_POST_ON_PLATE = 0.8 * 5.3e6 * (0.140 * 0.140) * KB_140


def beam_on_posts(spans_m: list[float], live: str = "2 kN/m", dead: str = "1 kN/m", overhang_m: float = 0.0) -> dict:
    """A glulam floor beam continuous over steel posts (centres at the span ends), uniform D and L."""
    supports = [overhang_m]
    for span in spans_m:
        supports.append(supports[-1] + span)
    length = supports[-1] + overhang_m
    members = [{"id": "B", "material": "GL", "b": "130 mm", "d": "380 mm", "length": f"{length} m"}]
    bearings = []
    for i, x in enumerate(supports, start=1):
        members.append(
            {
                "id": f"C{i}",
                "material": "STEEL",
                "b": "152 mm",
                "d": "152 mm",
                "length": "3 m",
                "orientation": "vertical",
            }
        )
        bearings.append({"id": f"B/C{i}", "upper": {"member": "B", "at": f"{x} m"}, "lower": f"C{i}"})
    return {
        "project": {"title": "Continuous floor beam (fictional)"},
        "materials": {
            "GL": {"family": "glulam", "species": "D.Fir-L", "grade": "24f-EX"},
            "STEEL": {"family": "steel"},
        },
        "members": members,
        "bearings": bearings,
        "loads": [{"id": "floor", "member": "B", "type": "uniform", "specified": {"D": dead, "L": live}}],
    }


FOUR_SPANS = [0.07, 4.07, 8.07, 12.07, 16.07]  # support centres of a 16.14 m beam: four equal 4 m spans


def four_span_on_sill(live: str = "2 kN/m", dead: str = "1 kN/m") -> dict:
    """A glulam floor beam over four equal 4 m spans; its end post P1 (timber) stands on a sill S on concrete.

    The other supports are steel posts. The floor load runs between the end supports (none on the 70 mm ends)."""
    members = [
        {"id": "B", "material": "GL", "b": "130 mm", "d": "380 mm", "length": "16.14 m"},
        {"id": "P1", "material": "DF", "b": "140 mm", "d": "140 mm", "length": "3 m", "orientation": "vertical"},
        {"id": "S", "material": "SPF", "b": "140 mm", "d": "38 mm", "length": "1 m", "support": "continuous",
         "bears_on": "CONC"},
    ]  # fmt: skip
    bearings = [
        {"id": "B/P1", "upper": {"member": "B", "at": "0.07 m"}, "lower": "P1"},
        {"id": "P1/S", "upper": "P1", "lower": {"member": "S", "at": "0.5 m"}},
    ]
    for i, x in enumerate(FOUR_SPANS[1:], start=2):
        post = {"id": f"C{i}", "material": "STEEL", "b": "152 mm", "d": "152 mm", "length": "3 m"}
        members.append({**post, "orientation": "vertical"})
        bearings.append({"id": f"B/C{i}", "upper": {"member": "B", "at": f"{x} m"}, "lower": f"C{i}"})
    return {
        "project": {"title": "Four-span floor beam on an end post and sill (fictional)"},
        "materials": {
            "GL": {"family": "glulam", "species": "D.Fir-L", "grade": "24f-EX"},
            "SPF": {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"},
            "DF": {"family": "timber", "species": "D.Fir-L", "grade": "No.1"},
            "STEEL": {"family": "steel"},
            "CONC": {"family": "concrete"},
        },
        "members": members,
        "bearings": bearings,
        "loads": [
            {"id": "floor", "member": "B", "type": "uniform", "from": "0.07 m", "to": "16.07 m",
             "specified": {"D": dead, "L": live}},
        ],
    }  # fmt: skip


def three_moment_end_reaction(loaded: list[bool], w: float, span: float) -> float:
    """End reaction of four equal spans under w on the loaded spans, by the three-moment equation (equal EI).

    M(i-1) + 4 M(i) + M(i+1) = -(w(i) + w(i+1)) L^2 / 4 at the three interior supports, end moments zero;
    then R_A = w(1) L / 2 + M(1) / L. Solved by elimination written out (no library)."""
    k = [(w if a else 0.0) + (w if b else 0.0) for a, b in itertools.pairwise(loaded)]
    rhs = [-ki * span**2 / 4 for ki in k]
    # tridiagonal [[4, 1, 0], [1, 4, 1], [0, 1, 4]]: eliminate M1 from row 2, then M2 from row 3
    d2 = 4 - 1 / 4
    r2 = rhs[1] - rhs[0] / 4
    d3 = 4 - 1 / d2
    r3 = rhs[2] - r2 / d2
    m3 = r3 / d3
    m2 = (r2 - m3) / d2
    m1 = (rhs[0] - m2) / 4
    return (w if loaded[0] else 0.0) * span / 2 + m1 / span


def snow_on_stud_plate(patterned: bool | None = None) -> dict:
    """A 38 x 140 top plate, 2.4 m, on 38 mm studs at 406 mm (the end stud flush), with D 0.3, L 2 and S 3 kN/m on
    it: patterned bay by bay, the studs lift; a plate on studs is not patterned unless the model says so."""
    studs: dict = {"thickness": "38 mm", "spacing": "406 mm"}
    if patterned is not None:
        studs["patterned"] = patterned
    plate = {"studs": studs}
    return {
        "project": {"title": "Snow on a stud-wall plate (fictional)"},
        "materials": {"SPF": {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"}},
        "members": [
            {"id": "WP", "material": "SPF", "b": "140 mm", "d": "38 mm", "length": "2.4 m", "support": "studs", **plate}
        ],
        "bearings": [],
        "loads": [
            {
                "id": "roof",
                "member": "WP",
                "type": "uniform",
                "specified": {"D": "0.3 kN/m", "L": "2 kN/m", "S": "3 kN/m"},
            }
        ],
    }


# Stud centres under the plate: 19 mm, then every 406 mm while a stud fits, and the end stud at 2381 mm.
STUD_CENTRES = [0.019, 0.425, 0.831, 1.237, 1.643, 2.049, 2.381]


def _case(name: str, reference: float, computed: float, note: str = "") -> Case:
    return Case("Details by hand", name, HAND, reference / 1000.0, computed / 1000.0, 1e-3, "1 N", note)


def contact_cases() -> list[Case]:
    review = review_dict(roof(SEAT, BIRDSMOUTH))

    def qr(check_id: str) -> float:
        return review.result(check_id).governing.qr

    return [
        _case(
            "Qr (kN), rafter on half a 130 mm ridge",
            0.8 * 5.3e6 * (0.038 * 0.065) * 1.0 * 1.15,
            qr("R/G:R"),
            "0.8 x 5.3 MPa x 38 x 65 mm x KB 1.0 (end) x KZcp 1.15",
        ),
        _case(
            "Qr (kN), ridge under the half-width seat",
            0.8 * 7.0e6 * (0.038 * 0.065) * 1.25,
            qr("R/G:G"),
            "0.8 x 7.0 MPa x 38 x 65 mm (seat, not b = 130) x KB 1.25",
        ),
        _case(
            "Qr (kN), plate under an 89 mm birdsmouth",
            0.8 * 5.3e6 * (0.038 * 0.089) * 1.25,
            qr("R/W:W"),
            "0.8 x 5.3 MPa x 38 x 89 mm (seat, not b = 140) x KB 1.25 x KZcp 1.00",
        ),
        _case(
            "Qr (kN), 130 mm glulam on a 152 mm cap plate",
            0.8 * 7.0e6 * (0.130 * 0.152) * 1.0,
            qr("G/C1:G"),
            "0.8 x 7.0 MPa x 130 (own b, not 152) x 152 mm x KB 1.0 (over 150 mm)",
        ),
    ]


def point_load_cases() -> list[Case]:
    out = []
    for standard, (qf, qr, combination) in LEG_BY_HAND.items():
        g = review_dict(beam_with_leg(standard)).result("leg:B").governing
        out.append(_case(f"Qf (kN), equipment leg 50 x 60 mm on a beam, {standard} {combination}", qf, g.qf))
        out.append(_case(f"Qr (kN), crushing under the leg, {standard}", qr, g.qr, _LEG_HOW[standard]))
    return out


_LEG_HOW = {
    "o86": "0.8 x 5.3 MPa x 50 x 60 mm x KB 1.19 x KZcp 1.15",
    "nds-asd": "425 psi x 1.97 x 2.36 in x Cb (1.97 + 0.375)/1.97",
    "nds-lrfd": "the ASD value x KF 1.67 x phi 0.90",
    "ec5": "kc,90 1.0 x 0.8 x 2.5 MPa / 1.3 x 60 x (50 + 30 + 30) mm",
}


def near_support_cases() -> list[Case]:
    longest = review_dict(beam_with_post_and_joist()).result("B/C1:B:near")
    ridge = review_dict(ridge_with_rafters_both_sides()).result("G/C1:G:near")
    summed = review_dict(beam_with_post_and_joist(readings={"near_support.opposite_bearings": "summed"}))
    with_udl = review_dict(beam_with_post_and_joist(udl=True)).result("B/C1:B:near")
    return [
        _case(
            "Qf' (kN), a post and a joist within d",
            QF_POST_AND_JOIST,
            longest.governing.qf,
            "1.25 x (10 + 2) + 1.5 x 20 + 0.5 x 4",
        ),
        _case(
            "Qr' (kN), separate bearings: longest single",
            QR_LONGEST_SINGLE,
            longest.governing.qr,
            "2/3 x 0.8 x 7.0 MPa x 130 x (140 + 152)/2",
        ),
        _case(
            "Qr' (kN), separate bearings: summed reading",
            QR_SUMMED,
            summed.result("B/C1:B:near").governing.qr,
            "2/3 x 0.8 x 7.0 MPa x 130 x (152 + 178)/2",
        ),
        _case(
            "Qf' (kN), with a 2 kN/m wall load over the support",
            QF_POST_AND_JOIST + 1.25 * 2e3 * (0.076 + 0.608),
            with_udl.governing.qf,
            "47 + 1.25 x 2 kN/m x (76 + 608) mm, the wall load from the beam end to d past the support",
        ),
        _case(
            "Qf' (kN), rafters from both sides of a ridge within d",
            QF_TWO_RAFTERS,
            ridge.governing.qf,
            "2 x (1.25 x 0.6 + 1.5 x 1.6) kN/m x 4 x 1.9555/3.923 m",
        ),
        _case(
            "Qr' (kN), the two half-width seats side by side: one bearing 130 mm wide",
            QR_SIDE_BY_SIDE,
            ridge.governing.qr,
            "2/3 x 0.8 x 7.0 MPa x (65 + 65) x (38 + 1.5 x 38)/2 (not 65 mm: u 0.54, not 1.09)",
        ),
    ]


def built_up_cases() -> list[Case]:
    per_ply = review_dict(joist_on_built_up_plate()).result("R/W:W")
    combined = review_dict(joist_on_built_up_plate({"kzcp.built_up": "combined"})).result("R/W:W")
    return [
        _case(
            "Qr (kN), 2-ply 38 x 89 plate laid flat, per ply",
            QR_PLATE_PER_PLY,
            per_ply.governing.qr,
            "0.8 x 5.3 MPa x 38 x 89 mm x KB 1.25 x KZcp 1.00 (one ply: 89/38)",
        ),
        _case(
            "Qr (kN), the same plate, combined reading",
            QR_PLATE_COMBINED,
            combined.governing.qr,
            "as above x KZcp 1.124 (whole member: 89/76)",
        ),
    ]


def hankinson_cases() -> list[Case]:
    """A No.3 rafter birdsmouthed at 60 degrees to its grain: fc of No.3, not of No.1/No.2."""
    import math

    data = roof(SEAT, {**BIRDSMOUTH, "angle": "60 deg"})
    data["materials"]["SPF"]["grade"] = "No.3"
    r = review_dict(data).result("R/W:R")
    area = 0.089 * 0.038
    qr = 0.8 * 5.3e6 * area * 1.0 * 1.15
    pr = 0.8 * 9.0e6 * area
    s, c = math.sin(math.radians(60)), math.cos(math.radians(60))
    return [
        _case(
            "Nr (kN), No.3 S-P-F rafter at 60 deg (Hankinson)",
            pr * qr / (pr * s * s + qr * c * c),
            r.governing.qr,
            "Pr = 0.8 x 9.0 MPa (fc No.3) x 89 x 38; Qr = 0.8 x 5.3 MPa x 89 x 38 x 1.15",
        )
    ]


def stud_wall_cases() -> list[Case]:
    review = review_dict(post_on_stud_wall())
    return [
        _case(
            "Qr (kN), post on a double top plate",
            QR_POST_ON_PLATE,
            review.result("P/WP:WP").governing.qr,
            "0.8 x 5.3 MPa x 140 x 140 mm x KB 1.02",
        ),
        _case(
            "Qr (kN), the plate's underside on a 3-stud pack",
            QR_PLATE_ON_PACK,
            review.result("WP/WP.pack1:WP").governing.qr,
            "0.8 x 5.3 MPa x 114 x 140 mm x KB 1.072",
        ),
        _case(
            "Qr' (kN), the plate squeezed between post and pack",
            QR_PLATE_SQUEEZE,
            review.result("WP/WP.pack1:WP:near").governing.qr,
            "2/3 x 0.8 x 5.3 MPa x 140 x (114 + 140)/2 x KB 1.072",
        ),
        _case(
            "Qf' (kN), the whole post load through the plate",
            QF_POST_ON_WALL,
            review.result("WP/WP.pack1:WP:near").governing.qf,
            "1.25 x 10 + 1.5 x 20",
        ),
    ]


def pattern_cases() -> list[Case]:
    """Three equal 4 m spans, L = 2 kN/m: the live part of each reaction at its worst pattern.

    Continuous-beam coefficients for three equal spans (standard beam tables; from memory, and
    checked against anastruct in tests/test_pattern_loading.py): end reaction 0.400 wL with every
    span loaded, 0.450 wL with spans 1 and 3; first interior 1.100 wL, 1.200 wL with spans 1 and 2.
    """
    flow = review_dict(beam_on_posts([4.0, 4.0, 4.0])).flow
    w_l = 2.0e3 * 4.0
    return [
        Case(
            "Details by hand",
            "L reaction (kN), end support of three equal spans, worst pattern",
            "continuous-beam coefficients, three equal spans (beam tables, from memory)",
            0.450 * w_l / 1000,
            flow.envelopes["B/C1"]["L"].high / 1000,
            1e-3,
            "1 N",
            "0.450 wL with spans 1 and 3 loaded (0.400 wL with all)",
        ),
        Case(
            "Details by hand",
            "L reaction (kN), first interior support, worst pattern",
            "continuous-beam coefficients, three equal spans (beam tables, from memory)",
            1.200 * w_l / 1000,
            flow.envelopes["B/C2"]["L"].high / 1000,
            1e-3,
            "1 N",
            "1.200 wL with spans 1 and 2 loaded (1.100 wL with all)",
        ),
    ]


def carried_pattern_cases() -> list[Case]:
    """Four equal 4 m spans, D 1 and L 2 kN/m: the end post passes the beam's worst pattern to the sill under it.

    Three-moment equation (worked in ``three_moment_end_reaction``): end reaction 0.393 wL with every span
    loaded, 0.446 wL with spans 1 and 3. Before, the sill took the every-span force."""
    review = review_dict(four_span_on_sill())
    dead = three_moment_end_reaction([True] * 4, 1.0e3, 4.0)
    worst = three_moment_end_reaction([True, False, True, False], 2.0e3, 4.0)
    sill = review.result("P1/S:S")
    return [
        _case(
            "L through the sill under the end post of four equal spans (kN), worst pattern of B at B/P1",
            worst,
            review.flow.envelopes["P1/S"]["L"].high,
            "three-moment equation: 0.446 wL with spans 1 and 3 loaded (0.393 wL with all)",
        ),
        _case(
            "Qf (kN), the sill under the end post, 1.25D + 1.5L",
            1.25 * dead + 1.5 * worst,
            sill.governing.qf,
            "1.25 x 0.393 x 4 kN + 1.5 x 0.446 x 8 kN",
        ),
    ]


def duration_placing_cases() -> list[Case]:
    """Three equal 4 m spans, D 4 and L 1 kN/m: at the end support every span loaded governs, through KD."""
    import math

    result = review_dict(beam_on_posts([4.0, 4.0, 4.0], live="1 kN/m", dead="4 kN/m")).result("B/C1:B")
    row = next(c for c in result.combinations if c.combination == "1.25D+1.5L")
    dead, live = 0.40 * 16e3, 0.40 * 4e3  # beam tables: 0.40 wL at the end support, every span
    kd = 1.0 - 0.5 * math.log10(dead / live)
    qr = 0.8 * 7.0e6 * (0.130 * 0.076) * kd  # 130 x 76 mm: the post's 152 mm cut at the beam end
    return [
        Case(
            "Details by hand",
            "Qf/Qr, dead-heavy end support: every span loaded governs (worst pattern 0.45 wL gives less)",
            HAND,
            (1.25 * dead + 1.5 * live) / qr,
            row.utilisation,
            1e-6,
            "1e-6",
            "10.40 kN / (0.8 x 7.0 MPa x 130 x 76 mm x KD 0.699); at 0.45 wL: 10.70 kN with KD 0.725",
        )
    ]


def stud_plate_cases() -> list[Case]:
    """A 2.4 m top plate on studs at 406 mm, D 0.3, L 2 and S 3 kN/m: every bay loaded, no uplift at the end stud."""
    from tests.verification.cases import _anastruct_reactions

    review = review_dict(snow_on_stud_plate())
    dead = _anastruct_reactions(STUD_CENTRES, [], [(0.0, 2.4, 300.0)])[-1]
    snow = _anastruct_reactions(STUD_CENTRES, [], [(0.0, 2.4, 3000.0)])[-1]
    least = min(c.qf_low for c in review.result("WP/WP.stud7:WP").combinations)
    source = "anastruct (PyPI), 2D frame solver, the plate continuous over its seven studs"
    return [
        Case(
            "Details by hand",
            "S through the end stud of a plate on studs (kN), every bay loaded",
            source,
            snow / 1000,
            review.flow.bearing_forces["WP/WP.stud7"]["S"] / 1000,
            1e-3,
            "1 N",
        ),
        Case(
            "Details by hand",
            "least force through the end stud (kN): 0.9 D, downward (no uplift; patterned it lifted)",
            source,
            0.9 * dead / 1000,
            least / 1000,
            1e-3,
            "1 N",
            "a plate on studs is patterned only with studs: patterned: true",
        ),
    ]


def slip_cases() -> list[Case]:
    """The numbers two slips of a continuous beam give, as a calc that made them would print them."""
    from audit.review.slips import qf_slips

    review = review_dict(beam_on_posts([4.0, 4.0, 4.0]))
    slips = {s.name: s.value for s in qf_slips(review.result("B/C2:B"), review)}
    return [
        _case(
            "Qf (kN), interior support taken as simple spans (slip)",
            1.25 * 4e3 + 1.5 * 8e3,
            slips["simple-span-reactions"],
            "1.25 x (1 kN/m x 4 m) + 1.5 x (2 kN/m x 4 m)",
        ),
        _case(
            "Qf (kN), interior support with every span loaded only (slip)",
            1.25 * 1.1 * 4e3 + 1.5 * 1.1 * 8e3,
            slips["pattern-loading-ignored"],
            "1.25 x 1.1 wD L + 1.5 x 1.1 wL L (beam tables: 1.10 wL)",
        ),
        _case(
            "Qf (kN), interior support, worst pattern (recomputed)",
            1.25 * 1.1 * 4e3 + 1.5 * 1.2 * 8e3,
            review.result("B/C2:B").governing.qf,
            "1.25 x 1.1 wD L + 1.5 x 1.2 wL L, L on spans 1 and 2",
        ),
    ]


def detail_cases() -> list[Case]:
    return (
        contact_cases()
        + point_load_cases()
        + near_support_cases()
        + built_up_cases()
        + hankinson_cases()
        + stud_wall_cases()
    ) + (pattern_cases() + carried_pattern_cases() + duration_placing_cases() + stud_plate_cases() + slip_cases())
