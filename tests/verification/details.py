"""Framing details worked by hand: the model, and the hand derivation of each number.

Each case's reference is written out here factor by factor (the pack's values, from memory
of CSA O86: verify); the computed value is the engine's. The tests assert every case and
reports/verification.md lists them, so a reviewer can redo each one on paper.
"""

from __future__ import annotations

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


def detail_cases() -> list[Case]:
    return contact_cases()
