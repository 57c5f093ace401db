"""A claims file written by `extract` under a standard names its factors in that standard's symbols, so it reads
back under the same standard (the reader refuses another standard's symbols)."""

from __future__ import annotations

import pytest

from audit.core.located_yaml import read_yaml_file
from audit.inputs.pdf.extract import claims_yaml, extract
from audit.inputs.read_claims import build_claims
from audit.standards.registry import standard_named


def _table_pdf(path, rows):
    from fpdf import FPDF

    pdf = FPDF()
    pdf.add_page()
    pdf.set_font("helvetica", size=9)
    for row in rows:
        for text in row:
            pdf.cell(38, 7, text, border=1)
        pdf.ln(7)
    pdf.output(str(path))
    return path


def _round_trip(tmp_path, rows, standard_id):
    standard = standard_named(standard_id)
    pdf = _table_pdf(tmp_path / "calc.pdf", rows)
    written = tmp_path / "claims.yaml"
    written.write_text(claims_yaml(extract(pdf, standard_headers=standard.claim_headers), "calc.pdf", standard.symbols))
    return build_claims(read_yaml_file(written), standard)


def test_an_nds_claims_file_names_the_bearing_area_factor_cb_and_reads_back_under_the_nds(tmp_path):
    rows = (["Location", "P (lbf)", "P' (lbf)", "Cb"], ["Rafter at wall", "480", "4383", "1.25"])
    (claim,) = _round_trip(tmp_path, rows, "nds")
    assert claim.factors == {"Cb": pytest.approx(1.25)}  # the Cb column as printed (NDS 3.10.4)
    assert claim.qf == pytest.approx(480 * 4.4482216152605, rel=1e-6)  # lbf by definition


def test_an_en_1995_claims_file_names_kc90_and_the_characteristic_strength_and_reads_back(tmp_path):
    rows = (
        ["Location", "F_c,90,d (kN)", "F_c,90,Rd (kN)", "k_c,90", "f_c,90,k (MPa)"],
        ["Joist on beam", "6.2", "14.8", "1.50", "2.5"],
    )
    (claim,) = _round_trip(tmp_path, rows, "ec5")
    # EN 1995-1-1 6.1.5 symbols: kc,90 a plain number, fc,90,k a stress (2.5 MPa as printed)
    assert claim.factors["kc,90"] == pytest.approx(1.5)
    assert claim.factors["fc,90,k"] == pytest.approx(2.5e6)
    assert claim.qf == pytest.approx(6200.0)


@pytest.mark.parametrize(
    ("demo", "strength", "duration", "force", "resist"),
    [
        # each standard's own words (EN 1995-1-1 6.1.5 with kmod of 3.1.3, Fc,90,d its design force (eq. 6.4) and
        # Fc,90,Rd the resistance as practice writes it; NDS Fc-perp adjusted by CM and Ct, no load-duration factor,
        # NDS 2.3.2, and P <= P' as US practice writes the check (common practice)): no O86 word in another's text
        ("demo-ec5", "kmod fc,90,k =", "kmod =", "Fc,90,d", "Fc,90,Rd"),
        ("demo-nds", "Fc-perp CM Ct =", "no ", "P", "P'"),
    ],
)
def test_explain_names_the_forces_strength_and_duration_factor_in_the_standards_own_symbols(
    demo, strength, duration, force, resist
):
    from pathlib import Path

    from typer.testing import CliRunner

    from audit.cli import app

    model = Path(__file__).resolve().parents[1] / "fixtures" / demo / "model.yaml"
    table = CliRunner().invoke(app, ["review", str(model)]).output.splitlines()
    check_id = table[2].split()[0]
    text = CliRunner().invoke(app, ["explain", str(model), check_id]).output
    rows = [line for line in text.splitlines() if f" {force} = " in line]
    assert rows and all(strength in row and duration in row and f" {resist} = " in row for row in rows)
    assert f"({force}/{resist} = " in text.splitlines()[-1] or f"({force}/{resist} = " in text
    assert "Fcp =" not in text and "KD =" not in text and "Qf" not in text and "Qr =" not in text
