"""Display units follow the project, and a claim is answered in the unit it was made in.

Unit factors from pint's default registry (a general-purpose library): 1 lbf = 4.4482216152605 N
exactly, 1 kip = 1000 lbf.
"""

from __future__ import annotations

import pint
import pytest

from audit.core.units import Display, force_unit_of
from audit.review.comments import build_comments
from tests.conftest import base_model, reconcile_dicts
from tests.test_reconcile import QF_J1, claim

UREG = pint.UnitRegistry()
LBF = UREG.Quantity(1, "lbf").to("N").magnitude


@pytest.mark.parametrize("text, unit", [("12 kN", "kN"), ("2800 lbf", "lbf"), ("3.1 kip", "kip"), ("500 N", "N")])
def test_the_unit_a_force_was_written_in_is_known(text, unit):
    assert force_unit_of(text) == unit


def test_forces_show_in_the_unit_asked_for():
    assert Display("lbf").force(1000 * LBF) == "1,000 lbf"
    assert Display("kip").force(2500 * LBF) == "2.50 kip"
    assert Display("kN").force(8500.0) == "8.50 kN"


def test_a_claim_made_in_lbf_is_compared_and_shown_in_lbf():
    in_lbf = QF_J1 * 0.8 / LBF  # 20 % low, so it is a finding
    c = claim("J1/B1", "J1", Qf=QF_J1 * 0.8)
    c["Qf"] = f"{in_lbf:.1f} lbf"
    review, claims, rec = reconcile_dicts(base_model(), [c])
    finding = next(f for f in rec.findings if f.kind == "mis-loaded")
    assert f"claimed Qf = {in_lbf:,.0f} lbf" in finding.message
    assert f"recomputed {QF_J1 / LBF:,.0f} lbf" in finding.message
    place = next(p for c_ in build_comments(review, rec, claims) for p in c_.places if p.check_id == "J1/B1:J1")
    qf = next(n for n in place.compared if n.quantity == "Qf")
    assert qf.unit == "lbf" and qf.recomputed == pytest.approx(QF_J1 / LBF, rel=1e-9)


def test_a_us_project_shows_forces_in_kip():
    from audit.report.memo import MemoOptions, render_appendix

    data = base_model()
    data["project"]["units"] = "US"
    review, claims, rec = reconcile_dicts(data, [])
    missing = next(f for f in rec.findings if f.kind == "missing" and f.check_id == "J1/B1:J1")
    assert f"Qf = {QF_J1 / (1000 * LBF):.2f} kip" in missing.message
    html = render_appendix(review, rec, claims, MemoOptions())
    assert "Qf and Qr in kip" in html


def test_the_terminal_check_table_shows_forces_in_the_projects_units(run_cli):
    from tests.conftest import ROOT

    out = run_cli("review", ROOT / "fixtures" / "demo-nds" / "model.yaml").output
    header = next(line for line in out.splitlines() if line.startswith("check"))
    assert "Qf kip" in header and "Qr kip" in header
    # RB1 on C1 by hand (statics, common practice): the rafter's ridge reaction is 360 lb x 69.25/138.25 = 180 lb
    # D and 301 lb S; RB1 carries it at its middle (half to C1) and 20 plf x 16 ft / 2 = 160 lb of its own D:
    # D + S = 90 + 160 + 150 = 400 lb = 0.40 kip
    row = next(line for line in out.splitlines() if line.startswith("RB1/C1:RB1"))
    assert row.split()[3] == "0.40"
