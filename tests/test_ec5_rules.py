"""EN 1995-1-1 decision rules, each against a hand calculation: the effective length's caps on each side,
the load-duration class of storage, its companion factor, bearing at an angle to the grain.

Clauses as recalled (EN 1995-1-1 6.1.5, 6.2.2, 2.3.1.2 and Table 3.1; EN 1990 Table A1.1 and A1.2(B)),
from memory: verify. Each test's numbers are worked here from the clause, not taken from the code.
"""

from __future__ import annotations

import pytest

from audit.engine.contacts import Contact
from audit.standards.ec5 import effective_reach
from tests.conftest import review_dict
from tests.verification.standards import SIDE, contact_model

EXTENSION = 0.030  # m, 6.1.5(1) as recalled


def _contact(start: float, length: float) -> Contact:
    return Contact("c", length, 0.1, start, start + length / 2, "", "", start)


# ---------------------------------------------------------------- lef = l + min(30 mm, a or l1/2, l) each side


def test_each_side_of_the_effective_length_stops_half_way_to_a_contact_on_that_side():
    # EN 1995-1-1 6.1.5(1), Figure 6.2 (from memory: verify): a neighbour 40 mm to the LEFT of a 100 mm
    # contact gives l1/2 = 20 mm on the left; nothing on the right: 30 mm
    neighbour, contact = _contact(0.86, 0.1), _contact(1.0, 0.1)
    reach = effective_reach(contact, [neighbour], 4.0, EXTENSION)
    assert reach.left == pytest.approx(0.020) and reach.right == pytest.approx(0.030)
    assert "left 20 mm (half way to the next contact)" in reach.why


def test_the_effective_length_of_a_short_contact_adds_no_more_than_its_own_length_each_side():
    # 6.1.5(1) as recalled: each side adds min(30 mm, a, l1/2, l); a 25 mm contact in the span adds 25 mm
    # each side, lef = 25 + 25 + 25 = 75 mm (not 85 mm)
    reach = effective_reach(_contact(1.0, 0.025), [], 4.0, EXTENSION)
    assert reach.left == pytest.approx(0.025) and reach.right == pytest.approx(0.025)
    assert "the contact length l" in reach.why


def test_a_short_contact_at_the_member_end_spreads_its_own_length_inwards_only():
    # 6.1.5(1) as recalled: a 25 mm contact flush with the end: a = 0 on the outside, l = 25 mm inside:
    # lef = 25 + 0 + 25 = 50 mm (the uncapped 55 mm is the +10 % the cap removes)
    reach = effective_reach(_contact(0.0, 0.025), [], 4.0, EXTENSION)
    assert reach.left == pytest.approx(0.0) and reach.right == pytest.approx(0.025)


def test_the_right_side_stops_at_the_member_end_when_that_is_nearest():
    # 6.1.5(1) as recalled: a contact ending 12 mm before the right end: a = 12 mm on the right
    reach = effective_reach(_contact(3.888, 0.1), [], 4.0, EXTENSION)
    assert reach.right == pytest.approx(0.012) and reach.left == pytest.approx(0.030)
    assert "right 12 mm (member end)" in reach.why


def test_a_25_mm_bearing_under_ec5_takes_lef_capped_by_its_length():
    # The contact model's beam on a 25 x 25 mm steel post flush with the beam end: b = 25 mm across (the
    # post's width), lef = 25 + 0 + 25 = 50 mm (EN 1995-1-1 6.1.5(1), from memory: verify); kc,90 1.5
    # (discrete, solid, nothing within 2h),
    # kmod 0.8 (medium, imposed load leading), fc,90,k 2.5 MPa, gamma_M 1.3
    data = contact_model("ec5")
    data["members"][1].update({"b": "25 mm", "d": "25 mm"})
    data["bearings"][0]["upper"]["at"] = "12.5 mm"
    result = review_dict(data).result_at("B/P1", "B", "local")
    assert result is not None
    by_hand = 1.5 * 0.8 * 2.5e6 / 1.3 * 0.025 * (0.025 + 0.0 + 0.025)
    assert result.governing.qr == pytest.approx(by_hand, rel=1e-9)


# ---------------------------------------------------------------- storage: long-term, companion gamma_Q psi0


def _storage(extra: dict | None = None) -> dict:
    data = contact_model("ec5")
    data["loads"][0]["live"] = "storage"
    if extra:
        data["loads"][0]["specified"].update(extra)
    return data


def test_storage_live_load_under_ec5_is_a_long_term_action():
    # EN 1995-1-1 2.3.1.2 (from memory: verify): storage is long-term; Table 3.1 kmod 0.70 for solid timber
    # in service classes 1-2 (0.80 would be medium-term). The contact model's post: D 3.0 kN, L 4.5 kN;
    # Qr = kc,90 1.5 x 0.70 x 2.5 MPa / 1.3 x 89 x (89 + 0 + 30) mm²
    result = review_dict(_storage()).result_at("B/P1", "B", "local")
    assert result is not None
    rows = {c.combination: c for c in result.combinations}
    assert rows["1.35G+1.5Q"].kd == pytest.approx(0.70)
    assert rows["1.35G+1.5Q"].qr == pytest.approx(1.5 * 0.70 * 2.5e6 / 1.3 * SIDE * (SIDE + 0.030), rel=1e-9)
    assert result.governing.combination == "1.35G+1.5Q" and "long-term" in result.governing.kd_reason


