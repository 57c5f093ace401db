"""Ties are decided at a stated resolution and thresholds scale with the loads (issue 24, items 12 and 13).

The same building in SI and in US units gives the same checks, factors and notes; the same building with
every load scaled lists the same checks and combinations. US models are written with the exact definitions
(1 in = 25.4 mm, 1 ft = 0.3048 m, 1 lbf = 4.4482216152605 N: common practice), not with the program's own
converter.
"""

from __future__ import annotations

import copy
import re

import pytest
import yaml

from audit import cli
from tests.conftest import base_model, review_dict

LBF = 4.4482216152605  # N, exact definition
FT = 0.3048  # m, exact definition
IN = 0.0254  # m, exact definition
_QUANTITY = re.compile(r"(-?[\d.]+(?:e-?\d+)?) (mm|m|kN/m|kN|kPa)")


def in_us_units(data):
    """The model with every length and load in US units, each the exact equivalent of the SI value."""

    def convert(text: str) -> str:
        m = _QUANTITY.fullmatch(text.strip())
        if not m:
            return text
        x, unit = float(m.group(1)), m.group(2)
        return {
            "mm": lambda: f"{x / 1000 / IN!r} in",
            "m": lambda: f"{x / FT!r} ft",
            "kN": lambda: f"{x * 1000 / LBF!r} lbf",
            "kN/m": lambda: f"{x * 1000 * FT / LBF!r} plf",
            "kPa": lambda: f"{x * 1000 * FT * FT / LBF!r} psf",
        }[unit]()

    def walk(o):
        if isinstance(o, dict):
            return {k: walk(v) for k, v in o.items()}
        if isinstance(o, list):
            return [walk(v) for v in o]
        return convert(o) if isinstance(o, str) else o

    return walk(copy.deepcopy(data))


def _summary(review) -> dict:
    """Per check what a reviewer reads: combinations, uplift, each factor with its reason, the contact's notes."""
    return {
        r.check.id: (
            tuple(sorted(c.combination for c in r.combinations)),
            r.uplift,
            tuple((f.name, float(f"{f.value:.9g}"), f.reason) for f in r.factors),
            r.check.contact.length_note,
            r.check.contact.width_note,
            f"{r.check.contact.end_distance * 1000:.2f}",
        )
        for r in review.results
    }


def _tie_model() -> dict:
    model = base_model()
    # J1 (38 mm wide) on W1 centred 94 mm from W1's end: the contact starts 94 - 38/2 = 75 mm from the end,
    # exactly the least end distance for KB (CSA O86 6.5.6.2.2, from memory: verify); J1's contact on B1 is
    # B1's 130 mm centred 3935 mm along the 4 m joist: it ends at 3935 + 65 = 4000 mm, the member end, and is
    # not cut (hand calculation)
    model["bearings"][3]["lower"]["at"] = "94 mm"
    return model


def test_the_same_model_in_si_and_in_us_units_gives_the_same_checks_factors_and_notes():
    si = _summary(review_dict(_tie_model()))
    us = _summary(review_dict(in_us_units(_tie_model())))
    assert si == us
    kb = dict((n, (v, why)) for n, v, why in si["J1/W1:W1"][2])["KB"]
    assert kb[0] == pytest.approx(1.25)  # KB at 38 mm, O86 Table 6.5.6.2.2 (from memory: verify): the tie keeps KB
    assert "cut" not in si["J1/B1:J1"][3]


@pytest.mark.parametrize(
    ("at", "kb"),
    [
        ("94 mm", 1.25),
        ("3.7007 in", 1.25),  # 93.99778 mm: 74.998 mm from the end, 75.00 mm at 0.01 mm (by hand)
        ("93.99 mm", 1.0),  # 74.99 mm: short of 75 mm by the resolution itself
        ("93.9 mm", 1.0),
    ],
)
def test_an_end_distance_is_compared_to_75_mm_at_a_hundredth_of_a_millimetre(at, kb):
    model = base_model()
    model["bearings"][3]["lower"]["at"] = at
    factor = next(f for f in review_dict(model).result("J1/W1:W1").factors if f.name == "KB")
    assert factor.value == pytest.approx(kb), factor.reason


def test_a_support_within_the_resolution_past_the_member_end_stands_at_the_end(tmp_path, capsys):
    # B1 is 6 m long: a post centred 4 micrometres past its end (a typed inch value's rounding) is at the end;
    # a tenth of a millimetre past it is outside, refused with its location
    for at, code in (("6000.004 mm", (0, 1)), ("6000.1 mm", (2,))):
        model = base_model()
        model["bearings"][1]["upper"]["at"] = at
        path = tmp_path / "model.yaml"
        path.write_text(yaml.safe_dump(model, sort_keys=False), encoding="utf-8")
        assert cli.run(["review", str(path)]) in code, at
        err = capsys.readouterr().err
        assert ("is outside member 'B1'" in err) is (code == (2,)), err


def test_a_layout_in_us_units_expands_to_the_same_bearings_as_in_si(tmp_path):
    from fixtures.make_hostile_corpus import LAYOUT

    # the beam along A a hair off its grid line (10 micrometres over 2 m): the crossings still count as square
    si = yaml.safe_load(LAYOUT.replace("from: A/1, to: A/2, extend", "from: A/1, to: [2 m, 0.01 mm], extend"))
    bearings = []
    for data in (si, in_us_units(si)):
        model, out = tmp_path / "layout.yaml", tmp_path / "explicit.yaml"
        model.write_text(yaml.safe_dump(data, sort_keys=False), encoding="utf-8")
        assert cli.run(["expand", str(model), "-o", str(out)]) == 0
        found = yaml.safe_load(out.read_text())["bearings"]
        bearings.append([{k: v for k, v in b.items() if k != "note"} for b in found])
    assert bearings[0] == bearings[1]
    on_beam = {b["lower"]["length"] for b in bearings[0] if b["lower"]["member"] == "BA"}
    assert on_beam == {"0.038 m"}  # each joist's 38 mm width along the beam (square crossing, by hand)


