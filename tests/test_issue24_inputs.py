"""Model input that reads as plausible but would give a wrong number (issue 24): refused or warned, located.

Each case runs the command line and checks the exit status, the located line and our own words.
"""

from __future__ import annotations

import contextlib
import re

import yaml

from audit import cli
from tests.conftest import base_model

ERROR = re.compile(r"^error: (?P<file>.+?):(?P<line>\d+):(?P<col>\d+): (?P<key>[^:]+?): (?P<msg>.+)$")


def _review(tmp_path, capsys, model: dict, *args) -> tuple[int, str]:
    path = tmp_path / "model.yaml"
    path.write_text(yaml.safe_dump(model, sort_keys=False), encoding="utf-8")
    code = cli.run(["review", str(path), *map(str, args)])
    return code, capsys.readouterr().err


def test_a_bearing_id_differing_only_in_case_is_refused_so_no_claim_lands_on_it(tmp_path, capsys):
    model = base_model()
    first = model["bearings"][0]
    twin = {**first, "id": "b1/c1"}  # the default id of the first bearing is B1/C1
    twin["upper"] = {**first["upper"]}
    model["bearings"].append(twin)
    code, err = _review(tmp_path, capsys, model)
    errors = [m for m in map(ERROR.match, err.splitlines()) if m]
    assert code == 2 and len(errors) == 1
    assert errors[0]["key"] == f"bearings[{len(model['bearings']) - 1}].id"
    assert "'b1/c1'" in errors[0]["msg"] and "'B1/C1'" in errors[0]["msg"] and "only in case" in errors[0]["msg"]


def test_a_member_id_differing_only_in_case_is_refused_once(tmp_path, capsys):
    model = base_model()
    model["members"].append({**model["members"][3], "id": "j1"})
    code, err = _review(tmp_path, capsys, model)
    errors = [m for m in map(ERROR.match, err.splitlines()) if m]
    assert code == 2 and [e["key"] for e in errors] == [f"members[{len(model['members']) - 1}].id"]
    assert "differs from member 'J1' only in case" in errors[0]["msg"]


def _area_load_kn(tmp_path, openings: str) -> float:
    """The D load (kN) that the members take from area F of the hostile layout base, as expanded."""
    from fixtures.make_hostile_corpus import LAYOUT

    model = tmp_path / "layout.yaml"
    model.write_text(LAYOUT.replace("span: y, loads", f"span: y, openings: {openings}, loads"), encoding="utf-8")
    out = tmp_path / "explicit.yaml"
    assert cli.run(["expand", str(model), "-o", str(out)]) == 0
    total = 0.0
    for load in yaml.safe_load(out.read_text(encoding="utf-8"))["loads"]:
        if str(load["id"]).startswith("F:"):
            per_metre = float(load["specified"]["D"].split()[0])  # written in N/m
            total += per_metre * (float(load["to"].split()[0]) - float(load["from"].split()[0]))
    return total / 1000


# Area F is 2 m x 4 m under 1 kPa of D: 8 kN (hand calculation: pressure times area).
ONE_OPENING = "[[0.5 m, 1 m], [1.5 m, 3 m]]"  # 1 m x 2 m = 2 m2


def test_an_opening_listed_twice_takes_its_area_away_once(tmp_path):
    assert abs(_area_load_kn(tmp_path, f"[{ONE_OPENING}, {ONE_OPENING}]") - 6.0) < 1e-6  # 1 kPa x (8 - 2) m2


def test_overlapping_openings_take_their_union_away(tmp_path):
    # 2 m2 and [0.5, 2] .. [1.5, 4] (2 m2) overlap over [0.5, 2] .. [1.5, 3] (1 m2): union 3 m2
    both = f"[{ONE_OPENING}, [[0.5 m, 2 m], [1.5 m, 4 m]]]"
    assert abs(_area_load_kn(tmp_path, both) - 5.0) < 1e-6  # 1 kPa x (8 - 3) m2


