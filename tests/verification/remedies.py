"""Remedies re-checked by hand: the length or plate the memo offers, and the resistance it then has.

Each remedy is worked from the clause formula with the contact as the remedy changes it, and its neighbours as
they are (values as recalled in the bundled packs: from memory, verify).
"""

from __future__ import annotations

import math

from tests.verification.cases import Case


def ec5_beside_a_close_contact() -> dict:
    """B (C24, 89 x 235) flush on P1 at its end, a third post P3 300 mm along; the calc's force at B/P1."""
    from tests.verification.standards import contact_model

    data = contact_model("ec5")
    data["members"].append({"id": "P3", "material": "STEEL", "b": "89 mm", "d": "89 mm", "length": "3 m",
                            "orientation": "vertical"})  # fmt: skip
    data["bearings"].append({"upper": {"member": "B", "at": "344.5 mm"}, "lower": "P3"})
    data["bearings"][0]["calc_force"] = {"D": "6 kN", "L": "12 kN"}
    return data


def glulam_on_narrow_posts() -> dict:
    """Glulam B1 (D.Fir-L, 130 wide) flush on two 89 x 89 posts, D 10 and L 20 kN/m over its 6 m (and J1)."""
    from tests.conftest import base_model

    data = base_model()
    for post in data["members"][1:3]:
        post["b"] = post["d"] = "89 mm"
    data["bearings"][0]["upper"]["at"] = "44.5 mm"
    data["bearings"][1]["upper"]["at"] = "5955.5 mm"
    data["loads"].append(
        {"id": "roof", "member": "B1", "type": "uniform", "specified": {"D": "10 kN/m", "L": "20 kN/m"}}
    )
    return data


def remedy_cases() -> list[Case]:
    from audit.review.remedies import remedies
    from tests.conftest import review_dict

    group = "Remedies re-checked by hand"
    out = []
    review = review_dict(ec5_beside_a_close_contact())
    result = review.result("B/P1:B")
    longer = next(t for t in remedies(review, result) if t.what == "length")
    fc90d = 0.8 * 2.5e6 / 1.3  # kmod medium (imposed load) x fc,90,k / gamma_M
    qf = 1.35 * 6000 + 1.5 * 12000
    length = math.ceil((qf / (1.0 * fc90d * 0.089) - 0.030) * 1000) / 1000
    source = "EN 1995-1-1 6.1.5 (from memory), re-checked by hand"
    out += [
        Case(group, "EC5 bearing length (mm) beside a contact closer than 2h", source, length * 1000,
             longer.length * 1000, 1e-6, "1e-6", "kc,90 1.0, lef = l + 30 mm: 1.54 MPa x 89 x (l + 30) >= 26.1 kN"),
        Case(group, "EC5 Fc,90,Rd (kN) of that remedy", source, 1.0 * fc90d * 0.089 * (length + 0.030) / 1000,
             longer.result.governing.qr / 1000, 1e-6, "1e-6", "at least 26.1 kN; kc,90 1.5 alone: 98 mm"),
    ]  # fmt: skip
    review = review_dict(glulam_on_narrow_posts())
    result = review.result("B1/C1:B1")
    plate = next(t for t in remedies(review, result) if t.what == "plate")
    qf = 1.25 * 31000 + 1.5 * 62000
    length = math.ceil(qf / (0.8 * 7.0e6 * 0.130) * 1000) / 1000
    source = "CSA O86 7.5.9 (from memory), re-checked by hand"
    out += [
        Case(group, "O86 full-width plate length (mm), a plate at the present 89 mm fails", source, length * 1000,
             plate.length * 1000, 1e-6, "1e-6", "0.8 x 7.0 MPa x 130 x L x KB 1.00 (end) >= 131.75 kN"),
        Case(group, "O86 Qr (kN) of that plate", source, 0.8 * 7.0e6 * 0.130 * length / 1000,
             plate.result.governing.qr / 1000, 1e-6, "1e-6", "at 89 mm it would be 64.8 kN < 131.75 kN"),
    ]  # fmt: skip
    return out
