"""The diagnosis and the combination words, worked by hand: the numbers a calc that made the slips would print,
and the factors the labels state (values as recalled in the bundled packs: from memory, verify)."""

from __future__ import annotations

import math

from tests.verification.cases import Case

HAND = "hand derivation in tests/verification/diagnosis.py"


def diagnosis_cases() -> list[Case]:
    from audit.review.slips import qf_slips, qr_slips_with_load
    from tests.conftest import base_model, review_dict
    from tests.verification.details import beam_on_posts

    group = "Diagnosis and combination words by hand"
    out = []
    # three equal 4 m spans, D 2, L 1 kN/m, first interior support: unfactored with every span loaded (1.10 wL)
    review = review_dict(beam_on_posts([4.0, 4.0, 4.0], live="1 kN/m", dead="2 kN/m"))
    slips = {s.name: s for s in qf_slips(review.result("B/C2:B"), review)}
    out.append(
        Case(group, "Qf (kN), two slips: every span loaded and unfactored", "beam tables (from memory), " + HAND,
             1.1 * 2 * 4 + 1.1 * 1 * 4, slips["pattern-loading-ignored+unfactored-loads"].value / 1000, 1e-6, "1e-6",
             "1.10 wD L + 1.10 wL L; unfactored with L on spans 1 and 2 would be 13.6 kN")
    )  # fmt: skip
    # near-support Qr' at the calc's own KD: only the bearing within d (D 2 < L 4 kN) gives KD 1.00
    data = base_model()
    data["bearings"][2]["lower"]["at"] = "300 mm"
    data["loads"].append({"id": "beam", "member": "B1", "type": "uniform", "specified": {"D": "20 kN/m"}})
    review = review_dict(data)
    result = review.result("B1/C1:B1:near")
    load = next(s for s in qf_slips(result, review) if s.name == "distributed-load-left-out")
    own = next(s for s in qr_slips_with_load(result, review, load) if s.name == "duration-of-calc-loads")
    qr_kd1 = (2 / 3) * 0.8 * 7.0e6 * (0.130 * (0.038 + 0.057) / 2)
    out += [
        Case(group, "Qr' (kN) at the calc's loads' KD 1.00", "CSA O86 7.5.9 (from memory), " + HAND, qr_kd1 / 1000,
             own.value / 1000, 1e-6, "1e-6", "(2/3) x 0.8 x 7.0 MPa x 130 x (38 + 57)/2 mm²"),
        Case(group, "Qr' (kN) recomputed, KD of the long-term formula", "CSA O86 5.3.2.3 (from memory), " + HAND,
             qr_kd1 * (1 - 0.5 * math.log10(11.1 / 4)) / 1000, result.governing.qr / 1000, 1e-6, "1e-6",
             "KD = 1 - 0.5 log10(11.1/4) = 0.778: D 11.1 kN with 455 mm of B1's own load"),
    ]  # fmt: skip
    # storage live load with snow leading takes the storage companion 1.0: the label says 1.0L
    data = base_model()
    data["loads"][0] = {"id": "roof", "member": "J1", "type": "uniform", "live": "storage",
                        "specified": {"D": "1 kN/m", "L": "2 kN/m", "S": "1 kN/m"}}  # fmt: skip
    rows = {c.combination: c for c in review_dict(data).result("J1/B1:J1").combinations}
    out.append(
        Case(group, "Qf (kN) under 1.25D+1.5S+1.0L, all live load storage", "NBCC 2015 (from memory), " + HAND,
             (1.25 * 2000 + 1.5 * 2000 + 1.0 * 4000) / 1000, rows["1.25D+1.5S+1.0L"].qf / 1000, 1e-6, "1e-6",
             "w x 2 m at each support of J1")
    )  # fmt: skip
    return out
