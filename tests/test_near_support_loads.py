"""Which loads and which bearing lengths enter a near-support check, against hand derivations.

The readings are the rule pack's: the default is the conservative one, the other is chosen
by name in the project; the numbers are worked by hand in tests/verification/details.py.
"""

from __future__ import annotations

import pytest

from audit.engine.contacts import separate_bearings
from tests.conftest import review_dict
from tests.verification.details import (
    QF_POST_AND_JOIST,
    QR_LONGEST_SINGLE,
    QR_SUMMED,
    beam_with_post_and_joist,
)

REL = 1e-9
NEAR = "B/C1:B:near"


def test_separate_bearings_within_d_take_l2_from_the_longest_single_bearing_by_default():
    r = review_dict(beam_with_post_and_joist()).result(NEAR)
    assert r.governing.qf == pytest.approx(QF_POST_AND_JOIST, rel=REL)  # both loads, not only the post
    assert r.governing.qr == pytest.approx(QR_LONGEST_SINGLE, rel=REL)
    assert "(140 + 152)/2" in r.area_reason and "L2 from the longest single bearing" in r.area_reason


def test_the_summed_reading_adds_the_lengths_of_separate_bearings():
    review = review_dict(beam_with_post_and_joist(readings={"near_support.opposite_bearings": "summed"}))
    r = review.result(NEAR)
    assert r.governing.qr == pytest.approx(QR_SUMMED, rel=REL)


def test_bearings_that_touch_count_as_one_bearing():
    # the joist moved to 300 + 70 + 19 = 389 mm: its 38 mm face starts where the post's 140 mm face ends
    r = review_dict(beam_with_post_and_joist(joist_at="389 mm")).result(NEAR)
    # L2 candidate 178 mm (one bearing); L1 = 152 (support), L2 = 178 <= 1.5 x 152
    assert r.governing.qr == pytest.approx(QR_SUMMED, rel=REL)


def test_separate_bearings_merge_only_where_they_overlap_or_touch():
    from audit.engine.contacts import Contact

    def face(start_mm: float, length_mm: float) -> Contact:
        return Contact("x", length_mm / 1000, 0.1, 1.0, None, "", "", start_mm / 1000)

    lengths = [round(length * 1000, 6) for length, _ in separate_bearings((face(0, 140), face(140, 38), face(400, 38)))]
    assert lengths == [178.0, 38.0]
    overlapping = separate_bearings((face(0, 140), face(100, 89)))
    assert [round(length * 1000, 6) for length, _ in overlapping] == [189.0]


def test_a_distributed_load_within_d_is_counted_in_qf_prime_by_default():
    r = review_dict(beam_with_post_and_joist(udl=True)).result(NEAR)
    # the wall load from the beam end to d = 608 mm past the support centre at 76 mm: 684 mm x 2 kN/m, D
    assert r.governing.qf == pytest.approx(QF_POST_AND_JOIST + 1.25 * 2e3 * 0.684, rel=REL)
    assert "684 mm of wall" in r.check.why


def test_the_bearings_only_reading_leaves_distributed_loads_out():
    data = beam_with_post_and_joist(udl=True, readings={"near_support.distributed_loads": "bearings_only"})
    r = review_dict(data).result(NEAR)
    assert r.governing.qf == pytest.approx(QF_POST_AND_JOIST, rel=REL)


def test_a_slip_names_the_distributed_load_left_out_of_qf_prime():
    from tests.conftest import reconcile_dicts

    claim = {"location": "B/C1", "member": "B", "kind": "near-support", "Qf": f"{QF_POST_AND_JOIST / 1000} kN"}
    _, _, rec = reconcile_dicts(beam_with_post_and_joist(udl=True), [claim])
    out = rec.outcome(NEAR)
    assert [s.name for s in out.qf.slips] == ["distributed-load-left-out"]


def test_the_memo_states_the_readings_in_force():
    from audit.report.memo import assumptions

    review = review_dict(beam_with_post_and_joist(readings={"near_support.opposite_bearings": "summed"}))
    text = "\n".join(assumptions(review))
    assert "[reading summed]" in text and "[reading within_d]" in text and "[reading per_ply]" in text


