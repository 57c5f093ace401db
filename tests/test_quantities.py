"""A US project's sketches, plans and explain speak feet and inches, plf, kip and psi; an SI one is unchanged.

Expected values are worked by hand from the exact definitions (1 in = 0.0254 m, 1 ft = 0.3048 m, 1 lbf =
0.45359237 kg x 9.80665 m/s2 = 4.4482216152605 N) and checked against pint, a general-purpose units library from
PyPI. Writing lengths to the nearest 1/16 in and sizes in inches is common practice in US framing drawings.
"""

from __future__ import annotations

import dataclasses

import pint
import pytest

from audit.report.quantities import FOOT, INCH, PLF, PSI, Quantities, feet_inches, inches
from tests.conftest import ROOT

NDS_DEMO = ROOT / "fixtures" / "demo-nds" / "model.yaml"
LAYOUT_DEMO = ROOT / "fixtures" / "demo-layout" / "model.yaml"
UREG = pint.UnitRegistry()
US = Quantities("US", "kip")


def test_the_factors_are_the_exact_definitions_as_pint_has_them():
    assert UREG.Quantity(1, "inch").to("m").magnitude == pytest.approx(INCH, rel=1e-12)
    assert UREG.Quantity(1, "foot").to("m").magnitude == pytest.approx(FOOT, rel=1e-12)
    assert UREG.Quantity(1, "lbf / foot").to("N/m").magnitude == pytest.approx(PLF, rel=1e-12)
    assert UREG.Quantity(1, "psi").to("Pa").magnitude == pytest.approx(PSI, rel=1e-12)


@pytest.mark.parametrize(
    "metres, text",
    [
        (6.096, "20'-0\""),  # 6.096 / 0.3048 = 20 ft exactly
        (3.7211, "12'-2 1/2\""),  # 12 ft = 3.6576 m, + 2.5 in = 0.0635 m
        (3.0, "9'-10 1/8\""),  # 118.110 in = 9 ft 10.110 in; the nearest 1/16 is 10 2/16
        (0.3047, "1'-0\""),  # 11.996 in rounds to 12 in: one foot, never 0'-12"
        (0.0889, '3 1/2"'),  # under a foot: inches
        (0.0095, '3/8"'),  # 0.374 in: 5.98 sixteenths -> 6/16 = 3/8
    ],
)
def test_lengths_are_feet_and_inches_to_the_nearest_sixteenth(metres, text):
    assert feet_inches(metres) == text


@pytest.mark.parametrize(
    "metres, text",
    [(0.130175, '5 1/8"'), (0.301625, '11 7/8"'), (0.3048, '12"'), (0.6096, '24"'), (0.0381, '1 1/2"')],
)
def test_section_sizes_are_inches_as_the_trade_writes_them(metres, text):
    assert inches(metres) == text  # 5 1/8 in x 0.0254 = 0.130175 m; 11 7/8 in = 0.301625 m


def test_line_loads_are_plf_and_klf_past_ten_kips_a_foot():
    # 14.6 kN/m / 14.5939 N/m per plf = 1000.4 plf; 150 kN/m / 14593.9 = 10.278 klf
    assert US.line_load(14_600.0) == "1,000 plf"
    assert US.line_load(150_000.0) == "10.28 klf"
    assert US.line_load_unit(14_600.0)[0] == "plf"


def test_stresses_are_psi_and_forces_kip():
    assert US.stress(1e6) == "145 psi"  # 1 MPa / 6894.757 Pa = 145.04 psi
    assert US.stress(625 * 6894.757) == "625 psi"
    assert US.force(4448.2216152605) == "1.00 kip"  # 1000 lbf
    assert Quantities("US", "lbf").force(4448.2216152605) == "1,000 lbf"


def test_an_si_project_reads_as_before():
    si = Quantities()
    assert (si.length(6.096), si.size(0.038), si.elevation(3.0)) == ("6096 mm", "38 mm", "3.000 m")
    assert (si.force(12_500.0), si.line_load(14_600.0), si.stress(7e6)) == ("12.50 kN", "14.60 kN/m", "7.00 MPa")


def _nds_review():
    from audit.review.review import review_model

    return review_model(NDS_DEMO)


def test_a_us_projects_sketches_say_feet_inches_and_plf(tmp_path):
    from audit.report.memo import MemoOptions, render_appendix

    html = render_appendix(_nds_review(), None, (), MemoOptions())
    # R1 is 12 ft long and 9.25 in deep; the roof load is 30 plf D and 50 plf S (as the model states them)
    assert "(length 12&#39;-0&#34;, d = 9 1/4&#34;" in html
    assert "roof: D 30 + S 50 plf" in html
    assert "kip/m" not in html and "(length 3658 mm" not in html


def test_explain_of_a_us_project_gives_inches_kip_and_psi():
    from audit.report.export import explain

    text = explain(_nds_review(), "R1/RB1:R1")
    # the rafter's 3 in seat ends 144 - 141 - 1.5 = 1.5 in from its end; its ridge reaction is 180 lb D and 301 lb S
    # (tests/test_display_units.py works them); P' = 625 psi x 1.5 in x 3 in = 2,812 lb = 2.81 kip
    assert 'Contact on the bottom face: 3" along the grain' in text
    assert '1 1/2" across' in text and '1 1/2" from the member end' in text
    assert "D = 0.18 kip, S = 0.30 kip" in text
    assert "Fc-perp CM Ct =   625 psi" in text and "P' =     2.81 kip" in text
    assert " kN" not in text and "MPa" not in text


def test_a_us_projects_plans_give_elevations_in_feet_and_inches():
    from audit.report.plans import level_plans
    from audit.review.review import review_model

    review = review_model(LAYOUT_DEMO)
    assert {p["elevation_text"] for p in level_plans(review, {}, [])} >= {"3.000 m", "2.700 m"}
    project = dataclasses.replace(review.model.project, units="US")
    us = dataclasses.replace(review, model=dataclasses.replace(review.model, project=project))
    shown = {p["level"]: p["elevation_text"] for p in level_plans(us, {}, [])}
    # 3.0 m = 9 ft 10.110 in -> 9'-10 1/8"; 2.7 m = 106.299 in = 8 ft 10.299 in -> 10 5/16
    assert shown["L2"] == "9'-10 1/8\"" and shown["CANOPY"] == "8'-10 5/16\""
