"""Float noise never decides: the same building in SI and in US units, or with every load scaled,
gives the same checks, the same combinations and the same governing results.

The US model is written with exact definitions (1 lbf = 4.4482216152605 N, 1 ft = 0.3048 m;
common practice), not with the program's own converter.
"""

from __future__ import annotations

import os

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from tests.conftest import base_model, review_dict

LBF = 4.4482216152605  # N
FUZZ = int(os.environ.get("FUZZ_EXAMPLES", "40"))  # examples per property (the fuzz job sets thousands)
PLF = LBF / 0.3048  # N/m

kn = st.floats(min_value=0.05, max_value=40.0, allow_nan=False)
cases = st.dictionaries(st.sampled_from(["D", "L", "S", "W"]), kn, min_size=1, max_size=4)


def _model(uniform_kn_m: dict, point_kn: dict, us: bool, scale: float = 1.0) -> dict:
    data = base_model()
    # B1 continuous over a third post right under the joist: the joist's reactions then reach
    # C1 and C2 only as rounding noise of the stiffness solution, which must count as nothing
    data["members"].append(
        {"id": "C3", "material": "STEEL", "b": "150 mm", "d": "150 mm", "length": "3 m", "orientation": "vertical"}
    )
    data["bearings"].append({"upper": {"member": "B1", "at": "3 m"}, "lower": "C3"})
    if us:
        line = {c: f"{v * scale * 1000 / PLF!r} plf" for c, v in uniform_kn_m.items()}
        point = {c: f"{v * scale * 1000 / LBF!r} lbf" for c, v in point_kn.items()}
    else:
        line = {c: f"{v * scale!r} kN/m" for c, v in uniform_kn_m.items()}
        point = {c: f"{v * scale!r} kN" for c, v in point_kn.items()}
    data["loads"] = [
        {"id": "floor", "member": "J1", "type": "uniform", "specified": line},
        {"id": "post", "member": "B1", "type": "point", "at": "2 m", "length": "89 mm", "specified": point},
    ]
    return data


def _summary(review):
    return {
        r.check.id: (
            tuple(sorted(c.combination for c in r.combinations)),
            r.governing.combination,
            r.governing.qf,
            r.governing.qr,
            r.uplift,
        )
        for r in review.results
    }


def _same(a: dict, b: dict, factor: float = 1.0) -> None:
    assert a.keys() == b.keys()
    for check_id in a:
        combos_a, gov_a, qf_a, qr_a, up_a = a[check_id]
        combos_b, gov_b, qf_b, qr_b, up_b = b[check_id]
        assert combos_a == combos_b, check_id
        assert up_a == up_b, check_id
        assert qf_b == pytest.approx(qf_a * factor, rel=1e-9, abs=1e-6), check_id
        assert qr_b == pytest.approx(qr_a, rel=1e-9), check_id
        if gov_a != gov_b:  # a tie between combinations may break either way; the numbers may not
            assert qf_b == pytest.approx(qf_a * factor, rel=1e-9, abs=1e-6)


@settings(max_examples=FUZZ, deadline=None)
@given(cases, cases)
def test_the_same_building_in_si_and_us_units_gives_the_same_review(uniform, point):
    _same(
        _summary(review_dict(_model(uniform, point, us=False))), _summary(review_dict(_model(uniform, point, us=True)))
    )


@settings(max_examples=FUZZ, deadline=None)
@given(cases, cases, st.sampled_from([2.0, 3.0, 0.5, 10.0]))
def test_scaling_every_load_scales_every_qf_and_changes_no_combination_set(uniform, point, factor):
    base = _summary(review_dict(_model(uniform, point, us=False)))
    scaled = _summary(review_dict(_model(uniform, point, us=False, scale=factor)))
    _same(base, scaled, factor)


@pytest.mark.parametrize("w", ["2.3 kN/m", "7.7 kN/m", "157.6 plf"])
def test_a_case_that_reaches_a_bearing_only_as_rounding_noise_adds_no_combination(w):
    # Snow on B1's overhang, centred on its right support (5925 mm, +-75 mm): by statics its
    # share at the left support C1 is exactly zero; in floats it is a few 1e-16 kN
    plain = review_dict(base_model()).result("B1/C1:B1")
    data = base_model()
    data["loads"].append(
        {"id": "drift", "member": "B1", "type": "uniform", "from": "5850 mm", "to": "6 m", "specified": {"S": w}}
    )
    noisy = review_dict(data).result("B1/C1:B1")
    assert {c.combination for c in noisy.combinations} == {c.combination for c in plain.combinations}
    assert noisy.uplift == ()


# ---------------------------------------------------------------- fuzzed: ties, light loads, uplift (issue 24)

tiny_to_large = st.floats(min_value=1e-4, max_value=40.0, allow_nan=False)  # kN or kN/m: across the old 1 N
tie_positions = st.sampled_from(["94 mm", "93.99 mm", "94.01 mm", "65 mm", "19 mm", "2 m", "4981 mm", "4.906 m"])
joist_ends = st.sampled_from(["3935 mm", "3936 mm", "3934.99 mm", "3.9 m"])


def _fuzzed_model(cases: dict, suction: float, at_plate: str, at_beam: str, scale: float = 1.0) -> dict:
    """The base frame with J1's end on W1 at a tie position (75 mm from W1's end at 94 mm; W1's end at 4981 mm)
    and its contact on B1 ending at, or a hair from, J1's end; loads of any size, wind suction among them."""
    data = base_model()
    data["bearings"][3]["lower"]["at"] = at_plate
    data["bearings"][2]["upper"]["at"] = at_beam
    specified: dict = {c: f"{v * scale!r} kN/m" for c, v in cases.items()}
    if suction:
        specified["W"] = {"pressure": f"{0.1 * scale!r} kN/m", "suction": f"{suction * scale!r} kN/m"}
    data["loads"] = [{"id": "floor", "member": "J1", "type": "uniform", "specified": specified}]
    return data


fuzz_cases = st.dictionaries(st.sampled_from(["D", "L", "S"]), tiny_to_large, min_size=1, max_size=3)
suctions = st.one_of(st.just(0.0), tiny_to_large)


@pytest.mark.fuzz
@settings(max_examples=FUZZ, deadline=None)
@given(fuzz_cases, suctions, tie_positions, joist_ends)
def test_fuzzed_frames_in_si_and_exact_us_units_give_the_same_checks_factors_and_notes(cases, suction, plate, beam):
    from tests.test_ties_and_thresholds import _summary, in_us_units

    data = _fuzzed_model(cases, suction, plate, beam)
    assert _summary(review_dict(data)) == _summary(review_dict(in_us_units(data)))


@pytest.mark.fuzz
@settings(max_examples=FUZZ, deadline=None)
@given(fuzz_cases, suctions, tie_positions, joist_ends, st.sampled_from([2.0, 3.0, 0.5, 0.1, 10.0, 1000.0]))
def test_fuzzed_frames_with_every_load_scaled_list_the_same_checks_combinations_and_uplift(
    cases, suction, plate, beam, factor
):
    from tests.test_ties_and_thresholds import _listing

    base = _listing(review_dict(_fuzzed_model(cases, suction, plate, beam)))
    assert _listing(review_dict(_fuzzed_model(cases, suction, plate, beam, factor))) == base
