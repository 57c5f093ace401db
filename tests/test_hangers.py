"""Hangers: the carried member on the seat, the carrier under a top flange, the reaction against the listed capacity.

Expected values are worked by hand from CSA O86 6.5.6 as recalled (Qr = phi fcp KD KScp KT Ab KB KZcp; the values
in /work's domain notes, from memory: verify): phi 0.8, fcp S-P-F 5.3 MPa, D.Fir-L glulam 7.0 MPa, KZcp 1.15 for
b/d <= 1 (not for glulam), KB 1.25 at a 38 mm bearing away from an end, KB 1.0 at an end. The capacity comparison is
worked by hand: Qf from the joist's statics and the NBCC 1.25D + 1.5L combination (as recalled), against the listed
capacity of the hanger for the combination's load duration. The hangers are invented; no product.
"""

from __future__ import annotations

import textwrap
from pathlib import Path

import pytest
import yaml

from audit.core.located_yaml import read_yaml_text
from audit.engine.model import Hanger
from audit.inputs.read_model import build_model
from audit.review.reconcile import reconcile
from audit.review.review import review_built, review_model
from tests.conftest import ROOT, base_model, claims_from
from tests.test_bad_input import LINE

PACK = textwrap.dedent(
    """\
    kind: connectors
    id: test-hangers
    title: invented hangers for the tests
    hangers:
      - id: HG-1
        kind: face-mount
        seat: {width: 40 mm, length: 64 mm}
        capacity: {permanent: 4.0 kN, standard: 6.0 kN, short: 6.9 kN}
        source: "invented listing, page 3"
        status: "invented: not a product"
      - id: HG-2T
        kind: top-flange
        seat: {width: 40 mm, length: 76 mm}
        flange_length: 64 mm
        capacity: {standard: 9.0 kN}
        source: "invented listing, page 4"
        status: "invented: not a product"
      - id: HG-WIDE
        kind: top-flange
        seat: {width: 40 mm, length: 76 mm}
        flange_length: 150 mm
        capacity: {standard: 9.0 kN}
        source: "invented listing, page 5"
        status: "invented: not a product"
    """
)
DEMO = ROOT / "fixtures" / "demo-framing"

# J1: 4 m, D 1 kN/m + L 2 kN/m over its length, on bearings at 65 mm and 3968 mm: the reaction at 3968 mm is
# w 4 m (2 m - 0.065 m) / 3.903 m = 1.98308 m x w (statics by hand). Under 1.25D + 1.5L: 4.25 kN/m x 1.98308 m.
REACTION_PER_W = 4.0 * (2.0 - 0.065) / (3.968 - 0.065)
QF_J1 = (1.25 * 1.0 + 1.5 * 2.0) * 1000 * REACTION_PER_W  # N, 8.428 kN
QF_PERMANENT = 1.4 * 1.0 * 1000 * REACTION_PER_W  # N, 1.4D


@pytest.fixture
def rules(tmp_path: Path) -> Path:
    folder = tmp_path / "rules"
    folder.mkdir()
    (folder / "connectors.yaml").write_text(PACK, encoding="utf-8")
    return folder


def hung(hanger: str, joist_at: str = "3968 mm") -> dict:
    data = base_model()
    data["bearings"][2] = {
        "upper": {"member": "J1", "at": joist_at},
        "lower": {"member": "B1", "at": "3 m"},
        "hanger": hanger,
    }
    return data


def review_with(data: dict, rules: Path):
    root = read_yaml_text(yaml.safe_dump(data, sort_keys=False), "model.yaml")
    model, pack, cpack = build_model(root, "model.yaml", (rules,))
    return review_built(model, pack, cpack)


def test_the_carried_member_bears_on_the_seat_worked_by_hand(rules):
    review = review_with(hung("HG-1"), rules)
    r = review.result("J1/B1:J1")
    # O86 6.5.6 as recalled: Ab = 38 mm (the joist, narrower than the 40 mm seat) x 64 mm (the seat's length);
    # KB 1.0 (the seat at the joist's end), KZcp 1.15 (38/235 <= 1): 0.8 x 5.3 MPa x 38 x 64 mm2 x 1.15 = 11.86 kN
    assert r.check.contact.length == pytest.approx(0.064)
    assert r.check.contact.width == pytest.approx(0.038)
    assert r.governing.qr == pytest.approx(0.8 * 5.3 * 38 * 64 * 1.0 * 1.15, rel=1e-3)
    assert r.governing.qf == pytest.approx(QF_J1, rel=1e-3)


