"""Framing layouts: members placed by their ends, runs, area loads, and contacts found from geometry.

Expected values are worked by hand in the comments (plan geometry and tributary widths are
common practice: half way to each neighbour, an edge member out to the edge).
"""

from __future__ import annotations

import copy
import json

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from audit.core.errors import InputErrors
from tests.conftest import ROOT, review_dict

LAYOUT_DEMO = ROOT / "fixtures" / "demo-layout"

# Two glulam beams along grid lines A and B on four steel posts; a run of joists spans A to B
# between grid lines 1 and 2 (2 m apart) at 400 mm; the floor load is shared among the joists.
SMALL = {
    "project": {"title": "Layout test frame (fictional)", "date": "2026-01-15"},
    "materials": {
        "SPF": {"family": "sawn_lumber", "species": "S-P-F", "grade": "No.2"},
        "GL": {"family": "glulam", "species": "D.Fir-L", "grade": "24f-EX"},
        "STEEL": {"family": "steel"},
    },
    "layout": {
        "levels": {"L1": "0 m", "L2": "3 m"},
        "grids": {"x": {"1": "0 m", "2": "2 m"}, "y": {"A": "0 m", "B": "4 m"}},
        "members": [
            {"id": "BA", "material": "GL", "b": "130 mm", "d": "304 mm", "level": "L2", "drop": "235 mm",
             "from": "A/1", "to": "A/2", "extend": "76 mm"},
            {"id": "BB", "material": "GL", "b": "130 mm", "d": "304 mm", "level": "L2", "drop": "235 mm",
             "from": "B/1", "to": "B/2", "extend": "76 mm"},
        ],
        "runs": [
            {"id": "J", "material": "SPF", "b": "38 mm", "d": "235 mm", "level": "L2", "spacing": "400 mm",
             "between": ["1", "2"], "span": ["A", "B"], "extend": "65 mm"},
        ],
        "posts": [
            {"id": f"C{n}", "material": "STEEL", "b": "152 mm", "d": "152 mm", "at": at, "base": "L1", "top": "L2"}
            for n, at in ((1, "A/1"), (2, "A/2"), (3, "B/1"), (4, "B/2"))
        ],
        "areas": [
            {"id": "F", "level": "L2", "corners": ["A/1", "B/2"], "span": "y", "loads": {"D": "1.0 kPa", "L": "2 kPa"}}
        ],
    },
}  # fmt: skip


def small() -> dict:
    return copy.deepcopy(SMALL)


def _bearing(review, bearing_id: str):
    return review.model.bearings_by_id[bearing_id]


def test_a_run_places_members_at_its_spacing_with_a_last_one_on_its_far_line():
    # 0 to 2 m at 400 mm: 0, 0.4, 0.8, 1.2, 1.6, 2.0 (the last lands on grid 2 exactly)
    review = review_dict(small())
    joists = [m for m in review.model.members.values() if m.id.startswith("J-")]
    assert [m.id for m in joists] == [f"J-A-B-{n}" for n in range(1, 7)]
    assert [m.place.start[0] for m in joists] == pytest.approx([0.0, 0.4, 0.8, 1.2, 1.6, 2.0])
    # 4 m between A and B, and 65 mm past each line
    assert all(m.length == pytest.approx(4.13) for m in joists)


def test_a_run_with_first_and_last_offsets_stops_short_of_its_lines():
    data = small()
    data["layout"]["runs"][0].update({"first": "200 mm", "last": "200 mm"})
    review = review_dict(data)
    xs = [m.place.start[0] for m in review.model.members.values() if m.id.startswith("J-")]
    # from 0.2 m at 400 mm up to 1.8 m (2 m less 200 mm): 0.2, 0.6, 1.0, 1.4, 1.8
    assert xs == pytest.approx([0.2, 0.6, 1.0, 1.4, 1.8])


