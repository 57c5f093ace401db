"""A point load that states its bearing length (an equipment leg, a post of framing the model does not show)
crushes the member it stands on: a local check under every standard; one without a length is listed as not
checked, naming the load. Hand values in tests/verification/details.py (factors as recalled: verify).
"""

from __future__ import annotations

import json

import pytest

from tests.conftest import reconcile_dicts, review_dict
from tests.verification.details import LEG_BY_HAND, beam_with_leg

REL = 1e-9


@pytest.mark.parametrize("standard", ["o86", "nds-asd", "nds-lrfd", "ec5"])
def test_a_point_load_with_a_bearing_length_gets_a_local_check_of_the_member_under_it(standard):
    qf, qr, combination = LEG_BY_HAND[standard]
    result = review_dict(beam_with_leg(standard)).result("leg:B")
    assert result.check.kind == "local" and result.check.load == "leg" and result.check.face == "top"
    assert (result.check.contact.length, result.check.contact.width) == pytest.approx((0.050, 0.060))
    assert result.governing.qf == pytest.approx(qf, rel=REL)
    assert result.governing.qr == pytest.approx(qr, rel=REL)
    assert result.governing.combination == combination


def test_a_point_load_without_a_width_bears_on_the_members_full_width():
    # common practice: a load with no stated width spreads across the member's b (89 mm)
    data = beam_with_leg("o86")
    del data["loads"][1]["width"]
    result = review_dict(data).result("leg:B")
    assert result.check.contact.width == pytest.approx(0.089)
    assert "b of B" in result.area_reason


@pytest.mark.parametrize("standard", ["o86", "nds-asd", "ec5"])
def test_a_point_load_without_a_length_is_listed_as_not_checked_naming_the_load(standard):
    data = beam_with_leg(standard)
    del data["loads"][1]["length"]
    review = review_dict(data)
    assert not [r for r in review.results if r.check.load]
    (spot,) = review.checklist.unchecked
    assert spot.member == "B" and spot.spots == (("leg", pytest.approx(1.5)),)
    (note,) = [f for f in review.engine_findings if f.kind == "no-bearing-length"]
    assert "Point load leg at 1500 mm on B states no bearing length" in note.message
    assert note.bearing == "leg" and note.member == "B"


def test_a_claim_labelled_with_the_load_id_reconciles_with_its_check():
    qf, qr, _ = LEG_BY_HAND["o86"]
    claim = {"id": "C1", "location": "leg", "member": "B", "Qf": f"{qf / 1000:.3f} kN", "Qr": f"{qr / 1000:.3f} kN"}
    _, _, rec = reconcile_dicts(beam_with_leg("o86"), [claim])
    outcome = rec.outcome("leg:B")
    assert outcome.claim_id == "C1" and outcome.status == "confirmed"


def test_a_point_load_within_d_of_a_support_is_still_in_the_near_support_check():
    # the leg moved to 150 mm: its centre is 105.5 mm from the post's centre at 44.5 mm, within d = 235 mm
    data = beam_with_leg("o86")
    data["loads"][1]["at"] = "150 mm"
    review = review_dict(data)
    near = review.result("B/P1:B:near")
    assert [c.source for c in near.check.opposite] == ["leg"]
    assert review.result("leg:B").check.contact.length == pytest.approx(0.050)


def test_the_point_load_check_is_in_the_memo_the_json_and_the_comment_log(run_cli, write_model, tmp_path):
    model = write_model(beam_with_leg("o86"))
    claims = write_model({"claims": [{"id": "C1", "location": "B/P1", "member": "B", "Qf": "10 kN"}]}, "claims.yaml")
    out_json, out_csv, memo = tmp_path / "out.json", tmp_path / "out.csv", tmp_path / "appendix.html"
    result = run_cli("review", model, "--claims", claims, "--json", out_json, "--csv", out_csv, "--appendix", memo)
    assert result.exit_code in (0, 1)
    checks = {c["id"]: c for c in json.loads(out_json.read_text(encoding="utf-8"))["checks"]}
    assert checks["leg:B"]["point_load"] == "leg" and checks["leg:B"]["bearing"] == "leg"
    log = [line for line in out_csv.read_text(encoding="utf-8").splitlines() if "leg:B" in line]
    assert log and ",missing," in log[0] and "B under point load leg: missing from the calc" in log[0]
    assert "leg:B" in memo.read_text(encoding="utf-8")


def test_a_point_load_sharing_a_bearings_id_is_an_input_error_at_the_load():
    from audit.core.errors import InputErrors

    data = beam_with_leg("o86")
    data["bearings"][0]["id"] = "leg"
    with pytest.raises(InputErrors) as caught:
        review_dict(data)
    assert "loads[1]" in str(caught.value) and "also a bearing's id" in str(caught.value)


def test_a_point_load_pulling_up_is_not_reported_as_uplift_at_a_bearing():
    # uplift is a bearing's (a support lifting off); a load's own contact under suction asks for no tie-down here
    data = beam_with_leg("o86")
    data["loads"][1]["specified"] = {"D": "0.2 kN", "W": {"suction": "3 kN"}}
    review = review_dict(data)
    assert not [f for f in review.engine_findings if f.kind == "uplift" and f.bearing == "leg"]


def test_a_point_load_without_a_length_is_named_in_the_memo_and_the_comment_log(run_cli, write_model, tmp_path):
    data = beam_with_leg("o86")
    del data["loads"][1]["length"]
    out_csv, memo = tmp_path / "out.csv", tmp_path / "memo.html"
    result = run_cli("review", write_model(data), "--csv", out_csv, "--memo", memo)
    assert result.exit_code in (0, 1)
    log = [line for line in out_csv.read_text(encoding="utf-8").splitlines() if ",no-bearing-length," in line]
    assert log and "Point load leg at 1500 mm on B states no bearing length" in log[0]
    assert "Point load leg at 1500 mm on B states no bearing length" in memo.read_text(encoding="utf-8")


def test_a_typical_claim_by_pattern_covers_the_checks_under_several_point_loads():
    # two legs alike; the calc checks "leg*" once: matched to the worse leg (the heavier), covering the other
    data = beam_with_leg("o86")
    data["loads"][1]["id"] = "leg1"
    data["loads"].append({**data["loads"][1], "id": "leg2", "at": "2.2 m", "specified": {"D": "1 kN", "L": "2 kN"}})
    qf, qr, _ = LEG_BY_HAND["o86"]
    claim = {"id": "C1", "location": "leg*", "member": "B", "Qf": f"{qf / 1000:.3f} kN", "Qr": f"{qr / 1000:.3f} kN"}
    _, _, rec = reconcile_dicts(data, [claim])
    assert rec.outcome("leg1:B").claim_id == "C1" and rec.outcome("leg1:B").status == "confirmed"
    assert rec.outcome("leg2:B").claim_id == "C1"


def test_several_point_loads_without_a_length_on_one_member_are_one_note_naming_each():
    data = beam_with_leg("o86")
    del data["loads"][1]["length"]
    data["loads"].append({"id": "leg2", "member": "B", "type": "point", "at": "2.2 m", "specified": {"D": "1 kN"}})
    (note,) = [f for f in review_dict(data).engine_findings if f.kind == "no-bearing-length"]
    assert "Point loads leg at 1500 mm and leg2 at 2200 mm on B state no bearing length" in note.message
