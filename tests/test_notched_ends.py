"""Notched ends at bearings: the depth left at the support sets the near-support reach; the notch's shear
is listed as not checked here.

Hand method (CSA O86 near-support check as recalled in docs: Qr' = (2/3) phi Fcp Ab' KB KZcp,
Ab' = b (L1 + L2) / 2 with L2 at most 1.5 L1, loads within d of the support only): worked in each test.
"""

from __future__ import annotations

import pytest

from audit.core.errors import InputErrors
from tests.conftest import base_model, review_dict


def _with_loads(notch: str | None, *positions: str) -> dict:
    data = base_model()
    if notch is not None:
        data["bearings"][0]["upper"]["notch"] = notch  # B1 notched where it sits on C1 (centre 75 mm)
    for n, at in enumerate(positions):
        data["loads"].append(
            {"id": f"P{n + 1}", "member": "B1", "type": "point", "at": at, "length": "89 mm",
             "factored": "20 kN", "duration": "standard"}
        )  # fmt: skip
    return data


def _near(review):
    return [c for c in review.checklist.checks if c.kind == "near-support" and c.bearing == "B1/C1"]


def test_a_notch_shortens_the_near_support_reach_to_the_depth_left():
    # B1 d = 380 mm; notched 100 mm at C1: 280 mm left. P1 at 300 mm is 225 mm from C1's centre (within 280),
    # P2 at 400 mm is 325 mm from it (within 380, not within 280).
    plain = _near(review_dict(_with_loads(None, "300 mm", "400 mm")))
    notched = _near(review_dict(_with_loads("100 mm", "300 mm", "400 mm")))
    assert [[c.source for c in check.opposite] for check in plain] == [["P1", "P2"]]
    assert [[c.source for c in check.opposite] for check in notched] == [["P1"]]
    assert "d = 280 mm" in notched[0].why and "notched 100 mm" in notched[0].why


def test_the_notched_near_support_check_carries_only_the_load_within_the_depth_left():
    review = review_dict(_with_loads("100 mm", "300 mm", "400 mm"))
    [check] = _near(review)
    result = review.result(check.id)
    # Qf' = P1 alone, 20 kN factored. Qr' by hand: b = 130 mm; L1 = 89 mm (P1's length), L2 = 150 mm (C1's d)
    # limited to 1.5 x 89 = 133.5 mm; Ab' = 130 x (89 + 133.5) / 2 = 14,462.5 mm2; KB 1.0 (the support is at
    # B1's end), KZcp 1.0 (glulam), KD 1.0 (standard term), fcp 7.0 MPa (D.Fir-L glulam, as recalled):
    # Qr' = 2/3 x 0.8 x 7.0 MPa x 14,462.5 mm2 = 53.99 kN
    assert result.governing.qf == pytest.approx(20_000.0, rel=1e-6)
    assert result.governing.qr == pytest.approx(2 / 3 * 0.8 * 7.0e6 * 14_462.5e-6, rel=1e-3)


def test_a_notched_end_is_noted_for_the_record_with_its_shear_not_checked_here():
    review = review_dict(_with_loads("100 mm", "300 mm"))
    [note] = [f for f in review.engine_findings if f.kind == "notched-end"]
    assert note.weight == "record" and note.bearing == "B1/C1" and note.member == "B1"
    assert "not checked here" in note.message and "280 mm" in note.message


def test_a_notch_as_deep_as_the_member_is_refused_at_its_key():
    data = _with_loads("380 mm")
    with pytest.raises(InputErrors) as info:
        review_dict(data)
    assert any("bearings[0].upper.notch" in line and "less than the depth" in line for line in info.value.lines())


def test_a_layout_run_notched_at_a_span_line_carries_the_notch_to_each_bearing_there():
    from tests.test_layout import small

    data = small()
    data["layout"]["runs"][0]["notch"] = {"A": "50 mm"}  # the joists notched where they sit on BA (grid A)
    review = review_dict(data)
    on_a = review.model.bearings_by_id["J-A-B-3/BA"].upper
    on_b = review.model.bearings_by_id["J-A-B-3/BB"].upper
    assert on_a.notch == pytest.approx(0.050) and on_b.notch == 0.0
    notes = [f for f in review.engine_findings if f.kind == "notched-end"]
    assert len(notes) == 6 and all(f.bearing.endswith("/BA") for f in notes)  # 6 joists, 235 - 50 = 185 mm left
    assert "185 mm" in notes[0].message


def test_a_layout_notch_at_a_line_the_run_does_not_span_is_refused_with_the_ends():
    from tests.test_layout import small

    data = small()
    data["layout"]["runs"][0]["notch"] = {"C": "50 mm"}
    with pytest.raises(InputErrors) as info:
        review_dict(data)
    assert any("notch: 'C' is not an end here" in line for line in info.value.lines())