def test_occupancy_live_load_under_ec5_stays_medium_term():
    # EN 1995-1-1 2.3.1.2 (from memory: verify): domestic imposed load medium-term, kmod 0.80
    result = review_dict(contact_model("ec5")).result_at("B/P1", "B", "local")
    assert result is not None
    assert {c.combination: c for c in result.combinations}["1.35G+1.5Q"].kd == pytest.approx(0.80)


def test_storage_live_load_as_a_companion_under_en1990_takes_gamma_q_times_psi0():
    # EN 1990 6.10, Table A1.1 (category E psi0 = 1.0) and A1.2(B) (gamma_Q = 1.5), from memory: verify:
    # snow leading, storage accompanying at 1.5 x 1.0. The post: D 3.0, L 4.5, S 1.5 kN (w L / 2)
    result = review_dict(_storage({"S": "1 kN/m"})).result_at("B/P1", "B", "local")
    assert result is not None
    # the label states the factor storage takes (all live load here is storage): 1.5Q, not 1.05Q
    rows = {c.combination: c for c in result.combinations}
    assert rows["1.35G+1.5S+1.5Q"].qf == pytest.approx(1.35 * 3000 + 1.5 * 1500 + 1.5 * 4500)
    # occupancy accompanies at psi0 gamma_Q = 0.7 x 1.5 = 1.05
    occupancy = contact_model("ec5")
    occupancy["loads"][0]["specified"]["S"] = "1 kN/m"
    plain = review_dict(occupancy).result_at("B/P1", "B", "local")
    assert plain is not None
    rows = {c.combination: c for c in plain.combinations}
    assert rows["1.35G+1.5S+1.05Q"].qf == pytest.approx(1.35 * 3000 + 1.5 * 1500 + 1.05 * 4500)


def test_storage_live_load_in_the_seismic_combination_takes_psi2():
    # EN 1990 6.4.3.4 / Table A1.1 (from memory: verify): G + AEd + psi2 Q, psi2 = 0.8 for storage
    result = review_dict(_storage({"E": "1 kN/m"})).result_at("B/P1", "B", "local")
    assert result is not None
    rows = {c.combination: c for c in result.combinations}
    assert rows["1.0G+1.0E+0.8Q"].qf == pytest.approx(1.0 * 3000 + 1.0 * 1500 + 0.8 * 4500)


# ---------------------------------------------------------------- bearing at an angle to the grain


def test_a_stated_angle_to_grain_under_ec5_is_checked_by_the_inclined_compression_formula():
    # EN 1995-1-1 6.2.2, equation 6.16 (from memory: verify): fc,alpha,d = fc,0,d / (fc,0,d / (kc,90 fc,90,d)
    # sin² a + cos² a), on the contact b l without the 30 mm extensions (the conservative reading).
    # C24: fc,0,k 21 MPa, fc,90,k 2.5 MPa (EN 338, from memory: verify); kmod 0.8, gamma_M 1.3, kc,90 1.5;
    # the contact 89 x 89 mm; alpha = 60 deg.
    import math

    data = contact_model("ec5")
    data["bearings"][0]["upper"]["angle"] = "60 deg"
    result = review_dict(data).result_at("B/P1", "B", "local")
    assert result is not None
    fc0d, fc90d = 0.8 * 21e6 / 1.3, 0.8 * 2.5e6 / 1.3
    alpha = math.radians(60)
    fcad = fc0d / (fc0d / (1.5 * fc90d) * math.sin(alpha) ** 2 + math.cos(alpha) ** 2)
    assert result.governing.qr == pytest.approx(fcad * SIDE * SIDE, rel=1e-9)
    assert any(f.name == "alpha" and "6.2.2" in f.clause for f in result.factors)
    assert "at an angle" in result.area_reason


def test_a_perpendicular_angle_under_ec5_is_the_plain_check():
    # alpha = 90 deg is compression perpendicular to the grain: 6.1.5 with lef (same as no angle stated)
    data = contact_model("ec5")
    data["bearings"][0]["upper"]["angle"] = "90 deg"
    result = review_dict(data).result_at("B/P1", "B", "local")
    assert result is not None
    assert result.governing.qr == pytest.approx(1.5 * 0.8 * 2.5e6 / 1.3 * SIDE * (SIDE + 0.030), rel=1e-9)


def test_a_claim_taking_storage_as_medium_term_is_diagnosed_as_that_slip():
    # the calc's Qr with kmod 0.80 (medium-term) where storage is long-term (0.70): 1.5 x 0.8 x 2.5 MPa / 1.3 x
    # 89 x 119 mm = 24.44 kN (EN 1995-1-1 Table 3.1, from memory: verify)
    from tests.conftest import reconcile_dicts

    qr = 1.5 * 0.8 * 2.5e6 / 1.3 * SIDE * (SIDE + 0.030)
    claim = {"location": "B/P1", "member": "B", "Qf": "10.8 kN", "Qr": f"{qr / 1000:.3f} kN"}
    _, _, rec = reconcile_dicts(_storage(), [claim])
    text = " ".join(f.message for f in rec.findings if f.kind == "resistance-differs")
    assert "kmod = 0.80 (medium-term) used for a longer action" in text