def test_a_reading_the_pack_does_not_have_is_an_input_error():
    from audit.core.errors import InputErrors

    with pytest.raises(InputErrors) as caught:
        review_dict(beam_with_post_and_joist(readings={"near_support.opposite_bearings": "average"}))
    assert "project.readings.near_support.opposite_bearings" in str(caught.value)
    with pytest.raises(InputErrors) as caught:
        review_dict(beam_with_post_and_joist(readings={"near_support.oposite_bearings": "summed"}))
    assert "did you mean 'near_support.opposite_bearings'" in str(caught.value)


# ---------------------------------------------------------------- side-by-side seats (hand values in details.py)


def test_rafters_from_both_sides_on_half_the_ridge_each_form_one_bearing_of_their_summed_width():
    from tests.verification.details import (
        QF_TWO_RAFTERS,
        QR_ONE_SEAT_WIDTH,
        QR_SIDE_BY_SIDE,
        ridge_with_rafters_both_sides,
    )

    r = review_dict(ridge_with_rafters_both_sides()).result("G/C1:G:near")
    assert r.governing.qf == pytest.approx(QF_TWO_RAFTERS, rel=REL)  # both rafters' loads within d
    assert r.governing.qr == pytest.approx(QR_SIDE_BY_SIDE, rel=REL)  # b = 65 + 65 = 130 mm, not one seat's 65
    assert r.governing.qr != pytest.approx(QR_ONE_SEAT_WIDTH, rel=1e-3)
    assert r.passes and "side by side across the member: one bearing 130 mm wide" in r.area_reason


def test_seats_that_do_not_overlap_along_the_member_stay_separate_bearings_of_their_own_width():
    from tests.verification.details import ridge_with_rafters_both_sides

    data = ridge_with_rafters_both_sides()
    data["bearings"][4]["lower"]["at"] = "400 mm"  # R2 100 mm from R: a clear gap, not side by side
    r = review_dict(data).result("G/C1:G:near")
    # O86 6.5.6.3 as recalled, by hand: b = the least width, 65 mm; L1 = 38, L2 = 152 capped at 57 mm
    assert r.governing.qr == pytest.approx((2 / 3) * 0.8 * 7.0e6 * 0.065 * (0.038 + 0.057) / 2, rel=REL)
    assert "side by side" not in r.area_reason


def test_side_by_side_seats_wider_together_than_the_member_are_capped_at_its_width():
    from tests.verification.details import QR_SIDE_BY_SIDE, SEAT, ridge_with_rafters_both_sides

    data = ridge_with_rafters_both_sides()
    data["members"].append({"id": "R3", "material": "SPF", "b": "38 mm", "d": "184 mm", "length": "4 m"})
    data["members"].append({"id": "W3", "material": "SPF", "b": "140 mm", "d": "38 mm", "length": "5 m",
                            "support": "continuous"})  # fmt: skip
    data["bearings"] += [
        {"id": "R3/G", "upper": {"member": "R3", "at": "3967.5 mm", **SEAT}, "lower": {"member": "G", "at": "300 mm"}},
        {"id": "R3/W3", "upper": {"member": "R3", "at": "44.5 mm"}, "lower": {"member": "W3", "at": "2 m"}},
    ]
    r = review_dict(data).result("G/C1:G:near")
    # three 65 mm seats sum to 195 mm: b of Ab' is capped at the ridge's own 130 mm (common practice)
    assert r.governing.qr == pytest.approx(QR_SIDE_BY_SIDE, rel=REL)
    assert "one bearing 195 mm wide (65 + 65 + 65 mm over 38 mm), taken as 130 mm" in r.area_reason


def test_partly_overlapping_seats_count_with_their_true_total_area():
    from audit.engine.contacts import Contact, face_bearings

    # two 38 mm x 65 mm seats offset 19 mm along the member: one bearing 57 mm long whose width keeps the
    # true area, 2 x 38 x 65 / 57 = 86.7 mm (hand arithmetic), not 130 mm
    a = Contact("a", 0.038, 0.065, 1.0, None, "", "", 1.000)
    b = Contact("b", 0.038, 0.065, 1.0, None, "", "", 1.019)
    (one,) = face_bearings((a, b))
    assert one.length == pytest.approx(0.057) and one.width == pytest.approx(2 * 0.038 * 0.065 / 0.057)
    assert one.side_by_side
