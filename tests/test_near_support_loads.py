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
