"""Plates on stud walls: the studs and packs placed from the short form, and the checks over them.

Hand values are worked in tests/verification/details.py (pack values from memory: verify).
"""

from __future__ import annotations

import pytest

from audit.core.errors import InputErrors
from tests.conftest import base_model, review_dict
from tests.verification.details import (
    QF_POST_ON_WALL,
    QR_PLATE_ON_PACK,
    QR_PLATE_SQUEEZE,
    QR_POST_ON_PLATE,
    post_on_stud_wall,
)

REL = 1e-9


def _posts(review) -> list[tuple[str, float]]:
    return sorted(
        (
            (b.lower.member, round((b.upper.at or 0.0) * 1000, 6))
            for b in review.model.bearings
            if b.upper.member == "WP"
        ),
        key=lambda p: p[1],
    )


def test_studs_are_placed_at_their_spacing_with_an_end_stud_and_a_pack_replacing_the_one_it_covers():
    # 2400 mm plate, 38 mm studs at 406 mm from 19 mm: 19, 425, 831, 1237, 1643, 2049, and an end
    # stud at 2381; the 3-stud pack (1143 to 1257 mm) covers the stud at 1237 mm
    assert _posts(review_dict(post_on_stud_wall())) == [
        ("WP.stud1", 19.0),
        ("WP.stud2", 425.0),
        ("WP.stud3", 831.0),
        ("WP.pack1", 1200.0),
        ("WP.stud4", 1643.0),
        ("WP.stud5", 2049.0),
        ("WP.stud6", 2381.0),
    ]


def test_the_plate_is_checked_over_the_pack_and_squeezed_between_post_and_pack():
    review = review_dict(post_on_stud_wall())
    on_pack = review.result("WP/WP.pack1:WP")
    squeeze = review.result("WP/WP.pack1:WP:near")
    assert on_pack.governing.qf == pytest.approx(QF_POST_ON_WALL, rel=1e-6)  # all of the post, to the pack
    assert on_pack.governing.qr == pytest.approx(QR_PLATE_ON_PACK, rel=REL)
    assert squeeze.governing.qf == pytest.approx(QF_POST_ON_WALL, rel=1e-6)
    assert squeeze.governing.qr == pytest.approx(QR_PLATE_SQUEEZE, rel=REL)
    assert review.result("P/WP:WP").governing.qr == pytest.approx(QR_POST_ON_PLATE, rel=REL)


def test_the_hidden_squeeze_check_governs_the_detail():
    review = review_dict(post_on_stud_wall())
    worst = max((r for r in review.results if r.check.member == "WP"), key=lambda r: r.governing.utilisation)
    assert worst.check.id == "WP/WP.pack1:WP:near"
    # by hand: 42.5 / 53.0 against 42.5 / 72.5 over the pack and 42.5 / 84.8 under the post
    assert worst.governing.utilisation == pytest.approx(QF_POST_ON_WALL / QR_PLATE_SQUEEZE, rel=1e-6)


def test_a_pack_given_by_width_bears_on_that_width():
    data = post_on_stud_wall(packs=[{"at": "1.2 m", "width": "89 mm"}])
    r = review_dict(data).result("WP/WP.pack1:WP")
    assert r.inputs.area == pytest.approx(0.089 * 0.140, rel=REL)


def test_studs_are_posts_on_end_grain_and_get_no_check_of_their_own():
    review = review_dict(post_on_stud_wall())
    exempt = {e.member for e in review.checklist.exempt}
    assert {"WP.stud1", "WP.pack1"} <= exempt


def test_packs_that_overlap_are_an_input_error_with_their_location():
    data = post_on_stud_wall(packs=[{"at": "1.2 m", "studs": 3}, {"at": "1.25 m", "studs": 2}])
    with pytest.raises(InputErrors) as caught:
        review_dict(data)
    assert "members[0].studs.packs[1]" in str(caught.value) and "overlap" in str(caught.value)


def test_a_stud_wall_needs_the_stud_thickness_and_spacing():
    data = post_on_stud_wall()
    del data["members"][0]["studs"]["spacing"]
    with pytest.raises(InputErrors) as caught:
        review_dict(data)
    assert "members[0].studs.spacing" in str(caught.value)


def test_a_point_load_on_a_plate_continuous_on_an_unseen_wall_is_noted_as_not_checked():
    review = review_dict(base_model())  # J1 lands on W1, modelled as continuous with nothing below
    notes = [f for f in review.engine_findings if f.kind == "not-checked"]
    assert [n.member for n in notes] == ["W1"]
    assert "J1/W1 at 2000 mm" in notes[0].message and "support: studs" in notes[0].message


def test_a_sill_continuous_on_concrete_is_not_noted():
    data = base_model()
    data["materials"]["CONC"] = {"family": "concrete"}
    data["members"][4]["bears_on"] = "CONC"
    assert not [f for f in review_dict(data).engine_findings if f.kind == "not-checked"]
