"""Minimum bearing lengths: a check kind of its own, by the length at each end of a joist or beam.

The minimums are the recalled code values of rules/minimum-bearing-recalled.yaml (from memory:
verify): NBC 9.23.8.1 beams 89 mm, NBC 9.23.9.1 joists 38 mm (O86 projects); IRC R502.6 1.5 in on
wood or metal, 3 in on masonry or concrete (NDS projects). Each test works its contact length by
hand from the geometry and compares it with the value as recalled, written out here (never read
from the data file), so a changed value in the data fails a test.
"""

from __future__ import annotations

import pytest

from audit.standards.minimum_bearing import bundled_minimums, minimum_for
from tests.conftest import base_model, review_dict
from tests.test_layout import small


def _short(review) -> list:
    return [f for f in review.engine_findings if f.kind == "short-bearing"]


def test_the_recalled_minimums_are_the_code_values_as_remembered():
    # from memory of NBC Part 9 and IRC R502.6 (verify against the edition in force)
    assert minimum_for("o86", "beam", "wood").length == pytest.approx(0.089)
    assert minimum_for("o86", "joist", "wood").length == pytest.approx(0.038)
    assert minimum_for("nds", "joist", "wood").length == pytest.approx(1.5 * 0.0254)
    assert minimum_for("nds", "beam", "masonry").length == pytest.approx(3 * 0.0254)
    assert minimum_for("ec5", "beam", "wood") is None  # no code minimum recalled for EN 1995
    assert all(m.status == "from memory: verify" for rules in bundled_minimums().values() for m in rules)


def test_a_beam_end_on_75_mm_of_post_is_shorter_than_the_89_mm_minimum():
    data = base_model()
    data["bearings"][0]["upper"]["length"] = "75 mm"  # B1 on C1: 75 mm along B1, by hand < 89 mm (NBC 9.23.8.1)
    found = _short(review_dict(data))
    assert [(f.bearing, f.member) for f in found] == [("B1/C1", "B1")]
    assert found[0].numbers == pytest.approx({"length": 0.075, "minimum": 0.089})
    assert found[0].weight == "revise" and "89 mm" in found[0].message and "NBC 9.23.8.1" in found[0].clause


def test_a_beam_on_the_full_post_meets_the_minimum():
    assert not _short(review_dict(base_model()))  # B1 on 150 mm posts: 150 mm >= 89 mm


def _joists_on(beam_width: str) -> dict:
    data = small()
    for m in data["layout"]["members"]:
        m["b"] = beam_width
    del data["layout"]["runs"][0]["extend"]  # each joist end on its beam's centre line: half the beam's width
    return data


def test_joists_on_half_a_70_mm_beam_are_short_of_the_38_mm_minimum():
    found = _short(review_dict(_joists_on("70 mm")))
    # hand: half of 70 mm = 35 mm < 38 mm (NBC 9.23.9.1), at both ends of each of the 6 joists
    assert len(found) == 12 and {f.member for f in found} == {f"J-A-B-{n}" for n in range(1, 7)}
    assert found[0].numbers == pytest.approx({"length": 0.035, "minimum": 0.038})


def test_joists_on_half_a_76_mm_beam_tie_the_38_mm_minimum_and_pass():
    assert not _short(review_dict(_joists_on("76 mm")))  # 38 mm = 38 mm: a tie at 0.01 mm is not shorter


def _nds_beam_on_concrete(length: str) -> dict:
    return {
        "project": {"title": "NDS minimum bearing (fictional)", "rule_pack": "nds-2018-recalled",
                    "combinations": "asce7-16-asd-recalled", "date": "2026-01-15"},
        "materials": {"DF2": {"family": "sawn_lumber", "species": "Douglas Fir-Larch", "grade": "No.2"},
                      "CONC": {"family": "concrete"}},
        "members": [
            {"id": "B1", "material": "DF2", "b": "3.5 in", "d": "11.25 in", "length": "12 ft"},
            {"id": "P1", "material": "CONC", "b": "8 in", "d": "8 in", "length": "3 ft", "orientation": "vertical"},
            {"id": "P2", "material": "CONC", "b": "8 in", "d": "8 in", "length": "3 ft", "orientation": "vertical"},
        ],
        "bearings": [
            {"upper": {"member": "B1", "at": "2 in", "length": length}, "lower": "P1"},
            {"upper": {"member": "B1", "at": "142 in"}, "lower": "P2"},
        ],
        "loads": [{"member": "B1", "type": "uniform", "specified": {"D": "200 plf", "L": "400 plf"}}],
    }  # fmt: skip


def test_an_nds_beam_on_concrete_needs_3_in_at_its_end():
    found = _short(review_dict(_nds_beam_on_concrete("2.5 in")))
    # hand: 2.5 in < 3 in on masonry or concrete (IRC R502.6, as recalled); P2's 8 in meets it
    assert [(f.bearing, f.clause) for f in found] == [("B1/P1", "IRC R502.6")]
    assert "2.50 in" in found[0].message and "3.00 in" in found[0].message
    assert not _short(review_dict(_nds_beam_on_concrete("3 in")))
