"""A plate on studs takes its loads on every bay unless the model asks for pattern loading; uplift notes.

Outside checks: anastruct (PyPI, a general-purpose frame solver) for the plate's stud reactions;
the O86 pack's note threshold (0.5 kN, common practice) by hand.
"""

from __future__ import annotations

import pytest

from tests.conftest import review_dict
from tests.verification.cases import _anastruct_reactions
from tests.verification.details import STUD_CENTRES, beam_on_posts, snow_on_stud_plate


def test_studs_stand_where_the_hand_placing_puts_them():
    # 19 mm flush start, + 406 mm while a 38 mm stud fits in 2.4 m, and the end stud at 2400 - 19 mm
    review = review_dict(snow_on_stud_plate())
    at = sorted(b.upper.at for b in review.model.bearings if b.upper.member == "WP")
    assert at == pytest.approx(STUD_CENTRES, abs=1e-9)


def test_a_plate_on_studs_is_not_patterned_and_has_no_uplift_by_default():
    review = review_dict(snow_on_stud_plate())
    assert not review.flow.envelopes
    assert not [f for f in review.engine_findings if f.kind == "uplift"]
    # every bay loaded, by anastruct: the end stud takes its share of D and S
    dead = _anastruct_reactions(STUD_CENTRES, [], [(0.0, 2.4, 300.0)])
    snow = _anastruct_reactions(STUD_CENTRES, [], [(0.0, 2.4, 3000.0)])
    end = review.flow.bearing_forces["WP/WP.stud7"]
    assert end["D"] == pytest.approx(dead[-1], rel=1e-6)
    assert end["S"] == pytest.approx(snow[-1], rel=1e-6)
    # the least force through the end stud is 0.9 D (dead load counteracting), downward
    low = min(c.qf_low for c in review.result("WP/WP.stud7:WP").combinations)
    assert low == pytest.approx(0.9 * dead[-1], rel=1e-6)


def test_a_plate_patterned_on_request_takes_snow_bay_by_bay():
    review = review_dict(snow_on_stud_plate(patterned=True))
    env = review.flow.envelopes["WP/WP.stud7"]["S"]
    # by anastruct: snow at 0.5 on the bays where it lowers the end stud's reaction, 1.0 where it raises it
    pieces = list(zip([0.0, *STUD_CENTRES], [*STUD_CENTRES, 2.4], strict=True))
    shares = [_anastruct_reactions(STUD_CENTRES, [], [(a, b, 3000.0)])[-1] for a, b in pieces]
    assert env.low == pytest.approx(sum(min(r, 0.5 * r) for r in shares), rel=1e-6)
    assert env.high == pytest.approx(sum(max(r, 0.5 * r) for r in shares), rel=1e-6)
    # live load on alternate bays lifts the studs by a few tens of newtons: notes below the pack's 0.5 kN
    uplift = [f for f in review.engine_findings if f.kind == "uplift"]
    assert uplift and {f.severity for f in uplift} == {"record"}
    assert all(-f.numbers["qf"] < 500.0 for f in uplift)


def test_a_layout_walls_plate_and_sole_are_patterned_only_on_request():
    from tests.test_layout import _stacked_walls

    data = _stacked_walls(sole=True)
    data["loads"][0]["specified"]["S"] = "3 kN/m"
    review = review_dict(data)
    assert not review.model.members["WU"].patterned and not review.model.members["WU.sole"].patterned
    assert not [b for b in review.flow.envelopes if b.startswith(("WU/", "WU.sole/"))]
    data["layout"]["walls"][0]["studs"]["patterned"] = True
    review = review_dict(data)
    assert review.model.members["WU"].patterned and review.model.members["WU.sole"].patterned
    assert "S" in review.flow.envelopes["WU/WU.stud1"]


def test_the_patterned_key_must_be_true_or_false():
    from audit.core.errors import InputError

    with pytest.raises(InputError, match="expected true or false"):
        review_dict(snow_on_stud_plate(patterned="yes"))  # type: ignore[arg-type]


def test_every_bundled_resistance_pack_notes_small_uplift_below_a_common_practice_threshold():
    from audit.standards.catalogue import load_all_packs

    packs = load_all_packs()[0]
    # 0.5 kN (O86, EC5) and 0.1 kip = 0.445 kN (NDS): about what ordinary framing nails hold (common practice)
    expected = {"o86-2019-recalled": 500.0, "ec5-2004-recalled": 500.0, "nds-2018-recalled": 0.1 * 4448.2216}
    for pack_id, value in expected.items():
        threshold = packs[pack_id].uplift_note_below
        assert threshold.value == pytest.approx(value, rel=1e-6)
        assert threshold.status == "common practice"
    assert set(expected) == set(packs)


def test_small_uplift_is_for_the_record_and_large_uplift_a_finding_under_the_o86_pack():
    # three-moment equation, spans 2 m and 4 m: R1 = wD L1/2 - wD (L1^3 + L2^3)/(8 (L1 + L2) L1) with D on both
    # spans, R1 = -wL L2^3/(8 (L1 + L2) L1) with L on span 2 alone; uplift = 0.9 D + 1.5 L
    def uplift(live: str) -> tuple[float, str]:
        found = [f for f in review_dict(beam_on_posts([2.0, 4.0], live=live, dead="0.5 kN/m")).engine_findings]
        f = next(f for f in found if f.kind == "uplift")
        return f.numbers["qf"], f.severity

    dead = 500.0 * 2.0 / 2 - 500.0 * (2.0**3 + 4.0**3) / (8 * 6.0) / 2.0
    small, severity = uplift("0.4 kN/m")
    assert small == pytest.approx(0.9 * dead - 1.5 * 400.0 * 4.0**3 / (8 * 6.0) / 2.0, rel=1e-6)  # -287.5 N
    assert severity == "record"  # held by the ordinary nailing: for the record, nothing asked
    large, severity = uplift("6 kN/m")
    assert large == pytest.approx(0.9 * dead - 1.5 * 6000.0 * 4.0**3 / (8 * 6.0) / 2.0, rel=1e-6)  # -5.89 kN
    assert severity == "revise"
