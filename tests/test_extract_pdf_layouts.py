"""Calc sheets in the layouts other programs print (a browser, drawing libraries, a spreadsheet):
each sheet is made from claims data by a fixture maker, and what the reader gives back is compared
with that data value by value; rows that give no claim must be reported row by row."""

from __future__ import annotations

import pytest
import yaml

from audit.inputs.pdf.extract import extract
from audit.standards.registry import standard_named
from tests.conftest import ROOT

PDFS = ROOT / "fixtures" / "pdf"


def claims_as_data(result) -> list[dict]:
    return [
        {
            "location": c.label,
            "member": c.member,
            "kind": c.kind,
            "Qf": round(c.qf / 1000, 2),
            "Qr": round(c.qr / 1000, 2),
            "adequate": c.adequate,
        }
        for c in result.claims
    ]


def assert_reads_as(result, expected: dict) -> None:
    got = claims_as_data(result)
    want = expected["claims"]
    for n, (g, w) in enumerate(zip(got, want, strict=False)):
        assert g == w, f"claim {n + 1}"
    assert len(got) == len(want)
    # nothing silently dropped: every row the data says is no check is reported, and nothing else
    reported = [u.text for u in result.unread]
    for row in expected["not_read"]:
        assert any(text.startswith(row["text"]) for text in reported), row
    assert len(reported) == len(expected["not_read"]), reported


@pytest.mark.parametrize("kind", ["bands", "spaced", "equations-o86", "equations-nds", "equations-ec5"])
def test_a_browser_printed_sheet_gives_back_the_claims_it_was_made_from(kind, tmp_path):
    from fixtures.make_html_layouts import KINDS, expected_text
    from tests import browser

    html, data = KINDS[kind]()
    committed = (PDFS / f"html-{kind}.expected.yaml").read_text(encoding="utf-8")
    assert committed == expected_text(kind, data), "regenerate with python fixtures/make_html_layouts.py"
    page = tmp_path / f"{kind}.html"
    page.write_text(html, encoding="utf-8")
    pdf = browser.print_pdf(page, tmp_path / f"{kind}.pdf", tmp_path / "profile")
    headers = standard_named(data["standard"], None).claim_headers
    assert_reads_as(extract(pdf, workers=1, standard_headers=headers), yaml.safe_load(committed))


def pages_and_claims(result) -> list[dict]:
    return [{"page": c.where.page, **d} for c, d in zip(result.claims, claims_as_data(result), strict=True)]


def test_a_borderless_drawing_library_sheet_gives_back_its_claims_tables_and_equations(tmp_path):
    # reportlab (test-only): a borderless table centred on the page, right-aligned numbers under centred
    # heads, an OK column with a blank head, kips and lbf; EN 1995 and NDS equations with small subscripts
    from fixtures.make_reportlab_calc import borderless_expected_text, write_borderless

    committed = (PDFS / "reportlab-borderless.expected.yaml").read_text(encoding="utf-8")
    assert committed == borderless_expected_text(), "regenerate: python fixtures/make_reportlab_calc.py --expected"
    expected = yaml.safe_load(committed)
    result = extract(write_borderless(tmp_path / "sheet.pdf"), workers=1)
    assert pages_and_claims(result) == expected["claims"]
    assert [(u.page, u.text.split()[0]) for u in result.unread] == [
        (r["page"], r["text"]) for r in expected["not_read"]
    ]


def test_rows_of_a_second_table_on_a_page_that_read_are_reported_row_by_row_naming_their_columns(tmp_path):
    # A reviewer's sheet: one table reads; a second on the same page has heads the reader does not know.
    # Its rows must be reported one by one (page, position, text) and name the heads their numbers sit under.
    from fixtures.make_calc_pdfs import Calc, draw_table

    pdf = Calc("Two tables (fictional)")
    pdf.add_page()
    draw_table(pdf, ["Location", "Member", "Qf (kN)", "Qr (kN)"], [["J1 on B1", "J1", "7.13", "24.09"]],
               [46, 26, 28, 28], ruled=True)  # fmt: skip
    pdf.ln(12)
    pdf.multi_cell(0, 5, "Sill plates under posts, crushing of the plate.", new_x="LMARGIN", new_y="NEXT")
    pdf.ln(3)
    rows = [["P1 on sill", "60.08", "111.96"], ["P2 on sill", "58.10", "111.96"], ["P3 on sill", "41.00", "80.40"]]
    draw_table(pdf, ["Where", "Load on plate", "Plate capacity"], rows, [46, 40, 40], ruled=False)
    pdf.output(str(tmp_path / "two.pdf"))
    result = extract(tmp_path / "two.pdf", workers=1)
    assert [c.label for c in result.claims] == ["J1 on B1"]
    assert [u.text for u in result.unread] == [" ".join(r) for r in rows]
    for u in result.unread:
        assert u.page == 1 and u.x is not None and u.y is not None
        assert "'Load on plate', 'Plate capacity'" in u.what and "gave no claim" in u.what
    assert len({u.y for u in result.unread}) == 3  # each row at its own position