def test_a_face_mount_carrier_gets_no_bearing_check_but_a_note_for_the_record(rules):
    review = review_with(hung("HG-1"), rules)
    assert review.result_at("J1/B1", "B1", "local") is None
    exempt = [e for e in review.checklist.exempt if e.bearing == "J1/B1" and e.member == "B1"]
    assert exempt and "face-mount hanger HG-1" in exempt[0].reason
    notes = [f for f in review.engine_findings if f.kind == "hanger-side"]
    assert [(f.bearing, f.severity) for f in notes] == [("J1/B1", "record")]


def test_the_reaction_is_compared_with_the_listed_capacity_of_its_duration(rules):
    review = review_with(hung("HG-1"), rules)
    (check,) = review.hangers
    # by hand: 1.25D + 1.5L gives 8.43 kN against 6.0 kN (standard term): 1.40; 1.4D gives 2.78 kN against the
    # permanent 4.0 kN: 0.69. The standard-term combination governs and fails.
    assert check.combination == "1.25D+1.5L"
    assert check.capacity == pytest.approx(6000.0)
    assert check.utilisation == pytest.approx(QF_J1 / 6000.0, rel=1e-3)
    assert not check.passes
    assert check.utilisation > QF_PERMANENT / 4000.0  # the permanent row does not govern here
    (finding,) = [f for f in review.engine_findings if f.kind == "hanger-capacity"]
    assert finding.severity == "safety"
    assert finding.clause == "invented listing, page 3"  # the listing's source is the clause field


def test_a_hanger_within_its_capacity_is_listed_for_the_record(rules, tmp_path):
    strong = PACK.replace("standard: 6.0 kN", "standard: 9.0 kN")
    (rules / "connectors.yaml").write_text(strong, encoding="utf-8")
    review = review_with(hung("HG-1"), rules)
    (check,) = review.hangers
    assert check.passes and check.utilisation == pytest.approx(QF_J1 / 9000.0, rel=1e-3)
    (finding,) = [f for f in review.engine_findings if f.kind == "hanger-capacity"]
    assert finding.severity == "record"


def test_a_duration_not_listed_takes_the_nearest_longer_one_listed_else_the_least():
    hanger = Hanger("H", "face-mount", 0.04, 0.064, None, (("standard", 9000.0), ("short", 10000.0)), "s", "t")
    assert hanger.capacity_for("short")[0] == 10000.0
    assert hanger.capacity_for("permanent")[0] == 9000.0  # none longer: the least listed (conservative)
    only_standard = Hanger("H", "face-mount", 0.04, 0.064, None, (("standard", 9000.0),), "s", "t")
    assert only_standard.capacity_for("short")[0] == 9000.0  # short takes standard, never more


def test_a_top_flange_hanger_loads_the_top_of_its_carrier_worked_by_hand(rules):
    review = review_with(hung("HG-2T"), rules)
    r = review.result("J1/B1:B1")
    # along B1's grain: the hanger's width, 40 mm, no more than the joist's 38 mm; across: the 64 mm flange.
    # KB 1.25 at 38 mm (interior, O86 table as recalled), no KZcp for glulam: 0.8 x 7.0 x 38 x 64 x 1.25 = 17.02 kN
    assert r.check.contact.length == pytest.approx(0.038)
    assert r.check.contact.width == pytest.approx(0.064)
    assert r.governing.qr == pytest.approx(0.8 * 7.0 * 38 * 64 * 1.25, rel=1e-3)
    assert not [f for f in review.engine_findings if f.kind in ("hanger-flange", "hanger-side")]
    seat = review.result("J1/B1:J1")
    assert seat.check.contact.length == pytest.approx(0.076)


def test_a_carrier_narrower_than_the_top_flange_is_a_comment(rules):
    review = review_with(hung("HG-WIDE"), rules)
    (finding,) = [f for f in review.engine_findings if f.kind == "hanger-flange"]
    assert finding.severity == "revise" and "150 mm" in finding.message and "130 mm" in finding.message
    # the carrier's contact is no wider than the carrier: 38 x 130 mm, never the 150 mm flange
    assert review.result("J1/B1:B1").check.contact.width == pytest.approx(0.130)


def test_an_unknown_hanger_gives_one_located_line_and_exit_2(rules, write_model, run_cli):
    path = write_model(hung("HG-9"))
    result = run_cli("review", path, "--rules-dir", rules)
    assert result.exit_code == 2, result.output
    lines = [ln for ln in result.stderr.splitlines() if ln.startswith("error: ")]
    assert len(lines) == 1, result.stderr
    match = LINE.match(lines[0])
    assert match, lines[0]
    assert "unknown hanger 'HG-9'" in lines[0] and match["file"] == str(path)
    assert match["key"].endswith("hanger")  # the key path names the field
    assert "HG-9" in path.read_text().splitlines()[int(match["line"]) - 1]


