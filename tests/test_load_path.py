"""Rim boards and blocking as the load path: a post above bears on blocking (or a rim) modelled under it, and
one that lands between joists with nothing under it is a comment (no direct bearing path).

Geometry worked by hand in the comments (plan positions of the run's joists: common practice).
"""

from __future__ import annotations

from tests.conftest import review_dict
from tests.test_layout import small


def _post_between_joists(blocking: bool) -> dict:
    data = small()
    data["layout"]["levels"]["L3"] = "6 m"
    data["layout"]["grids"]["x"]["m"] = "0.6 m"
    data["layout"]["grids"]["y"]["n"] = "2 m"
    # joists J-A-B-2 at x = 0.4 m and J-A-B-3 at 0.8 m; the post P9 at (0.6 m, 2 m) stands on level L2 between them
    data["layout"]["posts"].append(
        {"id": "P9", "material": "SPF", "b": "89 mm", "d": "89 mm", "at": "n/m", "base": "L2", "top": "L3"}
    )
    data["loads"] = [{"id": "above", "member": "P9", "type": "point", "specified": {"D": "5 kN", "L": "8 kN"}}]
    if blocking:  # solid blocking between the two joists' faces, joist-deep, over a wall below (continuous)
        data["layout"]["members"].append(
            {"id": "BLK", "material": "SPF", "b": "38 mm", "d": "235 mm", "level": "L2",
             "from": ["0.419 m", "2 m"], "to": ["0.781 m", "2 m"], "support": "continuous"}
        )  # fmt: skip
    return data


def test_a_post_landing_between_joists_with_nothing_under_it_has_no_bearing_path():
    review = review_dict(_post_between_joists(blocking=False))
    assert not [b for b in review.model.bearings if b.upper.member == "P9"]  # the layout finds nothing under it
    [found] = [f for f in review.engine_findings if f.kind == "no-bearing-path"]
    assert found.weight == "revise" and found.member == "P9"
    # hand: 0.6 - 0.4 = 200 mm to J-A-B-2 and 0.8 - 0.6 = 200 mm to J-A-B-3
    assert "J-A-B-2" in found.message and "J-A-B-3" in found.message and "200 mm" in found.message


def test_a_post_on_blocking_bears_on_it_and_the_blocking_is_checked_under_it():
    review = review_dict(_post_between_joists(blocking=True))
    assert not [f for f in review.engine_findings if f.kind == "no-bearing-path"]
    assert "P9/BLK" in review.model.bearings_by_id
    # the blocking under the post: its side grain crushed, 89 mm along it (the post's d) by 38 mm (its b)
    [check] = [c for c in review.checklist.checks if c.id == "P9/BLK:BLK"]
    assert abs(check.contact.length - 0.089) < 1e-9 and abs(check.contact.width - 0.038) < 1e-9


def test_posts_on_their_beams_and_posts_off_the_floor_are_not_flagged():
    assert not [f for f in review_dict(small()).engine_findings if f.kind == "no-bearing-path"]
