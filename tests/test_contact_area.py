"""The contact area on each side of a bearing, against hand derivations.

Factor values are the rule pack's (from memory of CSA O86: verify). Every area below is
worked by hand from the framing: along a member's grain, the bearing length on it; across
its grain, the lesser of its own width b and the other member's extent across it.
"""

from __future__ import annotations

import pytest

from audit.core.errors import InputErrors
from tests.conftest import review_dict
from tests.verification.details import BIRDSMOUTH, SEAT
from tests.verification.details import roof as _roof

REL = 1e-9


def _qr(review, check_id: str) -> float:
    return review.result(check_id).governing.qr


def test_rafter_on_half_a_ridge_bears_on_its_own_width_not_the_seat_length():
    review = review_dict(_roof(SEAT, BIRDSMOUTH))
    # rafter: Ab = 38 (its own b) x 65 (seat along its grain) = 2470 mm^2; seat runs to the
    # rafter end, so KB = 1.0; KZcp = 1.15 (38/184 <= 1.0); S-P-F fcp 5.3 MPa
    assert _qr(review, "R/G:R") == pytest.approx(0.8 * 5.3e6 * (0.038 * 0.065) * 1.0 * 1.15, rel=REL)
    assert review.result("R/G:R").inputs.area == pytest.approx(0.038 * 0.065, rel=REL)


def test_ridge_under_a_half_width_seat_bears_on_the_seat_not_its_full_width():
    review = review_dict(_roof(SEAT, BIRDSMOUTH))
    # ridge: along its grain the rafter's 38 mm; across it only the 65 mm seat, not b = 130 mm.
    # KB(38 mm) = 1.25 at 3 m from either end; glulam takes no KZcp; fcp 7.0 MPa
    assert _qr(review, "R/G:G") == pytest.approx(0.8 * 7.0e6 * (0.038 * 0.065) * 1.25, rel=REL)


def test_a_stated_seat_width_on_the_bearing_never_widens_the_rafter():
    stated = review_dict(_roof(SEAT, BIRDSMOUTH, bearing_width="65 mm"))
    # width 65 mm across the rafter is more than the rafter's 38 mm: the rafter's own b governs
    assert stated.result("R/G:R").inputs.area == pytest.approx(0.038 * 0.065, rel=REL)
    assert stated.result("R/G:G").inputs.area == pytest.approx(0.038 * 0.065, rel=REL)


def test_birdsmouth_seat_area_on_rafter_and_plate_by_hand():
    review = review_dict(_roof(SEAT, BIRDSMOUTH))
    # rafter: 89 mm seat x 38 mm = 3382 mm^2, at the rafter end (KB 1.0), KZcp 1.15
    assert _qr(review, "R/W:R") == pytest.approx(0.8 * 5.3e6 * (0.089 * 0.038) * 1.15, rel=REL)
    # plate: 38 mm along it, 89 mm across it (the seat), not its full 140 mm; KB(38) = 1.25;
    # KZcp 1.00 for the plate laid flat (140/38 = 3.7 >= 2.0)
    assert _qr(review, "R/W:W") == pytest.approx(0.8 * 5.3e6 * (0.038 * 0.089) * 1.25 * 1.00, rel=REL)


def test_glulam_on_a_cap_plate_wider_than_itself_bears_on_its_own_width():
    review = review_dict(_roof(SEAT, BIRDSMOUTH))
    # 152 x 152 cap plate under a 130 mm beam: Ab = 130 x 152; KB = 1.0 (152 mm > 150 mm)
    assert _qr(review, "G/C1:G") == pytest.approx(0.8 * 7.0e6 * (0.130 * 0.152) * 1.0, rel=REL)


def test_explain_says_where_each_dimension_came_from():
    review = review_dict(_roof(SEAT, BIRDSMOUTH))
    ridge = review.result("R/G:G").area_reason
    assert "seat length stated on R" in ridge and "b of G, 130 mm" in ridge
    plate = review.result("G/C1:G").area_reason
    assert "b of G" in plate and "stated plate or seat width, 152 mm" in plate


def test_a_seat_width_wider_than_its_member_is_an_input_error_with_its_location():
    data = _roof(SEAT, BIRDSMOUTH)
    data["bearings"][3]["lower"]["width"] = "150 mm"  # the plate W is only 140 mm wide
    with pytest.raises(InputErrors) as caught:
        review_dict(data)
    text = str(caught.value)
    assert "bearings[3].lower.width" in text and "wider than member 'W'" in text


def test_a_crossing_contact_longer_than_the_member_on_it_is_an_input_error():
    data = _roof(SEAT, BIRDSMOUTH)
    data["bearings"][3]["lower"]["length"] = "89 mm"  # along W, but the rafter on it is 38 mm wide
    with pytest.raises(InputErrors) as caught:
        review_dict(data)
    text = str(caught.value)
    assert "bearings[3].lower.length" in text and "38 mm width of 'R'" in text