def test_a_joist_end_over_a_beam_bears_the_overlap_of_the_two_footprints():
    review = review_dict(small())
    b = _bearing(review, "J-A-B-2/BA")
    # the joist starts 65 mm before grid A; the beam is 130 mm wide about A: the overlap runs the
    # whole beam width, 0 to 130 mm along the joist, centred at 65 mm
    assert b.upper.at == pytest.approx(0.065) and b.upper.length == pytest.approx(0.130)
    # along the beam (which starts 76 mm before grid 1) the 38 mm joist sits at 76 + 400 mm
    assert b.lower.at == pytest.approx(0.476) and b.lower.length == pytest.approx(0.038)
    assert b.typical == ("J", "J on BA")


def test_a_beam_end_over_a_post_bears_on_it_from_the_post_top_found_under_the_beam():
    review = review_dict(small())
    b = _bearing(review, "BA/C1")
    # the beam runs 76 mm past the post centre: the whole 152 mm post lies under it
    assert b.upper.at == pytest.approx(0.076) and b.upper.length == pytest.approx(0.152)
    # the post reaches up to the beam's underside: 3 m less the 235 mm drop less d = 304 mm
    assert review.model.members["C1"].length == pytest.approx(3.0 - 0.235 - 0.304)


def test_every_member_end_is_supported_and_no_contact_is_found_twice():
    review = review_dict(small())
    ids = [b.id for b in review.model.bearings]
    assert len(ids) == len(set(ids))
    pairs = [(b.upper.member, b.lower.member) for b in review.model.bearings]
    assert len(pairs) == len(set(pairs))
    for m in review.model.members.values():
        if not m.vertical:
            assert len([p for p in pairs if p[0] == m.id]) == 2, m.id
    # 6 joists x 2 ends + 2 beams x 2 posts
    assert len(ids) == 16


def test_area_loads_give_edge_joists_half_a_spacing_and_inner_joists_a_whole_one():
    review = review_dict(small())
    by_member = {(ld.member, ld.case): ld for ld in review.model.loads}
    # 1.0 kPa x 200 mm = 200 N/m at the edges, x 400 mm = 400 N/m inside; L is twice that
    assert by_member[("J-A-B-1", "D")].magnitude == pytest.approx(200.0)
    assert by_member[("J-A-B-3", "D")].magnitude == pytest.approx(400.0)
    assert by_member[("J-A-B-6", "L")].magnitude == pytest.approx(400.0)
    load = by_member[("J-A-B-3", "D")]
    # over the area only, A to B: 65 mm to 4065 mm along the joist
    assert (load.start, load.end) == pytest.approx((0.065, 4.065))
    assert "tributary width 400 mm" in load.note


def test_an_opening_takes_its_strip_away_from_the_joists_it_crosses():
    data = small()
    # an opening 0.6 m to 1.0 m across x, 1 m to 2 m along y: it covers half of J-A-B-2's strip
    # (0.2 to 0.6 m, opening from 0.6) - none - and J-A-B-3's strip 0.6 to 1.0 m entirely
    data["layout"]["areas"][0]["openings"] = [[["0.6 m", "1 m"], ["1.0 m", "2 m"]]]
    review = review_dict(data)
    pieces = sorted(
        (ld.start, ld.end, ld.magnitude) for ld in review.model.loads if ld.member == "J-A-B-3" and ld.case == "D"
    )
    # J-A-B-3 (at 0.8 m) carries 400 N/m from A to 1 m, nothing over the opening, 400 N/m from 2 m to B
    assert [v for piece in pieces for v in piece] == pytest.approx([0.065, 1.065, 400.0, 2.065, 4.065, 400.0])


