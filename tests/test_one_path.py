"""Slips, trials and remedies run through the standard's own resistance, with its neighbouring contacts.

Hand values from EN 1995-1-1 6.1.5 (as recalled: from memory, verify): lef = l + min(30 mm, a, l1/2, l) each side;
kc,90 = 1.0 where the next contact is closer than 2h; 1.5 for solid softwood on discrete supports otherwise;
fc,90,d = kmod fc,90,k / gamma_M = 0.8 x 2.5 / 1.3 MPa (C24, medium term).
"""

from __future__ import annotations

import pytest

from audit.review.remedies import recheck
from audit.review.slips import qr_slips
from tests.conftest import review_dict
from tests.verification.standards import contact_model

FC90D = 0.8 * 2.5e6 / 1.3


def _beside_a_close_post():
    # B (C24, 89 x 235) on P1 at its end, P3 300 mm along: the clear distance 211 mm is under 2h = 470 mm
    data = contact_model("ec5")
    data["members"].append({"id": "P3", "material": "STEEL", "b": "89 mm", "d": "89 mm", "length": "3 m",
                            "orientation": "vertical"})  # fmt: skip
    data["bearings"].append({"upper": {"member": "B", "at": "344.5 mm"}, "lower": "P3"})
    data["bearings"][0]["calc_force"] = {"D": "6 kN", "L": "12 kN"}  # 1.35G+1.5Q governs: kmod 0.8 (medium)
    review = review_dict(data)
    result = review.result_at("B/P1", "B", "local")
    assert result is not None
    return review, result


def test_an_ec5_check_beside_a_close_contact_keeps_kc90_1_and_the_30_mm_towards_it():
    _, result = _beside_a_close_post()
    # lef = 89 + 0 (the member end) + 30 (half the gap, 105.5 mm, is more) = 119 mm
    assert result.governing.qr == pytest.approx(1.0 * FC90D * 0.089 * 0.119, rel=1e-9)
    assert result.inputs.value("kc,90") == 1.0


def test_ec5_slips_are_recomputed_from_the_checks_own_inputs_beside_its_neighbours():
    review, result = _beside_a_close_post()
    slips = {s.name: s.value for s in qr_slips(result, review)}
    # kc,90 1.5 taken although P3 is within 2h: on the same Aef of 89 x 119 mm
    assert slips["kc90-discrete-not-allowed"] == pytest.approx(1.5 * FC90D * 0.089 * 0.119, rel=1e-9)
    # the contact without its 30 mm: 89 x 89 mm at kc,90 1.0
    assert slips["no-effective-length"] == pytest.approx(1.0 * FC90D * 0.089 * 0.089, rel=1e-9)


def test_a_trial_of_the_check_is_the_standards_own_check_with_its_neighbours():
    review, result = _beside_a_close_post()
    again = recheck(review, result.check)
    assert again.governing.qr == pytest.approx(result.governing.qr, rel=1e-12)
    assert again.inputs.value("kc,90") == 1.0  # alone, B on P1 would take kc,90 1.5
