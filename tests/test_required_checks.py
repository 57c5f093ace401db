"""Which checks the design requires, and which members are left out and why."""

from __future__ import annotations

import pytest

from tests.conftest import base_model, review_dict


def _ids(review):
    return {r.check.id for r in review.results}


def _with_post_on_plate() -> dict:
    """The base frame with a timber post P9 standing on the plate W1."""
    data = base_model()
    data["materials"]["DF"] = {"family": "timber", "species": "D.Fir-L", "grade": "No.1"}
    data["members"].append(
        {"id": "P9", "material": "DF", "b": "140 mm", "d": "140 mm", "length": "2 m", "orientation": "vertical"}
    )
    data["bearings"].append({"upper": "P9", "lower": {"member": "W1", "at": "4 m"}})
    data["loads"].append({"id": "on-P9", "member": "P9", "type": "point", "specified": {"D": "5 kN"}})
    return data


def test_a_bearing_no_load_passes_through_needs_no_check_and_says_so():
    data = _with_post_on_plate()
    data["loads"].pop()
    review = review_dict(data)
    reasons = {(e.bearing, e.member): e.reason for e in review.checklist.exempt}
    assert "no load" in reasons[("P9/W1", "W1")]
    assert "P9/W1:W1" not in _ids(review)


def test_both_members_of_a_timber_contact_get_their_own_local_check():
    ids = _ids(review_dict(base_model()))
    assert {"J1/B1:B1", "J1/B1:J1", "J1/W1:W1", "J1/W1:J1"} <= ids


def test_steel_and_end_grain_members_are_listed_with_a_reason():
    data = _with_post_on_plate()
    review = review_dict(data)
    reasons = {(e.bearing, e.member): e.reason for e in review.checklist.exempt}
    assert "own standard" in reasons[("B1/C1", "C1")]
    assert "end grain" in reasons[("P9/W1", "P9")]
    assert "P9/W1:W1" in _ids(review)


def test_no_near_support_check_when_loads_are_beyond_d():
    ids = _ids(review_dict(base_model()))
    assert not any(i.endswith(":near") for i in ids)


def test_near_support_check_appears_when_a_load_lands_within_d():
    data = base_model()
    data["bearings"][2]["lower"]["at"] = "450 mm"  # 375 mm from the support centre, d = 380 mm
    review = review_dict(data)
    near = review.result("B1/C1:B1:near")
    assert near.check.kind == "near-support"
    assert [c.source for c in near.check.opposite] == ["J1/B1"]


def test_near_support_check_carries_only_the_loads_within_d():
    data = base_model()
    data["bearings"][2]["lower"]["at"] = "300 mm"
    data["loads"].append(
        {"id": "far", "member": "B1", "type": "point", "at": "3 m", "length": "50 mm", "specified": {"D": "20 kN"}}
    )
    review = review_dict(data)
    near = review.result("B1/C1:B1:near")
    local = review.result("B1/C1:B1")
    assert near.check.forces["D"] < local.check.forces["D"]
    assert set(near.check.forces) == {"D", "L"}
    # by hand: J1 (4 m, D 1 kN/m over its length) spans 65 mm to 3935 mm; its reaction on B1 is
    # 4 kN x (2000 - 65) / 3870 = 2.00 kN, the only load within d of C1
    assert near.check.forces["D"] == pytest.approx(2000.0, rel=1e-9)


def test_a_post_passes_its_load_to_the_bearing_at_its_foot():
    data = _with_post_on_plate()
    data["loads"][-1] = {"member": "P9", "type": "point", "specified": {"S": "30 kN"}}
    review = review_dict(data)
    assert review.flow.bearing_forces["P9/W1"] == {"S": 30000.0}


def test_kb_is_one_at_an_end_bearing_with_the_distance_in_the_reason():
    r = review_dict(base_model()).result("J1/B1:J1")
    kb = next(f for f in r.factors if f.name == "KB")
    assert kb.value == 1.0 and "from the member end" in kb.reason