# ---------------------------------------------------------------- thresholds relative to the load (item 13)


def _windy(scale: float = 1.0) -> dict:
    """J1 (4 m, on B1 and W1 centred 65 mm from each end: symmetric) under D 1 kN/m, L 2 kN/m and wind
    pressure 0.1 kN/m or suction 0.6435 kN/m, every load times ``scale``. By hand, per kN/m J1's reaction at
    each support is 4/2 = 2 kN: under 0.9D + 1.4W (suction) each carries 0.9 x 2 - 1.4 x 1.287 = -0.0018 kN,
    an uplift of 1.8 N."""
    model = base_model()
    model["loads"][0]["specified"] = {
        "D": f"{1.0 * scale!r} kN/m",
        "L": f"{2.0 * scale!r} kN/m",
        "W": {"pressure": f"{0.1 * scale!r} kN/m", "suction": f"{0.6435 * scale!r} kN/m"},
    }
    return model


def _listing(review) -> dict:
    return {r.check.id: (tuple(sorted(c.combination for c in r.combinations)), r.uplift) for r in review.results}


@pytest.mark.parametrize("scale", [0.5, 2.0, 1000.0])
def test_scaled_loads_list_the_same_checks_combinations_and_uplift(scale):
    # at scale 1 B1's supports see 0.9 N of uplift and J1's 1.8 N: an absolute 1 N threshold listed the one only
    # when the loads were doubled
    assert _listing(review_dict(_windy(scale))) == _listing(review_dict(_windy()))


def test_an_uplift_of_1_8_n_is_noted_for_the_record_in_its_own_digits_and_asks_nothing():
    from audit.review.comments import build_comments

    review = review_dict(_windy())
    uplift = next(f for f in review.engine_findings if f.kind == "uplift" and f.bearing == "J1/W1")
    assert uplift.numbers["qf"] == pytest.approx(-1.8, abs=1e-6)  # by hand, as in _windy
    assert uplift.severity == "record" and "0.0018 kN" in uplift.message and "0.00 kN" not in uplift.message
    assert "nothing is asked" in uplift.message and "tie-down" not in uplift.message
    assert all(c.quiet for c in build_comments(review, None, ()) if c.kind == "uplift")  # not a comment that asks
    # the same building a thousand times heavier lifts 1.8 kN, above the pack's 0.5 kN: that asks for the tie-down
    heavy = next(f for f in review_dict(_windy(1000.0)).engine_findings if f.kind == "uplift" and f.bearing == "J1/W1")
    assert heavy.severity == "revise" and "1.80 kN" in heavy.message and "confirm the tie-down" in heavy.message


@pytest.mark.parametrize(("snow_n_per_m", "present"), [("0.15 N/m", False), ("1.5 N/m", True), ("1.5 kN/m", True)])
def test_a_case_counts_at_a_bearing_only_beyond_a_ten_thousandth_of_the_load_there(snow_n_per_m, present):
    # J1's reactions: D 2 kN and L 4 kN (as in _windy); snow over the 4 m brings 0.3 N, 3 N or 3 kN to each
    # support. A ten-thousandth of 6 kN is 0.6 N (hand calculation): only the first counts as absent.
    model = base_model()
    model["loads"].append({"id": "snow", "member": "J1", "type": "uniform", "specified": {"S": snow_n_per_m}})
    combos = {c.combination for c in review_dict(model).result("J1/W1:W1").combinations}
    assert ("1.25D+1.5S" in combos) is present, combos


@pytest.mark.parametrize("at", ["455 mm", "17.9134 in", "455.004 mm"])
def test_a_point_load_d_from_a_support_to_the_resolution_squeezes_the_member(at):
    # B1 (d = 380 mm) sits on C1 centred 75 mm from its end: a load at 75 + 380 = 455 mm lies d from it, within
    # d (CSA O86 6.5.6.3, from memory: verify); 17.9134 in is 455.00036 mm, a tie at 0.01 mm (by hand)
    model = base_model()
    model["loads"].append(
        {"id": "post", "member": "B1", "type": "point", "at": at, "length": "89 mm", "specified": {"D": "5 kN"}}
    )
    assert review_dict(model).result("B1/C1:B1:near") is not None


def test_a_point_load_a_tenth_of_a_millimetre_beyond_d_does_not_squeeze_the_member():
    model = base_model()
    model["loads"].append(
        {"id": "post", "member": "B1", "type": "point", "at": "455.1 mm", "length": "89 mm", "specified": {"D": "5 kN"}}
    )
    assert "B1/C1:B1:near" not in {r.check.id for r in review_dict(model).results}


@pytest.mark.parametrize("length", ["2106 mm", "82.91338 in"])
def test_an_end_stud_touching_the_last_regular_stud_to_the_resolution_is_placed(length):
    from tests.verification.details import post_on_stud_wall

    # 38 mm studs at 406 mm from 19 mm: the last regular one at 19 + 5 x 406 = 2049 mm; on a 2106 mm plate the
    # end stud at 2106 - 19 = 2087 mm touches it (2087 - 2049 = 38 mm, by hand); 82.91338 in is 2105.99985 mm
    data = post_on_stud_wall()
    data["members"][0]["length"] = length
    studs = sorted(b.upper.at or 0.0 for b in review_dict(data).model.bearings if b.upper.member == "WP")
    assert len(studs) == 7 and studs[-1] == pytest.approx(2.087, abs=1e-5)  # six studs and the pack, by hand