def test_an_opening_partly_outside_takes_away_only_the_part_inside(tmp_path, capsys):
    # [1.5, 1] .. [2.5, 3]: the area ends at x = 2 m, so 0.5 m x 2 m = 1 m2 lies inside
    assert abs(_area_load_kn(tmp_path, "[[[1.5 m, 1 m], [2.5 m, 3 m]]]") - 7.0) < 1e-6


# The units the README names, each with its SI value (exact definitions: the inch is 25.4 mm, the
# pound-force 4.4482216152605 N, the foot 12 in; kip = 1000 lbf; common practice for psf, plf, klf).
LBF, FT = 4.4482216152605, 0.3048
README_UNITS = {
    "length": {"m": 1.0, "mm": 1e-3, "in": 0.0254, "ft": FT},
    "force": {"N": 1.0, "kN": 1e3, "lbf": LBF, "kip": 1e3 * LBF},
    "line_load": {"N/m": 1.0, "kN/m": 1e3, "plf": LBF / FT, "klf": 1e3 * LBF / FT, "lbf/ft": LBF / FT},
    "stress": {
        "Pa": 1.0,
        "kPa": 1e3,
        "MPa": 1e6,
        "psf": LBF / FT**2,
        "ksf": 1e3 * LBF / FT**2,
        "psi": LBF / 0.0254**2,
        "ksi": 1e3 * LBF / 0.0254**2,
        "lbf/ft**2": LBF / FT**2,
    },
    "area": {"m**2": 1.0, "mm**2": 1e-6, "in**2": 0.0254**2},
    "angle": {"deg": 3.141592653589793 / 180, "rad": 1.0},
}


def test_every_unit_the_readme_names_is_read_at_its_si_value():
    from audit.core.errors import Location
    from audit.core.units import parse_quantity
    from tests.conftest import ROOT

    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    named = readme.split("The units read", 1)[1].split("\n\n", 1)[0]
    listed = set(re.findall(r"`([^`]+)`", named))
    assert listed <= {u for units in README_UNITS.values() for u in units}, "a unit the README names is untested"
    for dimension, units in README_UNITS.items():
        for unit, si in units.items():
            got = parse_quantity(f"2 {unit}", dimension, Location("t.yaml"))
            assert abs(got - 2 * si) <= 1e-9 * 2 * si, (unit, got)


def test_every_example_quantity_in_the_readme_is_read():
    from audit.core.errors import InputError, Location
    from audit.core.units import DIMENSIONS, parse_quantity
    from tests.conftest import ROOT

    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    examples = set(re.findall(r"`([-+]?\d[\d.]*\s+[A-Za-z][\w/*]*)`", readme))
    assert {"290 plf", "2800 lbf", "7.0 MPa"} <= examples
    for text in examples:
        read = []
        for dimension in DIMENSIONS:
            with contextlib.suppress(InputError):
                read.append(parse_quantity(text, dimension, Location("t.yaml")))
        assert read, f"the README's {text!r} is read as no quantity"


def test_a_floor_load_in_psf_is_the_same_as_in_lbf_per_square_foot(tmp_path):
    from fixtures.make_hostile_corpus import LAYOUT

    totals = []
    for written in ("20 psf", "20 lbf/ft**2"):
        model = tmp_path / "layout.yaml"
        model.write_text(LAYOUT.replace("D: 1 kPa", f"D: {written}"), encoding="utf-8")
        out = tmp_path / f"explicit-{len(totals)}.yaml"
        assert cli.run(["expand", str(model), "-o", str(out)]) == 0
        totals.append(out.read_text(encoding="utf-8").split("loads:", 1)[1])
    assert totals[0] == totals[1]