def test_governing_combination_is_the_highest_ratio_not_the_highest_load():
    data = base_model()
    data["loads"][0]["specified"] = {"D": "3 kN/m", "W": "2.2 kN/m"}
    r = review_dict(data).result("J1/B1:J1")
    by_name = {c.combination: c for c in r.combinations}
    # 1.25D+1.4W carries more load, but KD = 1.15 there; 1.4D with KD = 0.65 governs
    assert by_name["1.25D+1.4W"].qf > by_name["1.4D"].qf
    assert r.governing.combination == "1.4D"


def test_uplift_is_reported_as_a_finding_not_a_crash():
    data = base_model()
    data["loads"][0]["specified"] = {"D": "0.5 kN/m", "W": "-3 kN/m"}
    review = review_dict(data)
    uplift = [f for f in review.engine_findings if f.kind == "uplift"]
    assert "J1/W1" in [f.bearing for f in uplift]


def test_factored_loads_use_their_stated_duration():
    data = base_model()
    data["loads"] = [{"member": "J1", "type": "point", "at": "2 m", "factored": "10 kN", "duration": "short"}]
    r = review_dict(data).result("J1/B1:J1")
    assert r.governing.kd == 1.15
    assert r.governing.qf == 5000.0


def test_continuous_beam_on_three_supports_uses_the_stiffness_method():
    data = base_model()
    data["members"].append(
        {"id": "C3", "material": "STEEL", "b": "150 mm", "d": "150 mm", "length": "3 m", "orientation": "vertical"}
    )
    data["bearings"].insert(1, {"upper": {"member": "B1", "at": "3 m"}, "lower": "C3"})
    data["bearings"][3]["lower"]["at"] = "1.5 m"
    data["loads"].append({"id": "u", "member": "B1", "type": "uniform", "specified": {"D": "1 kN/m"}})
    review = review_dict(data)
    f = review.flow.bearing_forces
    # equal spans 2.925 m with a uniform load: the middle support takes 1.25 w L
    assert f["B1/C3"]["D"] > f["B1/C1"]["D"]


def _suction_model(threshold: str | None) -> dict:
    data = base_model()
    data["loads"][0]["specified"]["W"] = "-3 kN/m"  # roof suction on J1: 1.25D + 1.4W lifts it
    if threshold:
        data["project"]["uplift_note_below"] = threshold
    return data


def test_uplift_is_a_major_finding_by_default():
    uplift = [f for f in review_dict(_suction_model(None)).engine_findings if f.kind == "uplift"]
    assert uplift and {f.severity for f in uplift} == {"revise"}


def test_uplift_below_the_project_threshold_is_for_the_record_and_states_it():
    # by hand: at J1/B1, 1.25 x 1 kN/m - 1.4 x 3 kN/m = -2.95 kN/m over J1, about -5.7 kN: under 10 kN
    uplift = [f for f in review_dict(_suction_model("10 kN")).engine_findings if f.kind == "uplift"]
    assert uplift and {f.severity for f in uplift} == {"record"}
    assert all("10.00 kN" in f.message for f in uplift)


def test_a_firms_pack_can_set_the_uplift_note_threshold_and_the_memo_states_it(tmp_path):
    import yaml

    from audit.core.located_yaml import read_yaml_text
    from audit.inputs.read_model import build_model
    from audit.report.memo import assumptions
    from audit.review.review import review_built
    from audit.standards.bundled import builtin_rules_dir

    text = (builtin_rules_dir() / "o86-2019-recalled.yaml").read_text()
    text = text.replace("id: o86-2019-recalled", "id: firm-uplift").replace("    value: 0.5 kN\n", "    value: 10 kN\n")
    (tmp_path / "firm.yaml").write_text(text)
    data = _suction_model(None)
    data["project"]["rule_pack"] = "firm-uplift"
    root = read_yaml_text(yaml.safe_dump(data, sort_keys=False), "model.yaml")
    review = review_built(*build_model(root, "model.yaml", (tmp_path,)))
    uplift = [f for f in review.engine_findings if f.kind == "uplift"]
    assert uplift and {f.severity for f in uplift} == {"record"}
    assert all("rule pack firm-uplift" in f.message for f in uplift)
    assert any("below 10.00 kN" in line for line in assumptions(review))