@settings(max_examples=40, deadline=None)
@given(
    spacing=st.sampled_from(["300 mm", "400 mm", "488 mm", "600 mm"]),
    width=st.floats(min_value=1.5, max_value=6.0),
    depth=st.floats(min_value=2.0, max_value=6.0),
    kpa=st.floats(min_value=0.2, max_value=5.0),
    hole=st.tuples(st.floats(0.1, 0.45), st.floats(0.1, 0.45), st.floats(0.05, 0.5), st.floats(0.05, 0.5)),
)
def test_what_the_members_carry_adds_up_to_the_whole_area_load_less_its_openings(spacing, width, depth, kpa, hole):
    import yaml

    from audit.core.errors import ErrorCollector
    from audit.core.located_yaml import read_yaml_text
    from audit.inputs.area_loads import area_shares
    from audit.inputs.layout import read_layout
    from audit.inputs.layout_contacts import reach_up

    data = {
        "levels": {"L1": "0 m", "L2": "3 m"},
        "grids": {"x": {"1": "0 m", "2": f"{width!r} m"}, "y": {"A": "0 m", "B": f"{depth!r} m"}},
        "runs": [
            {"id": "J", "material": "SPF", "b": "38 mm", "d": "235 mm", "level": "L2", "spacing": spacing,
             "between": ["1", "2"], "span": ["A", "B"], "extend": "65 mm"}
        ],
        "areas": [
            {"id": "F", "level": "L2", "corners": ["A/1", "B/2"], "span": "y", "loads": {"D": f"{kpa!r} kPa"},
             "openings": [[[f"{hole[0] * width!r} m", f"{hole[1] * depth!r} m"],
                           [f"{(hole[0] + hole[2]) * width!r} m", f"{(hole[1] + hole[3]) * depth!r} m"]]]}
        ],
    }  # fmt: skip
    node = read_yaml_text(yaml.safe_dump(data), "layout.yaml")
    errors = ErrorCollector()
    layout = read_layout(node, errors)
    assert layout is not None and not errors.errors
    warnings: list[str] = []
    [(_, shares)] = area_shares(layout, reach_up(layout.placed, errors), errors, warnings)
    carried = sum(dict(s.per_case)["D"] * (s.end - s.start) for s in shares)
    # the whole area less the opening, times the pressure (kPa to Pa)
    expected = kpa * 1000 * (width * depth - hole[2] * width * hole[3] * depth)
    # line loads are rounded to 1 mN/m and positions to 1 micrometre: a few parts in a million
    assert carried == pytest.approx(expected, rel=1e-5)
    assert not warnings


def test_a_post_standing_on_a_beam_over_another_post_calls_for_the_near_support_check():
    data = small()
    data["layout"]["runs"][0].update({"first": "200 mm", "last": "200 mm"})  # clear of the post line
    data["layout"]["levels"]["R"] = "6 m"
    data["layout"]["members"].append(
        {"id": "RB", "material": "GL", "b": "130 mm", "d": "304 mm", "level": "R", "from": "A/1", "to": "A/2",
         "extend": "76 mm"}
    )  # fmt: skip
    data["layout"]["posts"] += [
        {"id": "PU1", "material": "STEEL", "b": "152 mm", "d": "152 mm", "at": "A/1", "base": "L2", "drop": "235 mm",
         "top": "R"},
        {"id": "PU2", "material": "STEEL", "b": "152 mm", "d": "152 mm", "at": "A/2", "base": "L2", "drop": "235 mm",
         "top": "R"},
    ]  # fmt: skip
    review = review_dict(data)
    assert ("PU1", "BA") in {(b.upper.member, b.lower.member) for b in review.model.bearings}
    near = {r.check.id for r in review.results if r.check.kind == "near-support"}
    # the post above lands on BA within d of the post below: BA is squeezed between them
    assert "BA/C1:BA:near" in near
    # the upper post reaches from the beam top (3 m less 235 mm) to the roof beam's underside (6 m less 304 mm)
    assert review.model.members["PU1"].length == pytest.approx((6.0 - 0.304) - (3.0 - 0.235))


def test_a_bearing_given_in_bearings_overrides_the_one_the_geometry_shows():
    data = small()
    data["bearings"] = [
        {"upper": {"member": "J-A-B-2", "at": "50 mm", "length": "100 mm"}, "lower": {"member": "BA", "at": "476 mm"}}
    ]
    review = review_dict(data)
    found = [b for b in review.model.bearings if (b.upper.member, b.lower.member) == ("J-A-B-2", "BA")]
    assert len(found) == 1 and found[0].upper.length == pytest.approx(0.100)