def test_an_invisible_character_is_shown_by_its_code_point_and_warned_even_when_the_run_stops(tmp_path, capsys):
    model = base_model()
    model["members"][0]["id"] = "B1\u200b"  # the bearings still name plain B1: three errors
    code, err = _review(tmp_path, capsys, model)
    assert code == 2 and "\u200b" not in err
    assert "did you mean 'B1<U+200B>'?" in err
    warning = next(ln for ln in err.splitlines() if ln.startswith("warning: "))
    assert "members[0]" in warning and "U+200B" in warning
    assert err.index("warning: ") < err.index("error: ")  # the explanation comes before what it explains


def test_a_direction_override_in_a_message_is_written_as_its_code_point(tmp_path, capsys):
    model = base_model()
    model["bearings"][0]["upper"]["member"] = "B\u202e1"  # would reverse the rest of the terminal line
    code, err = _review(tmp_path, capsys, model)
    assert code == 2 and "\u202e" not in err and "B<U+202E>1" in err


def test_errors_of_every_section_come_in_one_run_with_suggestions(tmp_path, capsys):
    model = base_model()
    model["materials"]["GL"]["species"] = "D.Fir-X"  # near D.Fir-L
    model["materials"]["SPF"]["grade"] = "No.22"  # near No.2
    model["members"][1]["material"] = "STEL"  # near STEEL
    model["members"][3]["b"] = "38 kN"
    model["loads"][0]["specified"]["D"] = "1 kN"  # a force on a uniform load
    code, err = _review(tmp_path, capsys, model)
    keys = [m["key"] for m in map(ERROR.match, err.splitlines()) if m]
    assert code == 2
    assert keys == [
        "materials.GL.species",
        "materials.SPF.grade",
        "members[1].material",
        "members[3].b",
        "loads[0].specified.D",
    ]
    assert "did you mean 'D.Fir-L'?" in err and "did you mean 'No.2'?" in err and "did you mean 'STEEL'?" in err
    assert "line_load" not in err and "not a line load" in err


def test_a_member_of_a_material_with_an_error_gives_no_second_error(tmp_path, capsys):
    model = base_model()
    model["materials"]["SPF"]["species"] = "Oakish"  # J1 and W1 are SPF: named by bearings and loads
    code, err = _review(tmp_path, capsys, model)
    assert code == 2 and [m["key"] for m in map(ERROR.match, err.splitlines()) if m] == ["materials.SPF.species"]


def test_a_small_force_that_asks_for_action_is_never_printed_as_zero():
    from audit.core.units import Display
    from audit.review.wording import uplift

    kn = Display("kN")
    assert kn.force_not_zero(1.8) == "0.0018 kN"  # 1.8 N = 0.0018 kN (by hand)
    assert kn.force_not_zero(12_340.0) == kn.force(12_340.0) == "12.34 kN"
    assert kn.force_not_zero(0.0) == "0.00 kN"
    assert Display("kip").force_not_zero(4.0) == "0.0009 kip"  # 4 N / 4448.2 N per kip = 0.00090
    sentence = uplift("J1/B1", "1.25D+1.5L", 1.8, True, 500.0, "the note threshold", kn)
    assert "0.0018 kN" in sentence and "0.00 kN" not in sentence


def test_a_load_lighter_than_its_member_is_warned_as_a_likely_unit_slip(tmp_path, capsys):
    # J1 is 38 x 235 mm over 4 m: at 3.5 kN/m3 (the plausible-ranges file, common practice) it weighs
    # 3500 x 0.038 x 0.235 = 31.3 N/m, 125 N in all (by hand). 12 N is under it, 12 kN far over.
    for magnitude, warned in (("12 N", True), ("12 kN", False), ("200 N", False)):
        model = base_model()
        model["loads"].append({"id": "p", "member": "J1", "type": "point", "at": "1 m", "specified": {"D": magnitude}})
        code, err = _review(tmp_path, capsys, model)
        assert code in (0, 1)
        assert ("less than the member's own weight (125 N for the whole member)" in err) is warned, (magnitude, err)


