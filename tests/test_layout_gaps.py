"""Layout gaps a new user hit: the calc's labels on found bearings, half-size contacts at centre lines,
and the edge strip an area gives its first member.

Expected values are worked by hand in the comments (plan geometry; tributary widths half way to
each neighbour and an edge member out to the edge: common practice).
"""

from __future__ import annotations

import pytest

from audit.core.errors import InputErrors
from tests.conftest import review_dict
from tests.test_layout import small


def _warnings(review, words: str) -> list[str]:
    return [w for w in review.model.warnings if words in w]


def test_labels_in_the_layout_become_the_aliases_of_the_bearing_it_finds():
    data = small()
    data["layout"]["labels"] = {"BA/C1": ["GB-A at C1"], "J-A-B-2/BA": ["joist 2 on GB-A"]}
    review = review_dict(data)
    assert review.model.bearings_by_id["BA/C1"].aliases == ("GB-A at C1",)
    assert review.model.bearings_by_id["J-A-B-2/BA"].aliases == ("joist 2 on GB-A",)
    assert review.model.bearings_by_id["J-A-B-3/BA"].aliases == ()


def test_a_label_for_a_bearing_the_layout_does_not_find_is_an_error_with_the_near_miss():
    data = small()
    data["layout"]["labels"] = {"BA/C9": ["GB-A at C9"]}
    with pytest.raises(InputErrors) as info:
        review_dict(data)
    lines = info.value.lines()
    assert any("finds no bearing 'BA/C9'" in line and "did you mean" in line for line in lines), lines


def test_a_label_for_a_bearing_given_in_bearings_asks_for_its_aliases_there():
    data = small()
    data["bearings"] = [{"upper": {"member": "BA", "at": "76 mm"}, "lower": "C1"}]
    data["layout"]["labels"] = {"BA/C1": ["GB-A at C1"]}
    with pytest.raises(InputErrors) as info:
        review_dict(data)
    assert any("give its labels there as 'aliases'" in line for line in info.value.lines())


def test_a_beam_stopping_at_the_post_centre_line_is_warned_with_its_half_contact():
    data = small()
    del data["layout"]["members"][0]["extend"]  # BA from A/1 to A/2: its ends on the centres of C1 and C2
    review = review_dict(data)
    # hand: C1 is 152 mm along BA, centred on BA's end: BA overlaps it by 152 / 2 = 76 mm
    assert review.model.bearings_by_id["BA/C1"].upper.length == pytest.approx(0.076)
    found = _warnings(review, "stops at the centre line")
    assert any("start of 'BA'" in w and "'C1'" in w and "76 mm" in w for w in found), found
    assert any("end of 'BA'" in w and "'C2'" in w for w in found), found
    assert not any("'BB'" in w for w in found)  # BB runs 76 mm past both posts: the full post


def test_members_butting_at_one_support_centre_line_are_not_warned():
    data = small()
    data["layout"]["grids"]["x"]["3"] = "4 m"
    members = data["layout"]["members"]
    members[0].update({"extend": ["76 mm", "0 mm"]})  # BA stops on C2's centre line at A/2 ...
    members.append({**members[0], "id": "BA2", "from": "A/2", "to": "A/3", "extend": ["0 mm", "76 mm"]})  # ... BA2 too
    data["layout"]["runs"][0]["last"] = "100 mm"  # the last joist stands clear of the butt joint at A/2
    data["layout"]["posts"].append(
        {"id": "C5", "material": "STEEL", "b": "152 mm", "d": "152 mm", "at": "A/3", "base": "L1", "top": "L2"}
    )
    review = review_dict(data)
    assert review.model.bearings_by_id["BA2/C2"].upper.length == pytest.approx(0.076)  # each takes half of C2
    assert not _warnings(review, "stops at the centre line")


def test_an_edge_joist_taking_half_again_its_neighbours_strip_is_warned():
    data = small()
    data["layout"]["runs"][0]["first"] = "400 mm"  # joists at x = 0.4, 0.8, ... 2.0 m; the area starts at x = 0
    review = review_dict(data)
    loads = {(ld.member, ld.case): ld.magnitude for ld in review.model.loads}
    # hand: J-A-B-1 at 0.4 m takes 0 to 0.6 m = 600 mm; J-A-B-2 0.6 to 1.0 m = 400 mm: 1.50 times
    assert loads[("J-A-B-1", "D")] == pytest.approx(1000.0 * 0.600)
    assert loads[("J-A-B-2", "D")] == pytest.approx(1000.0 * 0.400)
    found = _warnings(review, "takes the strip out to that edge")
    assert len(found) == 1 and "'J-A-B-1'" in found[0] and "1.50 times" in found[0] and "600 mm" in found[0]


def test_an_edge_joist_under_the_threshold_is_not_warned():
    data = small()
    data["layout"]["runs"][0]["first"] = "200 mm"  # J-A-B-1 at 0.2 m takes 0 to 0.4 m: 400 mm, as its neighbour
    review = review_dict(data)
    assert not _warnings(review, "takes the strip out to that edge")
    assert not _warnings(review_dict(small()), "takes the strip out to that edge")  # edge joists on the grid: half