def test_cell_units_convert_as_pint_converts_them():
    # The reader converts the units calc sheets print without a unit library; pint (PyPI) is the check.
    import pint

    from audit.core.errors import Location
    from audit.inputs.pdf.values import SI_FACTOR, quantity

    ureg = pint.UnitRegistry()
    si = {"force": "newton", "stress": "pascal", "length": "meter", "area": "meter**2"}
    for (dimension, unit), _ in SI_FACTOR.items():
        want = ureg.Quantity(2.5, unit).to(si[dimension]).magnitude
        assert quantity(2.5, unit, dimension, Location("t")) == pytest.approx(want, rel=1e-12), unit


def _unknown_heads_pdf(path):
    from fixtures.make_calc_pdfs import Calc, draw_table

    pdf = Calc("Plates (fictional)")
    pdf.add_page()
    pdf.multi_cell(
        0, 5, "Plate crushing under posts: Qf and Qr per the tabulated resistance.", new_x="LMARGIN", new_y="NEXT"
    )
    rows = [["P1 on sill", "60.08", "111.96"], ["P2 on sill", "58.10", "111.96"]]
    draw_table(pdf, ["Where", "Load on plate", "Plate capacity"], rows, [46, 40, 40], ruled=True)
    pdf.output(str(path))
    return path


def test_a_map_names_columns_by_their_position(tmp_path):
    from audit.inputs.pdf.extract import read_column_map

    pdf = _unknown_heads_pdf(tmp_path / "plates.pdf")
    assert extract(pdf).claims == ()
    cmap = tmp_path / "map.yaml"
    cmap.write_text("columns:\n  location: {column: 1}\n  Qf: {column: 2, unit: kN}\n  Qr: {column: 3, unit: kN}\n")
    claims = extract(pdf, cmap=read_column_map(cmap)).claims
    assert [(c.label, c.qf, c.qr) for c in claims] == [
        ("P1 on sill", pytest.approx(60080.0), pytest.approx(111960.0)),
        ("P2 on sill", pytest.approx(58100.0), pytest.approx(111960.0)),
    ]


def test_a_map_names_a_column_by_the_band_over_it():
    # the spreadsheet printout has Qf | Qr under 'Local' and again under 'Near support': a map that asks
    # for the symbols under the near-support band reads those as the table's checks
    from audit.inputs.pdf.extract import read_column_map

    expected = yaml.safe_load((PDFS / "spreadsheet.expected.yaml").read_text())["claims"]
    near = [c for c in expected if c["kind"] == "near-support"]
    path = PDFS.parent.parent / "tests" / "_band_map.yaml"
    try:
        path.write_text("columns:\n  Qf: {header: '^q\\s*f', band: near}\n  Qr: {header: '^q\\s*r', band: near}\n")
        result = extract(PDFS / "spreadsheet.pdf", cmap=read_column_map(path))
    finally:
        path.unlink()
    assert [(c.label, c.kind) for c in result.claims] == [(c["location"], "near-support") for c in near]
    assert [c.qf for c in result.claims] == [pytest.approx(c["Qf_N"]) for c in near]
    assert any("column 3" in w and "Local" in w for w in result.warnings)  # the local Qf is named, not read


def test_show_prints_each_line_of_a_page_with_what_it_became(tmp_path, run_cli):
    pdf = _unknown_heads_pdf(tmp_path / "plates.pdf")
    result = run_cli("extract", pdf, "--show", "1")
    assert result.exit_code == 0
    assert "not read" in result.stdout and "'Load on plate', 'Plate capacity'" in result.stdout
    assert "[Where | x" in result.stdout or "y " in result.stdout
    spreadsheet = run_cli("extract", PDFS / "spreadsheet.pdf", "--show", "1")
    assert "head, band 1 of 4" in spreadsheet.stdout and "5: Qf' ('E Near support Qf kN')" in spreadsheet.stdout
    assert "group: " in spreadsheet.stdout and "claim FB1 on W2: local; FB1 on W2: near-support" in spreadsheet.stdout
    assert run_cli("extract", pdf, "--show", "9").exit_code == 2
    assert run_cli("extract", pdf).exit_code == 2  # neither -o nor --show
