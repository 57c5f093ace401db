"""Comments triaged by consequence: failing and nearly-failing checks stand alone, comfortable missing checks
are grouped by the kind of detail, a wrong typical claim is one comment, and nothing is hidden.

The hand-made model: four sawn joists J1-J4 (38 x 235, S-P-F No.2, 4 m) each on a wall plate TP over studs
(140 x 38 laid flat, S-P-F, studs 38 mm at 406 mm) and on a glulam beam B1 (130 x 380, D.Fir-L 24f-EX) on two
steel posts. Hand values (CSA O86 as recalled, the clause's formula worked by hand):
- a joist with 1 kN/m D and 2 kN/m L over 4 m puts D 2 kN and L 4 kN on each support, Qf = 1.25 x 2 + 1.5 x 4
  = 8.5 kN (statics of a simple span);
- TP under a joist: Ab = 38 x 140 = 5320 mm2 (the joist's width along TP, TP's width across), KB = 1.25 for a
  38 mm bearing away from the end, KZcp = 1.00 for a plate laid flat: Qr = 0.8 x 5.3 MPa x 5320 mm2 x 1.25 =
  28.2 kN, so Qf/Qr = 8.5 / 28.2 = 0.30.
"""

from __future__ import annotations

import json

import pytest

from audit.review.comments import build_comments
from audit.review.details import member_roles
from tests.conftest import ROOT, reconcile_dicts, review_dict

QR_TP_UNDER_JOIST = 0.8 * 5.3e6 * 0.038 * 0.140 * 1.25  # N, worked by hand above


