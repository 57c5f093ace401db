"""A bearing's force as the calc gives it: the take-down is skipped for it, and compared where the model has loads.

Hand values: the base model's joist J1 (4 m, on B1 at 3.935 m and W1 at 65 mm) carries 1 kN/m D and
2 kN/m L; B1 spans 75 mm to 5925 mm with J1 at its middle (3 m), so each post takes half of J1's
force. Statics of a simple span, common practice.
"""

from __future__ import annotations

import pytest

from audit.core.errors import InputErrors
from tests.conftest import base_model, review_dict
from tests.test_layout import small


def _with_force(forces: dict) -> dict:
    data = base_model()
    data["bearings"][2]["calc_force"] = forces
    return data


def test_the_calc_force_replaces_the_take_down_at_its_bearing_and_passes_down_as_given():
    review = review_dict(_with_force({"D": "1.5 kN", "L": "4 kN"}))
    assert review.flow.bearing_forces["J1/B1"] == {"D": 1500.0, "L": 4000.0}
    # B1 carries the stated force at its middle: half to each post
    assert review.flow.bearing_forces["B1/C1"]["D"] == pytest.approx(750.0)
    assert review.flow.bearing_forces["B1/C2"]["L"] == pytest.approx(2000.0)
    local = review.result_at("J1/B1", "B1", "local")
    # 1.25 x 1.5 + 1.5 x 4 = 7.875 kN
    assert local is not None and local.governing.qf == pytest.approx(7875.0)


def test_a_calc_force_far_from_the_models_loads_is_a_comment_and_a_near_one_only_a_note():
    # the model's loads give J1/B1 about D 2.0 kN, L 4.0 kN (w L / 2 with the supports 3.87 m apart)
    far = review_dict(_with_force({"D": "1.2 kN", "L": "4 kN"}))
    kinds = {(f.kind, f.severity) for f in far.engine_findings if f.bearing == "J1/B1"}
    assert ("force-differs", "revise") in kinds and ("calc-force", "record") in kinds
    message = next(f.message for f in far.engine_findings if f.kind == "force-differs")
    assert "D by " in message
    near = review_dict(_with_force({"D": "2.0 kN", "L": "4.0 kN"}))
    assert {f.kind for f in near.engine_findings if f.bearing == "J1/B1"} == {"calc-force"}


def test_a_calc_force_higher_than_the_models_loads_is_a_minor_comment():
    review = review_dict(_with_force({"D": "3.5 kN", "L": "4 kN"}))
    found = [f for f in review.engine_findings if f.kind == "force-differs"]
    assert [f.severity for f in found] == ["clarify"]


def test_a_run_states_the_calcs_force_at_the_bearings_on_one_span_line():
    data = small()
    data["layout"]["runs"][0]["calc_force"] = {"A": {"D": "0.5 kN", "L": "1 kN"}}
    review = review_dict(data)
    on_a = review.model.bearings_by_id["J-A-B-2/BA"]
    on_b = review.model.bearings_by_id["J-A-B-2/BB"]
    assert dict(on_a.calc_force) == {"D": 500.0, "L": 1000.0} and on_b.calc_force == ()


def test_a_calc_force_at_an_end_the_run_does_not_have_is_refused_with_its_place():
    data = small()
    data["layout"]["runs"][0]["calc_force"] = {"C": {"D": "0.5 kN"}}
    with pytest.raises(InputErrors) as info:
        review_dict(data)
    assert any("calc_force: 'C' is not an end here" in line and "(ends: A, B)" in line for line in info.value.lines())


def test_a_calc_force_in_a_case_the_combinations_lack_is_refused():
    with pytest.raises(InputErrors) as info:
        review_dict(_with_force({"X": "1 kN"}))
    assert any("unknown key 'X' in calc_force" in line for line in info.value.lines())
