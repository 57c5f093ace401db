"""Hand derivations of Qr and Qr' with every factor written out.

Factor values are the rule pack's (from memory of CSA O86: verify); the arithmetic below is
done by hand, independently of the code's formulas.
"""

from __future__ import annotations

import math

import pytest

from tests.conftest import base_model, review_dict

REL = 1e-9


def test_reverse_direction_joist_on_beam_local_qr_by_hand():
    review = review_dict(base_model())
    r = review.result("J1/B1:J1")
    # S-P-F fcp 5.3 MPa; Ab = 38 mm (joist width) x 130 mm (beam width) = 4940 mm^2
    # KB = 1.0: the bearing runs to the joist end (0 mm < 75 mm); KZcp = 1.15: 38/235 <= 1.0
    phi, fcp, area, kb, kzcp, kd, kscp, kt = 0.8, 5.3e6, 0.038 * 0.130, 1.0, 1.15, 1.0, 1.0, 1.0
    expected_qr = phi * (fcp * kd * kscp * kt) * area * kb * kzcp
    assert expected_qr == pytest.approx(24087.44, rel=1e-6)
    assert r.governing.qr == pytest.approx(expected_qr, rel=REL)
    # joist: 4 m, supports at 65 mm and 3935 mm (symmetric), D 1 kN/m, L 2 kN/m -> 2 kN D, 4 kN L
    assert r.governing.qf == pytest.approx(1.25 * 2000 + 1.5 * 4000, rel=REL)
    assert r.governing.combination == "1.25D+1.5L"


def test_supporting_beam_local_qr_by_hand_with_kb():
    r = review_dict(base_model()).result("J1/B1:B1")
    # glulam fcp 7.0; Ab = 38 x 130; KB(38 mm) = 1.25 (away from the ends); KZcp not for glulam
    expected = 0.8 * 7.0e6 * 0.038 * 0.130 * 1.25 * 1.0
    assert r.governing.qr == pytest.approx(expected, rel=REL)
    kb = next(f for f in r.factors if f.name == "KB")
    assert kb.value == pytest.approx(1.25) and "38 mm" in kb.reason


def _joist_near_support(area_reading: str | None = None) -> dict:
    data = base_model()
    data["bearings"][2]["lower"]["at"] = "300 mm"  # 225 mm from the support centre at 75 mm, d = 380 mm
    if area_reading:
        data["project"]["near_support_area"] = area_reading
    return data


def test_near_support_qr_prime_by_hand_length_cap_reading():
    r = review_dict(_joist_near_support()).result("B1/C1:B1:near")
    # L1 = 38 mm (joist), L2 = 150 mm (post depth) limited to 1.5 x 38 = 57 mm; b = 130 mm
    area = 0.130 * (0.038 + 0.057) / 2
    # KB = 1.0: the support bearing is at the member end, so both faces do not qualify
    expected = (2 / 3) * 0.8 * 7.0e6 * area * 1.0 * 1.0
    assert expected == pytest.approx(23053.33, rel=1e-6)
    assert r.governing.qr == pytest.approx(expected, rel=REL)
    # only the joist reaction within d, not the whole beam reaction
    assert r.governing.qf == pytest.approx(8500.0, rel=REL)


def test_near_support_qr_prime_by_hand_area_cap_reading():
    r = review_dict(_joist_near_support("area_cap")).result("B1/C1:B1:near")
    area = min(0.130 * (0.038 + 0.150) / 2, 1.5 * 0.130 * 0.038)
    assert r.governing.qr == pytest.approx((2 / 3) * 0.8 * 7.0e6 * area, rel=REL)


def test_long_term_load_duration_formula_by_hand():
    data = base_model()
    data["loads"][0]["specified"] = {"D": "5 kN/m", "L": "1 kN/m"}
    r = review_dict(data).result("J1/B1:J1")
    row = next(c for c in r.combinations if c.combination == "1.25D+1.5L")
    # PL = 10 kN, PS = 2 kN: KD = 1.0 - 0.5 log10(5) = 0.6505
    assert row.kd == pytest.approx(1.0 - 0.5 * math.log10(5.0), rel=REL)
    assert row.qr == pytest.approx(24087.44 * row.kd, rel=1e-6)


def test_wet_service_factor_by_hand():
    data = base_model()
    data["members"][3]["service"] = "wet"
    r = review_dict(data).result("J1/B1:J1")
    assert r.governing.qr == pytest.approx(24087.44 * 0.67, rel=1e-6)


def test_hankinson_for_bearing_at_an_angle_by_hand():
    data = base_model()
    data["bearings"][2]["upper"]["angle"] = "60 deg"
    r = review_dict(data).result("J1/B1:J1")
    qr = 24087.44  # perpendicular value above
    pr = 0.8 * 11.5e6 * 0.038 * 0.130  # fc S-P-F 11.5 MPa over the same area
    theta = math.radians(60)
    expected = pr * qr / (pr * math.sin(theta) ** 2 + qr * math.cos(theta) ** 2)
    assert r.governing.qr == pytest.approx(expected, rel=1e-6)


def test_kzcp_is_one_for_a_plate_laid_flat():
    r = review_dict(base_model()).result("J1/W1:W1")
    kz = next(f for f in r.factors if f.name == "KZcp")
    assert kz.value == 1.0  # 140/38 = 3.7 >= 2.0


def test_kb_is_one_for_a_bearing_longer_than_150_mm():
    data = base_model()
    data["members"][3]["b"] = "191 mm"  # a 160 mm contact along B1 needs a member at least that wide on it
    data["bearings"][2]["lower"]["length"] = "160 mm"
    r = review_dict(data).result("J1/B1:B1")
    assert next(f for f in r.factors if f.name == "KB").value == 1.0


def test_hankinson_takes_fc_by_grade_for_a_no3_joist():
    data = base_model()
    data["materials"]["SPF"]["grade"] = "No.3"
    data["bearings"][2]["upper"]["angle"] = "60 deg"
    r = review_dict(data).result("J1/B1:J1")
    area = 0.038 * 0.130
    qr = 0.8 * 5.3e6 * area * 1.0 * 1.15  # fcp is the same for every grade of S-P-F
    pr = 0.8 * 9.0e6 * area  # fc of S-P-F No.3/Stud, 9.0 MPa (pack, from memory: verify), not No.2's 11.5
    theta = math.radians(60)
    assert r.governing.qr == pytest.approx(pr * qr / (pr * math.sin(theta) ** 2 + qr * math.cos(theta) ** 2), rel=1e-9)


def test_a_bearing_at_an_angle_on_a_grade_without_fc_in_the_pack_is_refused():
    from audit.core.errors import InputErrors

    data = base_model()
    data["materials"]["SPF"]["grade"] = "Construction"
    data["bearings"][2]["upper"]["angle"] = "60 deg"
    with pytest.raises(InputErrors) as caught:
        review_dict(data)
    assert "needs fc" in str(caught.value) and "Construction" in str(caught.value)