def joists_on_a_wall(point_loads: dict[str, tuple[str, str]] | None = None, own_from: float | None = None) -> dict:
    """The hand-made model; ``point_loads``: joist -> (D, L) at its middle."""
    joists = ["J1", "J2", "J3", "J4"]
    model: dict = {
        "project": {"title": "Triage frame (fictional)", "date": "2026-01-15"},
        "materials": {
            "GL": {"family": "glulam", "species": "D.Fir-L", "grade": "24f-EX"},
            "SPF": {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"},
            "STEEL": {"family": "steel"},
        },
        "members": [
            {"id": "B1", "material": "GL", "b": "130 mm", "d": "380 mm", "length": "6 m"},
            {"id": "C1", "material": "STEEL", "b": "150 mm", "d": "150 mm", "length": "3 m", "orientation": "vertical"},
            {"id": "C2", "material": "STEEL", "b": "150 mm", "d": "150 mm", "length": "3 m", "orientation": "vertical"},
            {
                "id": "TP",
                "material": "SPF",
                "b": "140 mm",
                "d": "38 mm",
                "length": "2 m",
                "support": "studs",
                "studs": {"thickness": "38 mm", "spacing": "406 mm"},
            },
            *({"id": j, "material": "SPF", "b": "38 mm", "d": "235 mm", "length": "4 m"} for j in joists),
        ],
        "bearings": [
            {"upper": {"member": "B1", "at": "75 mm"}, "lower": "C1"},
            {"upper": {"member": "B1", "at": "5925 mm"}, "lower": "C2"},
        ],
        "loads": [],
    }
    if own_from is not None:
        model["project"]["own_comment_from"] = own_from
    for n, j in enumerate(joists):
        model["bearings"].append(
            {"upper": {"member": j, "at": "70 mm"}, "lower": {"member": "TP", "at": f"{200 + 400 * n} mm"}}
        )
        model["bearings"].append(
            {"upper": {"member": j, "at": "3935 mm"}, "lower": {"member": "B1", "at": f"{1 + n} m"}}
        )
        model["loads"].append({"member": j, "type": "uniform", "specified": {"D": "1 kN/m", "L": "2 kN/m"}})
        if point_loads and j in point_loads:
            d, live = point_loads[j]
            model["loads"].append({"member": j, "type": "point", "at": "2 m", "specified": {"D": d, "L": live}})
    return model


def comments_of(model: dict, claims: list[dict] | None = None):
    review, claim_list, rec = reconcile_dicts(model, claims or [])
    return review, rec, build_comments(review, rec, claim_list)


def test_roles_are_read_from_the_shape_of_the_framing():
    roles = member_roles(review_dict(joists_on_a_wall()).model)
    assert {roles[j] for j in ("J1", "J2", "J3", "J4")} == {"joist"}  # four alike on the same two supports
    assert roles["TP"] == "wall plate" and roles["TP.stud1"] == "stud"  # a row of studs at 406 mm
    assert roles["B1"] == "beam" and roles["C1"] == "post"


def test_comfortable_missing_checks_are_one_comment_per_kind_of_detail_with_every_place():
    review, _, comments = comments_of(joists_on_a_wall())
    under = [c for c in comments if c.title.startswith("Lumber joists on lumber wall plates: the check of")]
    assert len(under) == 1
    group = under[0]
    assert sorted(p.check_id for p in group.places) == [f"J{n}/TP:TP" for n in (1, 2, 3, 4)]
    assert "4 places" in group.title and "one typical check" in group.ask
    # the worst is one of four equal joists: Qf/Qr = 8.5 kN / 28.2 kN by hand
    assert f"Qf/Qr {8500 / QR_TP_UNDER_JOIST:.2f}" in group.title
    # every missing check is in exactly one comment, and none is left out
    missing = sorted(r.check.id for r in review.results)
    placed = sorted(p.check_id for c in comments for p in c.places if p.check_id)
    assert placed == missing


def test_a_plate_over_its_studs_is_one_comment():
    _, _, comments = comments_of(joists_on_a_wall())
    on_studs = [c for c in comments if any(p.check_id.startswith("TP/TP.stud") for p in c.places)]
    assert len(on_studs) == 1 and on_studs[0].title.startswith("Lumber wall plates on lumber studs")


def test_a_failing_check_gets_a_comment_of_its_own_among_alike_ones():
    # J3 carries D 15 kN + L 20 kN at its middle: D 9.5 kN, L 14 kN at each end, Qf = 32.9 kN > 28.2 kN
    review, _, comments = comments_of(joists_on_a_wall({"J3": ("15 kN", "20 kN")}))
    assert not review.result("J3/TP:TP").passes
    own = [c for c in comments if [p.check_id for p in c.places] == ["J3/TP:TP"]]
    assert len(own) == 1 and own[0].weight == "safety" and own[0].kind == "failing"
    group = next(c for c in comments if c.title.startswith("Lumber joists on lumber wall plates: the check of"))
    assert "J3/TP:TP" not in {p.check_id for p in group.places}
    assert comments[0].weight == "safety"  # the worst first


def test_a_missing_check_near_its_resistance_gets_its_own_comment_from_the_projects_threshold():
    # J4 carries D 9 kN + L 14 kN: D 6.5 kN, L 11 kN at each end, Qf = 24.6 kN; TP under it: 24.6 / 28.2 = 0.87
    qf = 1.25 * 6.5e3 + 1.5 * 11e3
    ratio = qf / QR_TP_UNDER_JOIST
    assert 0.85 < ratio < 0.9
    heavy = {"J4": ("9 kN", "14 kN")}
    _, _, by_default = comments_of(joists_on_a_wall(heavy))
    assert not [c for c in by_default if [p.check_id for p in c.places] == ["J4/TP:TP"]]  # below 0.9: grouped
    _, _, stricter = comments_of(joists_on_a_wall(heavy, own_from=0.85))
    own = [c for c in stricter if [p.check_id for p in c.places] == ["J4/TP:TP"]]
    assert len(own) == 1 and f"Qf/Qr {ratio:.2f}" in own[0].title


def test_a_wrong_typical_claim_is_one_comment_naming_its_places():
    # the calc claims 5 kN for every joist on TP; each carries 8.5 kN (hand value above)
    claim = {"id": "T1", "where": {"page": 4}, "location": "J*/TP", "member": "TP", "Qf": "5 kN", "Qr": "28.2 kN"}
    _, rec, comments = comments_of(joists_on_a_wall(), [claim])
    touching = [c for c in comments if any(p.claim_id == "T1" for p in c.places)]
    assert len(touching) == 1
    comment = touching[0]
    assert comment.title.startswith("Typical claim 'J*/TP' (p. 4)")
    assert "its load differs" in comment.title and "3 places it stands for are worse than the claim" in comment.title
    assert sorted(p.check_id for p in comment.places) == [f"J{n}/TP:TP" for n in (1, 2, 3, 4)]
    assert {o.status for o in rec.checks if o.claim_id == "T1"} == {"mis-loaded", "not-covered"}


def test_a_bad_own_comment_threshold_is_refused_with_its_line(write_model, run_cli):
    model = joists_on_a_wall()
    model["project"]["own_comment_from"] = 1.5
    result = run_cli("review", write_model(model))
    assert result.exit_code == 2 and "own_comment_from" in result.output and "model.yaml:" in result.output


@pytest.fixture(scope="module")
def layout_demo(tmp_path_factory):
    from typer.testing import CliRunner

    from audit.cli import app

    out = tmp_path_factory.mktemp("layout") / "layout.json"
    demo = ROOT / "fixtures" / "demo-layout"
    args = ["review", str(demo / "model.yaml"), "--claims", str(demo / "claims.yaml"), "--json", str(out)]
    assert CliRunner().invoke(app, args, catch_exceptions=False).exit_code == 1
    return json.loads(out.read_text(encoding="utf-8"))


def test_the_layout_demo_asks_at_most_thirty_comments_and_names_each_failing_or_unconservative_check(layout_demo):
    data = layout_demo
    asking = [c for c in data["comments"] if c["weight"] != "record"]
    assert len(asking) <= 30
    status = {o["check"]: o["status"] for o in data["check_outcomes"]}
    utilisation = {c["id"]: c["utilisation"] for c in data["checks"]}
    unconservative = {
        f["check"]
        for f in data["findings"]
        if f["kind"] in ("mis-loaded", "resistance-differs") and f["weight"] == "revise"
    }
    failing = {c for c, ok in ((c["id"], c["passes"]) for c in data["checks"]) if not ok}
    assert failing and unconservative
    for check in failing:  # a comment of its own: that check alone
        assert any({p["check"] for p in c["places"]} == {check} for c in asking), check  # a row per number
    for check in unconservative:  # named in the title of a comment that is no completeness group
        bearing = check.split(":")[0]
        holders = [c for c in asking if check in {p["check"] for p in c["places"]}]
        assert len(holders) == 1 and bearing in holders[0]["title"] and holders[0]["kind"] != "missing", check
    for c in asking:  # a completeness group holds only comfortable missing checks
        if c["kind"] == "missing" and len({p["check"] for p in c["places"]}) > 1:
            assert all(status[p["check"]] == "missing" and utilisation[p["check"]] < 0.9 for p in c["places"])


def test_the_layout_demo_accounts_for_every_check_and_claim_exactly_once(layout_demo):
    data = layout_demo
    in_comments: dict[str, int] = {}
    for c in data["comments"]:
        for check in {p["check"] for p in c["places"] if p["check"]}:
            in_comments[check] = in_comments.get(check, 0) + 1
    assert sorted(in_comments) == sorted(c["id"] for c in data["checks"])
    assert set(in_comments.values()) == {1}
    assert sorted(o["check"] for o in data["check_outcomes"]) == sorted(c["id"] for c in data["checks"])
    claims = [o["claim"] for o in data["claim_outcomes"]]
    assert len(claims) == len(set(claims)) == 20  # the demo's claims file has 20 claims


def _firm_pack(tmp_path, value: str):
    """A firm's copy of the O86 pack with its own review.own_comment_from, in a folder of its own."""
    from audit.standards.bundled import builtin_rules_dir

    text = (builtin_rules_dir() / "o86-2019-recalled.yaml").read_text(encoding="utf-8")
    text = text.replace("id: o86-2019-recalled", "id: firm-triage")
    text = text.replace("own_comment_from: {value: 0.9,", f"own_comment_from: {{value: {value},")
    folder = tmp_path / "rules"
    folder.mkdir()
    (folder / "firm.yaml").write_text(text, encoding="utf-8")
    return folder


def test_a_firms_pack_sets_the_own_comment_threshold_with_its_provenance(tmp_path, write_model, run_cli):
    rules = _firm_pack(tmp_path, "0.85")
    model = joists_on_a_wall({"J4": ("9 kN", "14 kN")})  # TP under J4 at 0.87 (hand value above)
    model["project"]["rule_pack"] = "firm-triage"
    out = tmp_path / "out.json"
    result = run_cli(
        "review", write_model(model), "--rules-dir", rules, "--claims", _no_claims(tmp_path), "--json", out
    )
    assert result.exit_code == 1, result.output
    data = json.loads(out.read_text(encoding="utf-8"))
    assert data["triage"]["own_comment_from"] == 0.85 and "rule pack firm-triage" in data["triage"]["whose"]
    assert any({p["check"] for p in c["places"]} == {"J4/TP:TP"} for c in data["comments"])


def test_a_bad_own_comment_threshold_in_a_pack_is_refused_with_its_line(tmp_path, write_model, run_cli):
    rules = _firm_pack(tmp_path, "2")
    model = joists_on_a_wall()
    model["project"]["rule_pack"] = "firm-triage"
    result = run_cli("review", write_model(model), "--rules-dir", rules)
    assert result.exit_code == 2 and "firm.yaml:" in result.output and "expected a Qf/Qr from 0 to 1" in result.output


def _no_claims(tmp_path):
    path = tmp_path / "claims.yaml"
    path.write_text("claims: []\n", encoding="utf-8")
    return path


def test_the_layout_demos_appendix_lists_every_check_and_claim_once_with_the_comment_of_the_json(tmp_path):
    import re
    from html import unescape

    from typer.testing import CliRunner

    from audit.cli import app

    demo = ROOT / "fixtures" / "demo-layout"
    out, appendix = tmp_path / "layout.json", tmp_path / "appendix.html"
    args = ["review", str(demo / "model.yaml"), "--claims", str(demo / "claims.yaml"), "--json", str(out)]
    args += ["--appendix", str(appendix)]
    assert CliRunner().invoke(app, args, catch_exceptions=False).exit_code == 1
    data = json.loads(out.read_text(encoding="utf-8"))
    html = appendix.read_text(encoding="utf-8")
    number = {p["check"]: c["comment"] for c in data["comments"] for p in c["places"] if p["check"]}

    def rows(section: str, cells: int) -> list[list[str]]:
        body = html.split(f'<section id="{section}">')[1].split('<section id="', 1)[0]
        found = []
        for row in re.findall(r"<tr>((?:<td[^>]*>[^<]*</td>){" + str(cells) + r"})</tr>", body):
            found.append([unescape(c) for c in re.findall(r"<td[^>]*>([^<]*)</td>", row)])
        return found

    checks = rows("checks", 9)
    assert sorted(r[0] for r in checks) == sorted(c["id"] for c in data["checks"])  # each check once
    assert all(r[8] == str(number[r[0]]) for r in checks)  # with the number of its one comment
    claims = rows("claims", 5)
    assert sorted(r[0] for r in claims) == sorted(o["claim"] for o in data["claim_outcomes"])  # each claim once
