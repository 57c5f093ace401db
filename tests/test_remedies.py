"""Remedies are verified: each is the check with one thing changed, run again through the standard's own check.

Expected lengths are worked by hand from the clause formulas (O86 7.5.9: Qr = phi fcp KD Ab KB; EN 1995-1-1
6.1.5: Fc,90,Rd = kc,90 kmod fc,90,k / gamma_M b lef), with values as recalled in the bundled packs
(from memory: verify).
"""

from __future__ import annotations

import math

import pytest

from audit.review.reconcile import reconcile
from audit.review.remedies import remedies
from tests.conftest import base_model, review_dict
from tests.verification.standards import contact_model


def _beam_on_narrow_posts(dead: str, live: str):
    """Glulam B1 (D.Fir-L, fcp 7.0 MPa, 130 wide) flush on the ends of two 89 x 89 posts, 5911 mm apart,
    with a uniform load over its 6 m: each post carries half of everything (symmetry)."""
    data = base_model()
    for post in data["members"][1:3]:
        post["b"] = post["d"] = "89 mm"
    data["bearings"][0]["upper"]["at"] = "44.5 mm"
    data["bearings"][1]["upper"]["at"] = "5955.5 mm"
    data["loads"].append({"id": "roof", "member": "B1", "type": "uniform", "specified": {"D": dead, "L": live}})
    return data


def test_a_full_width_plate_that_still_fails_is_offered_only_at_a_length_that_passes():
    # B1/C1: D = 10 x 3 + 1 (half J1's 2 kN) = 31 kN, L = 20 x 3 + 2 = 62 kN; Qf = 1.25 x 31 + 1.5 x 62 = 131.75 kN.
    # On B1: 89 x 89 mm at the member end (KB 1.00, KZcp not for glulam): Qr = 0.8 x 7.0 MPa x 89 x 89 = 44.4 kN.
    # A plate the full 130 mm at 89 mm: 0.8 x 7.0 MPa x 130 x 89 = 64.8 kN < 131.75 kN, so not a remedy there.
    review = review_dict(_beam_on_narrow_posts("10 kN/m", "20 kN/m"))
    result = review.result("B1/C1:B1")
    qf = 1.25 * 31000 + 1.5 * 62000
    assert result.governing.qf == pytest.approx(qf)
    assert result.governing.qr == pytest.approx(0.8 * 7.0e6 * 0.089 * 0.089)
    assert qf > 0.8 * 7.0e6 * 0.130 * 0.089
    found = {t.what: t for t in remedies(review, result)}
    # the plate at the length that passes: L >= 131.75 kN / (0.8 x 7.0 MPa x 130 mm) = 181.0 mm -> 181 mm;
    # at the post's 89 mm width: L >= 131.75 kN / (0.8 x 7.0 MPa x 89 mm) = 264.3 mm -> 265 mm
    assert found["plate"].length == pytest.approx(math.ceil(qf / (0.8 * 7.0e6 * 0.130) * 1000) / 1000)
    assert found["length"].length == pytest.approx(math.ceil(qf / (0.8 * 7.0e6 * 0.089) * 1000) / 1000)
    assert all(t.passes for t in found.values())
    text = reconcile(review, ()).outcome("B1/C1:B1").remedy
    assert "a bearing plate the full 130 mm width of B1, at least 181 mm long" in text


def test_a_full_width_plate_that_passes_at_the_present_length_is_offered_as_it_is():
    # D = 4 x 3 + 1 = 13 kN, L = 8 x 3 + 2 = 26 kN: Qf = 16.25 + 39 = 55.25 kN, between 44.4 and 64.8 kN
    review = review_dict(_beam_on_narrow_posts("4 kN/m", "8 kN/m"))
    result = review.result("B1/C1:B1")
    assert result.governing.qf == pytest.approx(1.25 * 13000 + 1.5 * 26000)
    found = {t.what: t for t in remedies(review, result)}
    assert found["plate"].length == pytest.approx(0.089)
    assert found["plate"].utilisation == pytest.approx(55250.0 / (0.8 * 7.0e6 * 0.130 * 0.089))
    assert "full 130 mm width of B1 (Qf/Qr = 0.85)" in reconcile(review, ()).outcome("B1/C1:B1").remedy