def test_a_hanger_with_a_stated_seat_as_well_is_refused(rules, write_model, run_cli):
    data = hung("HG-1")
    data["bearings"][2]["upper"]["length"] = "89 mm"
    result = run_cli("review", write_model(data), "--rules-dir", rules)
    assert result.exit_code == 2
    assert "gives the contact" in result.stderr


def test_a_near_support_check_takes_no_face_mount_load_from_the_carriers_side(rules):
    data = hung("HG-1", joist_at="3968 mm")
    data["bearings"][2]["lower"]["at"] = "300 mm"  # within d = 380 mm of the support on C1 at 75 mm
    face = review_with(data, rules)
    assert not [r for r in face.results if r.check.kind == "near-support" and r.check.member == "B1"]
    data["bearings"][2]["hanger"] = "HG-2T"
    top = review_with(data, rules)
    assert [r.check.bearing for r in top.results if r.check.kind == "near-support" and r.check.member == "B1"]


def test_layout_runs_frame_into_a_beams_side_in_the_hanger_they_name():
    review = review_model(DEMO / "model.yaml", (DEMO / "rules",))
    j = review.model.bearings_by_id["J-A-B-1/BB"]
    k = review.model.bearings_by_id["K-B-C-1/BB"]
    assert (j.hanger, k.hanger) == ("HG-1", "HG-2T")
    assert j.upper.length == pytest.approx(0.064) and k.upper.length == pytest.approx(0.076)  # the seats
    assert review.result_at("J-A-B-1/BB", "BB", "local") is None  # face-mount: the side, not a bearing
    assert review.result_at("K-B-C-1/BB", "BB", "local") is not None  # top flange: BB's top
    assert len(review.hangers) == 12
    # the dropped beams are sat on as before: no hanger
    assert review.model.bearings_by_id["J-A-B-1/BA"].hanger == ""


def test_a_typical_claim_covers_the_seats_of_a_runs_hangers():
    review = review_model(DEMO / "model.yaml", (DEMO / "rules",))
    claims = claims_from(
        [
            {
                "id": "H-1",
                "location": "J on BB typ.",
                "member": "J-A-B-1",
                "Qf": "2.80 kN",
                "Qr": "11.9 kN",
                "adequate": True,
            }
        ]
    )
    rec = reconcile(review, claims)
    matched = {o.check_id for o in rec.checks if o.claim_id == "H-1"}
    assert matched == {f"J-A-B-{n}/BB:J-A-B-{n}" for n in range(1, 7)}


def test_committed_framing_demo_outputs_are_byte_identical_to_a_fresh_run(tmp_path, run_cli):
    files = [
        ("--memo", "framing-demo-memo.html"),
        ("--appendix", "framing-demo-appendix.html"),
        ("--json", "framing-demo-findings.json"),
        ("--csv", "framing-demo-findings.csv"),
    ]
    result = run_cli(
        "review",
        DEMO / "model.yaml",
        "--rules-dir",
        DEMO / "rules",
        "--claims",
        DEMO / "claims.yaml",
        *[v for o, n in files for v in (o, tmp_path / n)],
    )
    assert result.exit_code == 1  # a hanger over its listed capacity
    for _, name in files:
        fresh, committed = (tmp_path / name).read_bytes(), (ROOT / "reports" / name).read_bytes()
        assert fresh == committed, f"reports/{name} is stale: run the hanger demo command in the README"


def test_the_framing_demo_expands_and_reads_back_with_its_hangers(tmp_path, run_cli):
    out = tmp_path / "explicit.yaml"
    assert run_cli("expand", DEMO / "model.yaml", "-o", out, "--rules-dir", DEMO / "rules").exit_code == 0
    assert "hanger: HG-1" in out.read_text(encoding="utf-8")
    again = review_model(out, (DEMO / "rules",))
    assert len(again.hangers) == 12


def test_a_hanger_comments_place_rows_carry_the_reaction_and_the_listed_capacity(rules):
    from audit.report.comment_log import comment_rows
    from audit.review.comments import build_comments

    review = review_with(hung("HG-1"), rules)
    claims = claims_from([])
    comments = build_comments(review, reconcile(review, claims), claims)
    (comment,) = [c for c in comments if c.kind == "hanger-capacity"]
    (place,) = comment.places
    # by hand (above): 8.43 kN under 1.25D + 1.5L against the 6.0 kN the invented listing gives for standard term
    numbers = {n.quantity: n.recomputed for n in place.compared}
    assert numbers == pytest.approx({"Qf": QF_J1 / 1000, "capacity": 6.0}, rel=1e-3)
    rows = [r for r in comment_rows(comments) if r[2] == "hanger-capacity"]
    assert [(r[10], r[11]) for r in rows] == [("Qf", "kN"), ("capacity", "kN")]