# ---------------------------------------------------------------- geometry errors


def _errors(data: dict) -> list[str]:
    with pytest.raises(InputErrors) as info:
        review_dict(data)
    return info.value.lines()


def test_a_member_end_over_nothing_is_an_error_naming_the_member_and_its_coordinates():
    data = small()
    data["layout"]["posts"] = [p for p in data["layout"]["posts"] if p["id"] != "C2"]
    lines = _errors(data)
    assert any("the end of 'BA' at (2.076 m, 0.000 m) sits on nothing" in line for line in lines), lines
    assert any(line.startswith("model.yaml:") and "layout.members[0]" in line for line in lines)


def test_members_that_overlap_in_space_are_an_error_with_the_place():
    data = small()
    # a beam at the joists' own level, across them at y = 2 m: it passes through every joist
    data["layout"]["members"].append(
        {"id": "BX", "material": "GL", "b": "130 mm", "d": "304 mm", "level": "L2", "from": ["0 m", "2 m"],
         "to": ["2 m", "2 m"], "free_ends": ["start", "end"]}
    )  # fmt: skip
    lines = _errors(data)
    assert any(
        "members 'BX' and 'J-A-B-3' overlap in space at (0.800 m, 2.000 m), elevations 2.765 m to 3.000 m" in line
        for line in lines
    ), lines


def test_a_post_under_a_joist_reaches_up_to_it_and_supports_it():
    data = small()
    data["layout"]["posts"].append(
        {"id": "CX", "material": "STEEL", "b": "89 mm", "d": "89 mm", "at": ["0.4 m", "2 m"], "base": "L1", "top": "L2"}
    )
    review = review_dict(data)
    b = _bearing(review, "J-A-B-2/CX")
    # the joist starts 65 mm before grid A: the post centre at y = 2 m is 2.065 m along it
    assert b.upper.at == pytest.approx(2.065) and b.upper.length == pytest.approx(0.089)


def test_an_end_over_two_members_cannot_be_settled_and_is_an_error():
    data = small()
    # a second beam beside BA, 100 mm further along y, under the same joist ends
    data["layout"]["members"].append(
        {"id": "BA2", "material": "GL", "b": "130 mm", "d": "304 mm", "level": "L2", "drop": "235 mm",
         "from": ["0 m", "0.1 m"], "to": ["2 m", "0.1 m"], "free_ends": ["start", "end"]}
    )  # fmt: skip
    lines = _errors(data)
    assert any("lies over both 'BA' and 'BA2'" in line for line in lines), lines


def test_a_crossing_at_a_skew_is_an_error_asking_for_the_bearing():
    data = small()
    data["layout"]["members"][0]["to"] = ["2 m", "0.3 m"]
    lines = _errors(data)
    assert any("crosses 'BA' at a skew" in line for line in lines), lines


def test_an_unknown_grid_line_is_a_located_error_with_a_suggestion():
    data = small()
    data["layout"]["members"][0]["from"] = "Q/1"
    lines = _errors(data)
    assert any("unknown grid line 'Q'" in line and "layout.members[0].from" in line for line in lines), lines


def test_a_stated_place_that_disagrees_with_the_length_is_refused():
    from tests.conftest import base_model

    data = base_model()
    data["members"][3]["place"] = {"from": ["0 m", "0 m"], "to": ["3 m", "0 m"], "top": "3 m"}
    lines = _errors(data)
    assert any("the place gives a length of 3000 mm, the member's length is 4000 mm" in line for line in lines)


# ---------------------------------------------------------------- the explicit model


