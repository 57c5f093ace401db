"""Typical claims: one claim for a repeated condition, reconciled against the worst of its group."""

from __future__ import annotations

import pytest

from tests.conftest import base_model, reconcile_dicts


def _joists(heavy_last: bool = False, near_last: bool = False) -> dict:
    """Four joists on B1 (J1-J4), each also on the plate W1; bearings J*/B1 share 'joist on B1'."""
    data = base_model()
    data["members"] = [m for m in data["members"] if m["id"] != "J1"]
    data["bearings"] = data["bearings"][:2]
    data["loads"] = []
    for i, at in enumerate(("1.2 m", "2.4 m", "3.6 m", "4.8 m"), start=1):
        data["members"].append({"id": f"J{i}", "material": "SPF", "b": "38 mm", "d": "235 mm", "length": "4 m"})
        lower_at = "300 mm" if near_last and i == 4 else at
        data["bearings"].append(
            {
                "id": f"J{i}/B1",
                "upper": {"member": f"J{i}", "at": "3935 mm"},
                "lower": {"member": "B1", "at": lower_at},
                "typical": ["joist on B1"],
            }
        )
        data["bearings"].append({"upper": {"member": f"J{i}", "at": "65 mm"}, "lower": {"member": "W1", "at": at}})
        w = "3 kN/m" if heavy_last and i == 4 else "2 kN/m"
        data["loads"].append({"member": f"J{i}", "type": "uniform", "specified": {"D": "1 kN/m", "L": w}})
    return data


# each joist's reaction on B1 (symmetric 4 m joist): D 2 kN, L 4 kN -> 1.25 x 2 + 1.5 x 4 = 8.5 kN
QF = 8500.0
QR_J = 24087.44  # 0.8 x 5.3 MPa x 38 x 130 x 1.15, the joist crushed on B1


def _claim(location, **extra) -> dict:
    return {
        "id": "T1",
        "location": location,
        "member": "J1",
        "Qf": f"{QF / 1000} kN",
        "Qr": f"{QR_J / 1000} kN",
        **extra,
    }


@pytest.mark.parametrize("location", ["joist on B1", "J*/B1", ["J1/B1", "J2/B1", "J3/B1", "J4/B1"]])
def test_a_typical_claim_covers_every_joist_and_raises_no_missing_check(location):
    _, _, rec = reconcile_dicts(_joists(), [_claim(location)])
    statuses = {o.check_id: o.status for o in rec.checks if o.check_id.endswith(":J1") or ":J" in o.check_id}
    joist_checks = {k: v for k, v in statuses.items() if "/B1:J" in k}
    assert sorted(joist_checks.values()) == ["confirmed", "covered", "covered", "covered"]
    assert not [f for f in rec.findings if f.kind == "missing" and "/B1:J" in f.check_id]


def test_a_joist_worse_than_the_typical_claim_is_named_with_the_claim():
    _, _, rec = reconcile_dicts(_joists(heavy_last=True), [_claim("joist on B1")])
    # J4 carries L 3 kN/m: 1.25 x 2 + 1.5 x 6 = 11.5 kN; it governs the group, so the claim is
    # compared with it (mis-loaded) and the other three are covered
    assert rec.outcome("J4/B1:J4").status == "mis-loaded"
    assert rec.outcome("J4/B1:J4").qf.recomputed == pytest.approx(1.25 * 2000 + 1.5 * 6000)
    assert {rec.outcome(f"J{i}/B1:J{i}").status for i in (1, 2, 3)} == {"covered"}


def test_a_member_of_the_group_not_covered_is_a_finding_that_names_claim_and_member():
    # J4 is 89 mm wide and carries L 3 kN/m: Qf = 1.25 x 2 + 1.5 x 6 = 11.5 kN, more than the claim's
    # 8.5 kN, though its Qf/Qr (11.5 / 56.4) is below J1's (8.5 / 24.1), which governs the group
    data = _joists(heavy_last=True)
    data["members"][-1]["b"] = "89 mm"
    _, _, rec = reconcile_dicts(data, [_claim("joist on B1")])
    out = rec.outcome("J4/B1:J4")
    assert out.status == "not-covered" and out.claim_id == "T1"
    finding = out.findings[0]
    assert finding.kind == "not-covered" and "J4" in finding.message and "joist on B1" in finding.message
    assert "11.50 kN exceeds the claim's 8.50 kN" in finding.message


def test_a_check_named_by_its_own_claim_stays_with_that_claim():
    data = _joists(heavy_last=True)
    single = dict(_claim("J4/B1"), id="S4", member="J4", Qf="11.5 kN")
    _, _, rec = reconcile_dicts(data, [_claim("joist on B1"), single])
    assert rec.outcome("J4/B1:J4").claim_id == "S4"
    assert {rec.outcome(f"J{i}/B1:J{i}").claim_id for i in (1, 2, 3)} == {"T1"}


def test_mixed_kinds_leave_the_near_support_check_missing():
    _, _, rec = reconcile_dicts(_joists(near_last=True), [_claim("joist on B1")])
    near = [o for o in rec.checks if o.check_id.endswith(":near")]
    assert near and all(o.status == "missing" for o in near)


def test_a_typical_label_marked_typ_in_the_calc_maps_to_the_shared_label():
    _, _, rec = reconcile_dicts(_joists(), [_claim("Joist on B1, typ.")])
    assert [o.status for o in rec.checks if "/B1:J" in o.check_id].count("covered") == 3


def test_a_typical_label_equal_to_a_bearing_alias_is_an_input_error():
    from audit.core.errors import InputErrors
    from tests.conftest import review_dict

    data = _joists()
    data["bearings"][2]["aliases"] = ["joist on B1"]
    with pytest.raises(InputErrors):
        review_dict(data)


@pytest.mark.parametrize("location", ["J1-J4/B1", "J1 to J4/B1, typ."])
def test_a_range_of_ids_in_the_calcs_label_is_a_typical_claim(location):
    _, _, rec = reconcile_dicts(_joists(), [_claim(location)])
    assert [o.status for o in rec.checks if "/B1:J" in o.check_id].count("covered") == 3


def test_a_typical_claim_read_from_a_pdf_row_maps_like_any_other():
    from audit.inputs.read_claims import Claim, Where
    from audit.review.reconcile import reconcile
    from tests.conftest import review_dict

    row = Claim("calc.pdf:p3-1", Where(page=3), "Floor joist on B1 (typ.)", "J1", "local", QF, QR_J, None)
    data = _joists()
    for b in data["bearings"]:
        if "typical" in b:
            b["typical"] = ["floor joist on B1"]
    review = review_dict(data)
    rec = reconcile(review, (row,))
    assert [o.status for o in rec.checks if "/B1:J" in o.check_id].count("covered") == 3