def test_an_ec5_remedy_beside_a_close_contact_takes_the_kc90_of_the_real_check():
    # B (C24, 89 x 235) on P1 at its end, a third post P3 300 mm along: the clear distance is under 2h = 470 mm,
    # so kc,90 = 1.0 in the real check and in every remedy (EN 1995-1-1 6.1.5). The calc's force at B/P1:
    # D 6, L 12 kN -> Fc,90,d = 1.35 x 6 + 1.5 x 12 = 26.1 kN; fc,90,d = 0.8 x 2.5 / 1.3 MPa (kmod medium).
    # lef = l + 30 mm (none past the member end; half the gap to P3 stays over 30 mm):
    # 1.0 x 1.5385 MPa x 89 x (l + 30) >= 26.1 kN -> l >= 160.6 mm -> 161 mm.
    # Taken alone (kc,90 1.5, as the old trial did) it would be 97.1 -> 98 mm, which the real check fails.
    data = contact_model("ec5")
    data["members"].append({"id": "P3", "material": "STEEL", "b": "89 mm", "d": "89 mm", "length": "3 m",
                            "orientation": "vertical"})  # fmt: skip
    data["bearings"].append({"upper": {"member": "B", "at": "344.5 mm"}, "lower": "P3"})
    data["bearings"][0]["calc_force"] = {"D": "6 kN", "L": "12 kN"}
    review = review_dict(data)
    result = review.result_at("B/P1", "B", "local")
    assert result is not None and not result.passes
    fc90d = 0.8 * 2.5e6 / 1.3
    need = 26100.0 / (1.0 * fc90d * 0.089) - 0.030
    found = {t.what: t for t in remedies(review, result)}
    assert found["length"].length == pytest.approx(math.ceil(need * 1000) / 1000)
    kc90 = next(f for f in found["length"].result.factors if f.name == "kc,90")
    assert kc90.value == 1.0
    alone = 26100.0 / (1.5 * fc90d * 0.089) - 0.030
    assert math.ceil(alone * 1000) / 1000 < found["length"].length  # the old answer is shorter, and fails
    assert set(found) == {"length"}  # no plate (already full width); C30 (2.7 MPa) at 89 mm: 17.6 kN < 26.1 kN


def test_a_failing_check_nothing_repairs_says_so():
    # The near-support check of B1 over C1 with J1 300 mm away: Qr' is capped by the 38 mm on the opposite face,
    # which no support length, plate or species (D.Fir-L is the pack's strongest glulam) changes.
    data = base_model()
    data["bearings"][2]["lower"]["at"] = "300 mm"  # J1 within d of C1: a near-support check of B1
    data["loads"][0]["specified"] = {"D": "40 kN/m", "L": "80 kN/m"}
    review = review_dict(data)
    result = review.result("B1/C1:B1:near")
    assert not result.passes
    # Ab' = b (L1 + L2)/2 with L2 <= 1.5 L1 and L1 = 38 mm (J1's width along B1): at most 130 x 38 x 1.25,
    # Qr' <= (2/3) x 0.8 x 7.0 MPa x 6175 mm² x KB 1.00 = 23.1 kN whatever the support length
    assert result.governing.qf > (2 / 3) * 0.8 * 7.0e6 * 0.130 * 0.038 * 1.25
    assert remedies(review, result) == ()
    text = reconcile(review, ()).outcome("B1/C1:B1:near").remedy
    assert text.startswith("No remedy tried passes the check")
    assert "no stronger species of glulam in rule pack o86-2019-recalled" in text


def test_a_longer_bearing_is_never_offered_through_the_next_contact():
    # as above with D 10, L 20 kN at B/P1: Fc,90,d = 1.35 x 10 + 1.5 x 20 = 43.5 kN. The most room P1 has is up to
    # P3's contact at 300 mm, where nothing spreads past P3: 1.0 x 1.5385 MPa x 89 x 300 = 41.1 kN < 43.5 kN
    # (and C30, 2.7 MPa, at 89 mm: 17.6 kN). A length beyond 300 mm would sit on P3: nothing is offered.
    data = contact_model("ec5")
    data["members"].append({"id": "P3", "material": "STEEL", "b": "89 mm", "d": "89 mm", "length": "3 m",
                            "orientation": "vertical"})  # fmt: skip
    data["bearings"].append({"upper": {"member": "B", "at": "344.5 mm"}, "lower": "P3"})
    data["bearings"][0]["calc_force"] = {"D": "10 kN", "L": "20 kN"}
    review = review_dict(data)
    result = review.result_at("B/P1", "B", "local")
    assert result is not None and result.governing.qf == pytest.approx(43500.0)
    assert 1.0 * 0.8 * 2.5e6 / 1.3 * 0.089 * 0.300 < 43500.0
    assert remedies(review, result) == ()
    assert reconcile(review, ()).outcome("B/P1:B").remedy.startswith("No remedy tried passes the check")


def test_a_stronger_species_is_offered_with_the_qf_qr_it_gives():
    # J1 (S-P-F No.2, 38 x 235) on B1 at its end: 38 x 130 mm, KB 1.00 (end), KZcp 1.15 (b/d <= 1).
    # D 3, L 6.5 kN/m over J1's 4 m: 2w at B1, Qf = 1.25 x 6 + 1.5 x 13 = 27.0 kN.
    # S-P-F: Qr = 0.8 x 5.3 MPa x 38 x 130 x 1.15 = 24.09 kN (fails); the next stronger sawn species in the pack,
    # D.Fir-L 7.0 MPa: 31.81 kN, Qf/Qr = 0.85 (Hem-Fir 4.6 and Northern 3.5 MPa are weaker, not tried)
    data = base_model()
    data["loads"][0]["specified"] = {"D": "3 kN/m", "L": "6.5 kN/m"}
    review = review_dict(data)
    result = review.result("J1/B1:J1")
    assert result.governing.qf == pytest.approx(27000.0) and not result.passes
    species = next(t for t in remedies(review, result) if t.what == "species")
    qr = 0.8 * 7.0e6 * 0.038 * 0.130 * 1.15
    assert species.species == "D.Fir-L" and species.result.governing.qr == pytest.approx(qr)
    assert (
        "D.Fir-L (7.00 MPa) for J1 at the present contact (Qf/Qr = 0.85)"
        in reconcile(review, ()).outcome("J1/B1:J1").remedy
    )