def test_reviewing_the_expanded_model_gives_byte_identical_outputs(tmp_path, run_cli):
    model, claims = LAYOUT_DEMO / "model.yaml", LAYOUT_DEMO / "claims.yaml"
    explicit = tmp_path / "explicit.yaml"
    assert run_cli("expand", model, "-o", explicit).exit_code == 0
    outputs = {}
    files = ("memo.html", "findings.json", "findings.csv", "appendix.html")
    for name, path in (("layout", model), ("explicit", explicit)):
        out = tmp_path / name  # one folder each: the letter names its appendix and JSON by file name
        out.mkdir()
        args = [
            "--memo",
            out / files[0],
            "--json",
            out / files[1],
            "--csv",
            out / files[2],
            "--appendix",
            out / files[3],
        ]
        result = run_cli("review", path, "--claims", claims, *args)
        assert result.exit_code == 1  # the demo has failing checks by design
        outputs[name] = [(out / f).read_bytes() for f in files]
    # the JSON names each input by its hash (for review rounds), and the two model files differ by design
    for name in outputs:
        data = json.loads(outputs[name][1])
        assert data["round"]["inputs"]["model"].startswith("sha256:")
        data["round"]["inputs"].pop("model")
        outputs[name][1] = json.dumps(data).encode()
    assert outputs["layout"] == outputs["explicit"]
    text = explicit.read_text(encoding="utf-8")
    assert "model.yaml:" in text and "found where" in text and "share of area floor-L2" in text


def test_the_layout_demo_is_at_most_a_quarter_of_its_explicit_model(tmp_path, run_cli):
    explicit = tmp_path / "explicit.yaml"
    assert run_cli("expand", LAYOUT_DEMO / "model.yaml", "-o", explicit).exit_code == 0
    layout_lines = len((LAYOUT_DEMO / "model.yaml").read_text(encoding="utf-8").splitlines())
    assert layout_lines * 4 <= len(explicit.read_text(encoding="utf-8").splitlines())


def test_expanding_a_broken_layout_writes_nothing_and_exits_2(tmp_path, write_model, run_cli):
    data = small()
    data["layout"]["runs"][0]["span"] = ["A", "Z"]
    out = tmp_path / "explicit.yaml"
    result = run_cli("expand", write_model(data), "-o", out)
    assert result.exit_code == 2 and not out.exists()
    assert "unknown grid line 'Z'" in result.output


def test_committed_layout_demo_outputs_are_byte_identical_to_a_fresh_run(tmp_path, run_cli):
    model, claims = LAYOUT_DEMO / "model.yaml", LAYOUT_DEMO / "claims.yaml"
    assert run_cli("expand", model, "-o", tmp_path / "layout-demo-explicit.yaml").exit_code == 0
    files = [
        ("--memo", "layout-demo-memo.html"),
        ("--appendix", "layout-demo-appendix.html"),
        ("--json", "layout-demo-findings.json"),
        ("--csv", "layout-demo-findings.csv"),
    ]
    result = run_cli("review", model, "--claims", claims, *[v for o, n in files for v in (o, tmp_path / n)])
    assert result.exit_code == 1
    for name in ["layout-demo-explicit.yaml", *(n for _, n in files)]:
        fresh, committed = (tmp_path / name).read_bytes(), (ROOT / "reports" / name).read_bytes()
        assert fresh == committed, f"reports/{name} is stale: run the layout demo commands in the README"
    appendix = (tmp_path / "layout-demo-appendix.html").read_text(encoding="utf-8")
    table = appendix.split('id="checks"')[1].split('id="claims"')[0]
    checks = json.loads((tmp_path / "layout-demo-findings.json").read_text(encoding="utf-8"))["checks"]
    assert checks and all(table.count(f"<tr><td>{c['id']}</td>") == 1 for c in checks)  # every check, once
    claim_table = appendix.split('id="claims"')[1].split("</section>")[0]
    outcomes = json.loads((tmp_path / "layout-demo-findings.json").read_text(encoding="utf-8"))["claim_outcomes"]
    assert outcomes and all(claim_table.count(f"<tr><td>{o['claim']}</td>") == 1 for o in outcomes)  # every claim
    assert 'id="checks"' not in (tmp_path / "layout-demo-memo.html").read_text(encoding="utf-8")