def test_a_line_load_of_one_newton_per_metre_is_warned_and_a_real_floor_is_not(tmp_path, capsys):
    model = base_model()
    model["loads"][0]["specified"] = {"D": "1 N/m", "L": "2 N/m"}  # under 31.3 N/m (as above)
    code, err = _review(tmp_path, capsys, model)
    assert code in (0, 1) and "'floor' on 'J1' is 2 N/m at most" in err
    code, err = _review(tmp_path, capsys, base_model())
    assert "warning" not in err


def test_a_layout_s_outputs_are_bounded_by_the_model_it_expands_to_not_by_its_few_lines(tmp_path):
    from audit.core.outfiles import OUTPUT_PER_INPUT
    from audit.report.memo import findings_json_chunks
    from audit.review.comments import build_comments
    from audit.review.review import review_model
    from audit.review.rounds import first_round
    from audit.review.run import expanded_bytes
    from tests.conftest import ROOT

    model = ROOT / "fixtures" / "demo-layout" / "model.yaml"
    result = review_model(model)
    comments = build_comments(result, None, ())
    json_size = sum(
        len(c)
        for c in findings_json_chunks(result, None, result.engine_findings, comments, first_round(comments, "", {}))
    )
    explicit = (ROOT / "reports" / "layout-demo-explicit.yaml").stat().st_size
    assert OUTPUT_PER_INPUT * model.stat().st_size < json_size  # the layout alone would refuse its own JSON
    assert expanded_bytes(result.model) <= explicit  # never more than the model it expands to
    assert OUTPUT_PER_INPUT * expanded_bytes(result.model) > 2 * json_size  # and room to spare


def test_an_end_distance_tie_is_decided_at_a_micrometre_alike_in_si_and_us_input():
    from tests.conftest import review_dict

    # J1 (38 mm wide) sits on W1 centred 94 mm from W1's end: the contact starts 94 - 19 = 75 mm from
    # the end, exactly O86's least end distance for KB (hand calculation). 3.700787 in is 93.99999 mm.
    qr, reasons = [], []
    for at in ("94 mm", "3.700787 in"):
        model = base_model()
        model["bearings"][3]["lower"]["at"] = at
        result = review_dict(model).result("J1/W1:W1")
        qr.append(result.governing.qr)
        reasons.append(next(f.reason for f in result.factors if f.name == "KB"))
    assert abs(qr[0] - qr[1]) <= 1e-9 * qr[0], reasons
    assert all("less than" not in r for r in reasons)


def test_expand_says_what_a_review_would_warn_of(tmp_path, capsys):
    from fixtures.make_hostile_corpus import LAYOUT

    model = tmp_path / "layout.yaml"
    model.write_text(LAYOUT.replace("span: y, loads", "span: y, openings: [[[1.5 m, 1 m], [2.5 m, 3 m]]], loads"))
    assert cli.run(["expand", str(model), "-o", str(tmp_path / "x.yaml")]) == 0
    assert "warning: " in capsys.readouterr().err  # the opening partly outside its area


def test_a_beam_a_hair_off_its_grid_line_gives_the_square_crossing_s_contacts(tmp_path, capsys):
    from fixtures.make_hostile_corpus import LAYOUT

    # 20 micrometres over 2 m is 0.0006 deg, far inside the half degree within which a crossing counts
    # as square: the joists' contacts along the beam stay their 38 mm width, as on the grid line
    lengths = []
    for to in ("A/2", "[2 m, 0.02 mm]"):
        model = tmp_path / "layout.yaml"
        model.write_text(LAYOUT.replace("from: A/1, to: A/2, extend", f"from: A/1, to: {to}, extend"))
        out = tmp_path / "explicit.yaml"
        assert cli.run(["expand", str(model), "-o", str(out)]) == 0, capsys.readouterr().err
        bearings = yaml.safe_load(out.read_text())["bearings"]
        lengths.append(sorted(b["lower"]["length"] for b in bearings if b["lower"]["member"] == "BA"))
    assert lengths[0] == lengths[1] and set(lengths[0]) == {"0.038 m"}