def test_the_readme_layout_example_reviews_and_places_what_it_says():
    import yaml

    text = (ROOT / "README.md").read_text(encoding="utf-8")
    start = text.index("```yaml", text.index("A complete example (a floor of joists")) + len("```yaml")
    review = review_dict(yaml.safe_load(text[start : text.index("```", start)]))
    # six joists at 400 mm from grid 1 to grid 2, each on both beams, and the beams on four posts
    assert sorted(m for m in review.model.members if m.startswith("J-A-B-")) == [f"J-A-B-{n}" for n in range(1, 7)]
    assert len(review.model.bearings) == 6 * 2 + 4


def _stacked_walls(sole: bool) -> dict:
    """Two storeys of stud wall on grid A with a floor of joists between them (invented)."""
    data = small()
    data["layout"]["levels"]["R"] = "6 m"
    data["layout"]["runs"][0].update({"first": "200 mm", "last": "200 mm"})
    studs = {"thickness": "38 mm", "spacing": "406 mm"}
    upper = {"id": "WU", "material": "SPF", "b": "140 mm", "d": "38 mm", "from": "A/1", "to": "A/2",
             "base": "L2", "top": "R", "studs": studs}  # fmt: skip
    if sole:
        upper["sole"] = {"material": "SPF", "b": "140 mm", "d": "38 mm"}
    data["layout"]["walls"] = [upper]
    data["loads"] = [{"id": "roof", "member": "WU", "type": "uniform", "specified": {"D": "2 kN/m"}}]
    return data


def test_a_wall_on_a_sole_plate_brings_its_load_down_through_the_joists_under_it():
    review = review_dict(_stacked_walls(sole=True))
    bearings = {(b.upper.member, b.lower.member) for b in review.model.bearings}
    # each stud stands on the sole, the sole on every joist crossing under it
    assert ("WU.stud1", "WU.sole") in bearings
    assert {f"J-A-B-{n}" for n in range(1, 6)} <= {lower for upper, lower in bearings if upper == "WU.sole"}
    # the wall's 2 kN/m over 2 m (4 kN of D) comes down through the joists to the posts: equilibrium, the D
    # through the four posts is the floor's dead load plus all of the wall's
    without = review_dict(_stacked_walls(sole=False))
    posts = ("BA/C1", "BA/C2", "BB/C3", "BB/C4")
    through = sum(review.flow.bearing_forces[b]["D"] for b in posts)
    before = sum(without.flow.bearing_forces[b]["D"] for b in posts)
    assert through - before == pytest.approx(4000.0, rel=1e-9)
    # almost all to BA: the sole sits over the joists' supports on BA
    on_ba = sum(review.flow.bearing_forces[b]["D"] - without.flow.bearing_forces[b]["D"] for b in posts[:2])
    assert on_ba > 0.99 * 4000.0
    # and the joists are squeezed between the sole above and the beam below: near-support checks
    near = {r.check.member for r in review.results if r.check.kind == "near-support"}
    assert "J-A-B-3" in near


def test_a_sole_plate_without_studs_is_refused():
    data = _stacked_walls(sole=True)
    del data["layout"]["walls"][0]["studs"]
    lines = _errors(data)
    assert any("a sole plate carries studs" in line and "layout.walls[0].sole" in line for line in lines), lines


def test_expand_expands_the_layout_once(tmp_path, run_cli, monkeypatch):
    import audit.inputs.expand_layout as expand_layout

    calls = []
    expand = expand_layout._model_sections

    def counted(*args):
        calls.append(1)
        return expand(*args)

    monkeypatch.setattr(expand_layout, "_model_sections", counted)
    assert run_cli("expand", LAYOUT_DEMO / "model.yaml", "-o", tmp_path / "explicit.yaml").exit_code == 0
    assert len(calls) == 1
